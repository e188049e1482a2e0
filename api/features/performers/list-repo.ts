import { type RawBuilder, sql } from 'kysely';
import { CONSENT_KINDS, type ConsentKind } from '#shared/domain/consent.ts';
import type { PerformerListItem, PerformerListQuery } from '#shared/schemas/performers.ts';
import { type Db, idArray, WORD_SIMILARITY_THRESHOLD } from '../../db/index.ts';

export { WORD_SIMILARITY_THRESHOLD };
import { consentCoversSql, consentStateSql } from '../consents/index.ts';
import { type EngagementRecord, PERFORMER_COLUMNS, type PerformerFields, listEngagements, thumbnailUrl, toRecord } from './repo.ts';

// The registry's list, search and export queries.

// ---- SQL pieces shared by the list, its count and the export

/** The expression the trigram index is built on (performers_name_trgm_idx); keep it identical so the index is used. */
export const SEARCH_NAME = sql<string>`(coalesce(performers.preferred_name, '') || ' ' || performers.legal_name)`;
const SORT_NAME = sql<string>`lower(coalesce(performers.preferred_name, performers.legal_name))`;


const KIND_LIST = sql.join(CONSENT_KINDS.map((k) => sql.lit(k)));
/** A consent counts for the productions in view: the one it was given to, or none named. */
function consentFor(productionIds: readonly string[]) {
  return sql`(c.production_id is null or c.production_id in (${sql.join([...productionIds])}))`;
}
// What "active", "expiring" and "withdrawn" mean is the consents feature's one definition (consentState).
const active = (now: Date) => consentCoversSql('c', now);
const withdrawn = (now: Date) => sql`${consentStateSql('c', now)} = 'withdrawn'`;
const expiringWithin30 = (now: Date) => sql`(c.expires_at is not null and c.expires_at <= ${new Date(now.getTime() + 30 * 86_400_000)})`;
const activeKindCount = (productionIds: readonly string[], now: Date) =>
  sql<number>`(select count(distinct c.kind) from consents c where c.performer_id = performers.id and ${consentFor(productionIds)} and c.kind in (${KIND_LIST}) and ${active(now)})`;

export function likePattern(q: string): string {
  return `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

type ListFilter = Pick<PerformerListQuery, 'q' | 'consent'> & { productionIds: readonly string[]; now: Date };

/** The WHERE of the list, its count and the export: in scope, matching the search, passing the consent filter. */
function listConditions(f: ListFilter): RawBuilder<boolean> {
  const conds: RawBuilder<unknown>[] = [
    // The performers engaged in scope as one array: PostgreSQL fetches them by primary key rather than
    // hashing the whole registry against the engagements.
    sql`performers.id = any(array(select e.performer_id from engagements e where e.production_id = any(${idArray(f.productionIds)})))`,
  ];
  if (f.q) {
    // `<%` lets PostgreSQL use the GIN trigram index; word_similarity() states the cut-off exactly.
    conds.push(sql`((${f.q} <% ${SEARCH_NAME} and word_similarity(${f.q}, ${SEARCH_NAME}) > ${WORD_SIMILARITY_THRESHOLD}) or ${SEARCH_NAME} ilike ${likePattern(f.q)})`);
  }
  switch (f.consent) {
    case 'complete':
      conds.push(sql`${activeKindCount(f.productionIds, f.now)} = ${CONSENT_KINDS.length}`);
      break;
    case 'incomplete':
      conds.push(sql`${activeKindCount(f.productionIds, f.now)} < ${CONSENT_KINDS.length}`);
      break;
    case 'expiring':
      conds.push(sql`exists (select 1 from consents c where c.performer_id = performers.id and ${consentFor(f.productionIds)} and ${active(f.now)} and ${expiringWithin30(f.now)})`);
      break;
    case 'withdrawn':
      conds.push(sql`exists (select 1 from consents c where c.performer_id = performers.id and ${consentFor(f.productionIds)} and ${withdrawn(f.now)})`);
      break;
    case 'any':
      break;
  }
  return sql<boolean>`${sql.join(conds, sql` and `)}`;
}

function orderings(q: Pick<PerformerListQuery, 'q' | 'sort' | 'dir'>): RawBuilder<unknown> {
  const dir = sql.raw(q.dir === 'desc' ? 'desc' : 'asc');
  const key = q.sort === 'createdAt' ? sql`performers.created_at ${dir}` : sql`${SORT_NAME} ${dir}`;
  const parts = [key, sql`performers.id ${dir}`];
  if (q.q) parts.unshift(sql`word_similarity(${q.q}, ${SEARCH_NAME}) desc`);
  return sql.join(parts);
}

function sortKinds(kinds: readonly string[]): ConsentKind[] {
  return CONSENT_KINDS.filter((k) => kinds.includes(k));
}

interface EngagementJson {
  production_id: string;
  production_name: string;
  character_name: string | null;
  starts_on: string | null;
  ends_on: string | null;
}

// ---- list and export

/** One page of the registry, limited to performers engaged on `productionIds`. */
export async function listPerformers(
  db: Db,
  q: PerformerListQuery,
  scope: { productionIds: readonly string[]; showsProduction: (productionId: string) => boolean },
): Promise<{ items: PerformerListItem[]; total: number }> {
  const now = new Date();
  const where = listConditions({ q: q.q, consent: q.consent, productionIds: scope.productionIds, now });
  // One statement for the page, its total and each row's engagements; every connection already
  // carries the word-similarity cut-off (api/db/index.ts). The page and the total are found first on
  // the performers alone; the consents and engagements are then read for the page's rows only.
  const page = db
    .selectFrom('performers')
    .select(['performers.id', sql<number>`(count(*) over ())::int`.as('total')])
    .where(where)
    .orderBy(orderings(q))
    .limit(q.pageSize)
    .offset((q.page - 1) * q.pageSize)
    .as('page');
  const rows = await db
    .selectFrom(page)
    .innerJoin('performers', 'performers.id', 'page.id')
    .select([
      'performers.id',
      'performers.legal_name',
      'performers.preferred_name',
      'performers.pronouns',
      'performers.portrait_thumb_file_id',
      sql<string[]>`array(select distinct c.kind from consents c where c.performer_id = performers.id and ${consentFor(scope.productionIds)} and ${active(now)})`.as('active_kinds'),
      sql<number>`(select count(*)::int from consents c where c.performer_id = performers.id and ${consentFor(scope.productionIds)} and ${active(now)} and ${expiringWithin30(now)})`.as('expiring_soon'),
      sql<number>`(select count(*)::int from consents c where c.performer_id = performers.id and ${consentFor(scope.productionIds)} and ${withdrawn(now)})`.as('withdrawn'),
      sql<EngagementJson[]>`coalesce((
        select json_agg(json_build_object('production_id', e.production_id, 'production_name', pr.name, 'character_name', e.character_name, 'starts_on', e.starts_on, 'ends_on', e.ends_on) order by pr.name)
        from engagements e join productions pr on pr.id = e.production_id where e.performer_id = performers.id
      ), '[]'::json)`.as('engagements_json'),
      'page.total',
    ])
    .orderBy(orderings(q))
    .execute();
  // Past the last page there is no row to carry the total: only then is it counted on its own.
  const total = rows[0]?.total ?? (q.page > 1 ? (await db.selectFrom('performers').select(sql<number>`count(*)::int`.as('n')).where(where).executeTakeFirstOrThrow()).n : 0);
  const engagements = new Map(
    rows.map((r) => [
      r.id,
      r.engagements_json.map((e) => ({ performerId: r.id, productionId: e.production_id, productionName: e.production_name, characterName: e.character_name, startsOn: e.starts_on, endsOn: e.ends_on })),
    ]),
  );
  return {
    total,
    items: rows.map((r) => ({
      id: r.id,
      legalName: r.legal_name,
      preferredName: r.preferred_name,
      pronouns: r.pronouns,
      engagements: (engagements.get(r.id) ?? []).filter((e) => scope.showsProduction(e.productionId)),
      activeKinds: sortKinds(r.active_kinds),
      expiringSoon: r.expiring_soon,
      withdrawn: r.withdrawn,
      thumbnailUrl: thumbnailUrl(r.id, r.portrait_thumb_file_id),
    })),
  };
}

export interface ExportRow extends PerformerFields {
  id: string;
  engagements: EngagementRecord[];
}

/** Every performer the list would show with these filters (no paging), in the list's order. */
export async function listPerformersForExport(
  db: Db,
  q: Omit<PerformerListQuery, 'page' | 'pageSize'>,
  scope: { productionIds: readonly string[] },
): Promise<ExportRow[]> {
  const where = listConditions({ q: q.q, consent: q.consent, productionIds: scope.productionIds, now: new Date() });
  const rows = await db.selectFrom('performers').select(PERFORMER_COLUMNS).where(where).orderBy(orderings(q)).execute();
  const engagements = await listEngagements(db, rows.map((r) => r.id));
  return rows.map((r) => ({ ...toRecord(r), engagements: engagements.get(r.id) ?? [] }));
}

