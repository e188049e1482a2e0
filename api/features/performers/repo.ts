import { type RawBuilder, sql } from 'kysely';
import { CONSENT_KINDS, type ConsentKind, type ConsentTimes, bookingsMissingConsent, consentState } from '#shared/domain/consent.ts';
import type { Booking, ConsentSummary } from '#shared/schemas/consents.ts';
import type { PerformerListItem, PerformerListQuery } from '#shared/schemas/performers.ts';
import type { Db } from '../../db/index.ts';

// ---- shapes

/** The editable fields, camelCase as in PerformerFieldsSchema. */
export interface PerformerFields {
  legalName: string;
  preferredName: string | null;
  pronouns: string | null;
  email: string | null;
  phone: string | null;
  emergencyContactName: string | null;
  emergencyContactPhone: string | null;
  agentName: string | null;
  agentContact: string | null;
  notes: string | null;
}

export interface PerformerRecord extends PerformerFields {
  id: string;
  userId: string | null;
  /** The performer confirmed `email` as theirs (only then does their mail go there). */
  emailConfirmed: boolean;
  portraitFileId: string | null;
  portraitThumbFileId: string | null;
  createdAt: string;
  version: number;
}

export interface EngagementRecord {
  performerId: string;
  productionId: string;
  productionName: string;
  characterName: string | null;
  startsOn: string | null;
  endsOn: string | null;
}

export interface EngagementValues {
  productionId: string;
  characterName: string | null;
  startsOn: string | null;
  endsOn: string | null;
}

const PERFORMER_COLUMNS = [
  'performers.id',
  'performers.legal_name',
  'performers.preferred_name',
  'performers.pronouns',
  'performers.email',
  'performers.phone',
  'performers.emergency_contact_name',
  'performers.emergency_contact_phone',
  'performers.agent_name',
  'performers.agent_contact',
  'performers.notes',
  'performers.user_id',
  'performers.email_confirmed_at',
  'performers.portrait_file_id',
  'performers.portrait_thumb_file_id',
  'performers.created_at',
  'performers.version',
] as const;

// ---- SQL pieces shared by the list, its count and the export

/** The expression the trigram index is built on (performers_name_trgm_idx); keep it identical so the index is used. */
export const SEARCH_NAME = sql<string>`(coalesce(performers.preferred_name, '') || ' ' || performers.legal_name)`;
const SORT_NAME = sql<string>`lower(coalesce(performers.preferred_name, performers.legal_name))`;
/** Fuzzy-match cut-off for word_similarity; the `<%` operator reads the same value from the session setting. */
export const WORD_SIMILARITY_THRESHOLD = 0.3;

/** A consent counts as active now: signed, not withdrawn, not expired (consentState in shared/domain/consent.ts). */
const ACTIVE = sql`c.signed_at <= now() and (c.withdrawn_at is null or c.withdrawn_at > now()) and (c.expires_at is null or c.expires_at > now())`;
const KIND_LIST = sql.join(CONSENT_KINDS.map((k) => sql.lit(k)));
/** A consent counts for the productions in view: the one it was given to, or none named. */
function consentFor(productionIds: readonly string[]) {
  return sql`(c.production_id is null or c.production_id in (${sql.join([...productionIds])}))`;
}
const activeKindCount = (productionIds: readonly string[]) =>
  sql<number>`(select count(distinct c.kind) from consents c where c.performer_id = performers.id and ${consentFor(productionIds)} and c.kind in (${KIND_LIST}) and ${ACTIVE})`;
const EXPIRING_WITHIN_30 = sql`c.expires_at is not null and c.expires_at <= now() + interval '30 days'`;
const WITHDRAWN = sql`c.withdrawn_at is not null and c.withdrawn_at <= now()`;

export function likePattern(q: string): string {
  return `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

type ListFilter = Pick<PerformerListQuery, 'q' | 'consent'> & { productionIds: readonly string[] };

/** The WHERE of the list, its count and the export: in scope, matching the search, passing the consent filter. */
function listConditions(f: ListFilter): RawBuilder<boolean> {
  const conds: RawBuilder<unknown>[] = [
    sql`exists (select 1 from engagements e where e.performer_id = performers.id and e.production_id in (${sql.join([...f.productionIds])}))`,
  ];
  if (f.q) {
    // `<%` lets PostgreSQL use the GIN trigram index; word_similarity() states the cut-off exactly.
    conds.push(sql`((${f.q} <% ${SEARCH_NAME} and word_similarity(${f.q}, ${SEARCH_NAME}) > ${WORD_SIMILARITY_THRESHOLD}) or ${SEARCH_NAME} ilike ${likePattern(f.q)})`);
  }
  switch (f.consent) {
    case 'complete':
      conds.push(sql`${activeKindCount(f.productionIds)} = ${CONSENT_KINDS.length}`);
      break;
    case 'incomplete':
      conds.push(sql`${activeKindCount(f.productionIds)} < ${CONSENT_KINDS.length}`);
      break;
    case 'expiring':
      conds.push(sql`exists (select 1 from consents c where c.performer_id = performers.id and ${consentFor(f.productionIds)} and ${ACTIVE} and ${EXPIRING_WITHIN_30})`);
      break;
    case 'withdrawn':
      conds.push(sql`exists (select 1 from consents c where c.performer_id = performers.id and ${consentFor(f.productionIds)} and ${WITHDRAWN})`);
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

/**
 * Runs a search in a transaction whose `pg_trgm.word_similarity_threshold` matches ours, so the
 * index-backed `<%` operator and the word_similarity() cut-off agree.
 */
export async function withSearchSettings<T>(db: Db, searching: boolean, fn: (db: Db) => Promise<T>): Promise<T> {
  if (!searching) return fn(db);
  return db.transaction().execute(async (trx) => {
    await sql`select set_config('pg_trgm.word_similarity_threshold', ${String(WORD_SIMILARITY_THRESHOLD)}, true)`.execute(trx);
    return fn(trx);
  });
}

function sortKinds(kinds: readonly string[]): ConsentKind[] {
  return CONSENT_KINDS.filter((k) => kinds.includes(k));
}

// ---- list and export

export function portraitUrl(performerId: string, fileId: string | null): string | null {
  return fileId ? `/api/performers/${performerId}/portrait?v=${fileId}` : null;
}
export function thumbnailUrl(performerId: string, fileId: string | null): string | null {
  return fileId ? `/api/performers/${performerId}/portrait/thumbnail?v=${fileId}` : null;
}

/** One page of the registry, limited to performers engaged on `productionIds`. */
export async function listPerformers(
  db: Db,
  q: PerformerListQuery,
  scope: { productionIds: readonly string[]; showsProduction: (productionId: string) => boolean },
): Promise<{ items: PerformerListItem[]; total: number }> {
  const where = listConditions({ q: q.q, consent: q.consent, productionIds: scope.productionIds });
  const { rows, total } = await withSearchSettings(db, !!q.q, async (trx) => {
    const rows = await trx
      .selectFrom('performers')
      .select([
        'performers.id',
        'performers.legal_name',
        'performers.preferred_name',
        'performers.pronouns',
        'performers.portrait_thumb_file_id',
        sql<string[]>`array(select distinct c.kind from consents c where c.performer_id = performers.id and ${consentFor(scope.productionIds)} and ${ACTIVE})`.as('active_kinds'),
        sql<number>`(select count(*)::int from consents c where c.performer_id = performers.id and ${consentFor(scope.productionIds)} and ${ACTIVE} and ${EXPIRING_WITHIN_30})`.as('expiring_soon'),
        sql<number>`(select count(*)::int from consents c where c.performer_id = performers.id and ${consentFor(scope.productionIds)} and ${WITHDRAWN})`.as('withdrawn'),
      ])
      .where(where)
      .orderBy(orderings(q))
      .limit(q.pageSize)
      .offset((q.page - 1) * q.pageSize)
      .execute();
    const count = await trx.selectFrom('performers').select(sql<number>`count(*)::int`.as('n')).where(where).executeTakeFirstOrThrow();
    return { rows, total: count.n };
  });
  const engagements = await listEngagements(db, rows.map((r) => r.id));
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
  const where = listConditions({ q: q.q, consent: q.consent, productionIds: scope.productionIds });
  const rows = await withSearchSettings(db, !!q.q, (trx) =>
    trx.selectFrom('performers').select(PERFORMER_COLUMNS).where(where).orderBy(orderings(q)).execute(),
  );
  const engagements = await listEngagements(db, rows.map((r) => r.id));
  return rows.map((r) => ({ ...toRecord(r), engagements: engagements.get(r.id) ?? [] }));
}

// ---- one performer

function selectPerformer(db: Db) {
  return db.selectFrom('performers').select(PERFORMER_COLUMNS);
}
type PerformerDbRow = Awaited<ReturnType<ReturnType<typeof selectPerformer>['executeTakeFirstOrThrow']>>;

function toRecord(r: PerformerDbRow): PerformerRecord {
  return {
    id: r.id,
    legalName: r.legal_name,
    preferredName: r.preferred_name,
    pronouns: r.pronouns,
    email: r.email,
    phone: r.phone,
    emergencyContactName: r.emergency_contact_name,
    emergencyContactPhone: r.emergency_contact_phone,
    agentName: r.agent_name,
    agentContact: r.agent_contact,
    notes: r.notes,
    userId: r.user_id,
    emailConfirmed: r.email !== null && r.email_confirmed_at !== null,
    portraitFileId: r.portrait_file_id,
    portraitThumbFileId: r.portrait_thumb_file_id,
    createdAt: new Date(r.created_at).toISOString(),
    version: r.version,
  };
}

export async function findPerformer(db: Db, id: string): Promise<PerformerRecord | undefined> {
  const row = await selectPerformer(db).where('performers.id', '=', id).executeTakeFirst();
  return row ? toRecord(row) : undefined;
}

/** Takes the performer's row lock, so two writers to one performer queue rather than race. */
export async function lockPerformer(db: Db, id: string): Promise<PerformerRecord | undefined> {
  const row = await selectPerformer(db).where('performers.id', '=', id).forUpdate().executeTakeFirst();
  return row ? toRecord(row) : undefined;
}

/** Engagements of these performers, by performer, each list ordered by production name. */
export async function listEngagements(db: Db, performerIds: readonly string[]): Promise<Map<string, EngagementRecord[]>> {
  const out = new Map<string, EngagementRecord[]>();
  if (performerIds.length === 0) return out;
  const rows = await db
    .selectFrom('engagements')
    .innerJoin('productions', 'productions.id', 'engagements.production_id')
    .select([
      'engagements.performer_id',
      'engagements.production_id',
      'productions.name as production_name',
      'engagements.character_name',
      'engagements.starts_on',
      'engagements.ends_on',
    ])
    .where('engagements.performer_id', 'in', [...performerIds])
    .orderBy('productions.name')
    .execute();
  for (const r of rows) {
    const list = out.get(r.performer_id) ?? [];
    list.push({
      performerId: r.performer_id,
      productionId: r.production_id,
      productionName: r.production_name,
      characterName: r.character_name,
      startsOn: r.starts_on ?? null,
      endsOn: r.ends_on ?? null,
    });
    out.set(r.performer_id, list);
  }
  return out;
}

export async function engagedProductionIds(db: Db, performerId: string): Promise<string[]> {
  const rows = await db.selectFrom('engagements').select('production_id').where('performer_id', '=', performerId).execute();
  return rows.map((r) => r.production_id);
}

/** A linked sign-in, for the detail view. */
export async function findUser(db: Db, id: string): Promise<{ id: string; email: string; displayName: string } | undefined> {
  const row = await db.selectFrom('users').select(['id', 'email', 'display_name']).where('id', '=', id).executeTakeFirst();
  return row ? { id: row.id, email: row.email, displayName: row.display_name } : undefined;
}

/** The performer's signed consents, newest first, with the title and version of the text they signed. */
export async function listConsentSummaries(db: Db, performer: { id: string; name: string }, now: Date): Promise<{ summaries: ConsentSummary[]; times: (ConsentTimes & { kind: ConsentKind; productionId: string | null })[] }> {
  const rows = await db
    .selectFrom('consents as c')
    .innerJoin('consent_template_versions as v', 'v.id', 'c.template_version_id')
    .select([
      'c.id',
      'c.production_id',
      'c.kind',
      'c.signed_at',
      'c.expires_at',
      'c.withdrawn_at',
      'c.signer_name',
      'c.signing_method',
      'c.version',
      'v.title',
      'v.version as template_version',
    ])
    .where('c.performer_id', '=', performer.id)
    .orderBy('c.signed_at', 'desc')
    .orderBy('c.id')
    .execute();
  const times = rows.map((r) => ({
    kind: r.kind,
    productionId: r.production_id,
    signedAt: new Date(r.signed_at),
    expiresAt: r.expires_at ? new Date(r.expires_at) : null,
    withdrawnAt: r.withdrawn_at ? new Date(r.withdrawn_at) : null,
  }));
  const summaries = rows.map((r, i) => ({
    id: r.id,
    performerId: performer.id,
    performerName: performer.name,
    productionId: r.production_id,
    kind: r.kind,
    title: r.title,
    templateVersion: r.template_version,
    signedAt: times[i]!.signedAt.toISOString(),
    expiresAt: times[i]!.expiresAt?.toISOString() ?? null,
    state: consentState(times[i]!, now),
    signerName: r.signer_name,
    signingMethod: r.signing_method,
    withdrawnAt: times[i]!.withdrawnAt?.toISOString() ?? null,
    version: r.version,
  }));
  return { summaries, times };
}

/** Booked sessions from now on, each marked when its consent will not be in force at the start. */
export async function listUpcomingBookings(
  db: Db,
  performer: { id: string; name: string },
  consents: readonly (ConsentTimes & { kind: ConsentKind; productionId: string | null })[],
  showsProduction: (productionId: string) => boolean,
): Promise<Booking[]> {
  const rows = await db
    .selectFrom('bookings')
    .select(['id', 'production_id', 'purpose', 'starts_at', 'location', 'status'])
    .where('performer_id', '=', performer.id)
    .where('status', '=', 'booked')
    .where('starts_at', '>=', sql<Date>`now()`)
    .orderBy('starts_at')
    .orderBy('id')
    .execute();
  const visible = rows.filter((r) => showsProduction(r.production_id));
  // Each session needs a consent given to its own production (or to none named).
  const missing = new Set(
    visible
      .filter((r) => {
        const own = consents.filter((c) => c.productionId === null || c.productionId === r.production_id);
        return bookingsMissingConsent([{ id: r.id, performerId: performer.id, purpose: r.purpose, startsAt: new Date(r.starts_at) }], new Map([[performer.id, own]])).length > 0;
      })
      .map((r) => r.id),
  );
  return visible.map((r) => ({
    id: r.id,
    performerId: performer.id,
    performerName: performer.name,
    productionId: r.production_id,
    purpose: r.purpose,
    startsAt: new Date(r.starts_at).toISOString(),
    location: r.location,
    status: r.status,
    consentMissing: missing.has(r.id),
  }));
}

// ---- writes

function fieldColumns(f: PerformerFields) {
  return {
    legal_name: f.legalName,
    preferred_name: f.preferredName,
    pronouns: f.pronouns,
    email: f.email,
    phone: f.phone,
    emergency_contact_name: f.emergencyContactName,
    emergency_contact_phone: f.emergencyContactPhone,
    agent_name: f.agentName,
    agent_contact: f.agentContact,
    notes: f.notes,
  };
}

/** Another performer already using this e-mail (compared case-insensitively, as the unique index does). */
export async function findPerformerIdByEmail(db: Db, email: string, exceptId?: string): Promise<string | undefined> {
  let q = db.selectFrom('performers').select('id').where(sql`lower(email)`, '=', email.toLowerCase());
  if (exceptId) q = q.where('id', '!=', exceptId);
  return (await q.executeTakeFirst())?.id;
}

/** Existing performers by lower-cased e-mail, with the productions each is engaged on. */
export async function findPerformersByEmails(db: Db, emails: readonly string[]): Promise<Map<string, { id: string; productionIds: string[] }>> {
  const out = new Map<string, { id: string; productionIds: string[] }>();
  if (emails.length === 0) return out;
  const rows = await db
    .selectFrom('performers')
    .select([
      'performers.id',
      sql<string>`lower(performers.email)`.as('email'),
      sql<string[]>`array(select e.production_id::text from engagements e where e.performer_id = performers.id)`.as('production_ids'),
    ])
    .where(sql`lower(performers.email)`, 'in', emails.map((e) => e.toLowerCase()))
    .execute();
  for (const r of rows) out.set(r.email, { id: r.id, productionIds: r.production_ids });
  return out;
}

export async function insertPerformer(db: Db, f: PerformerFields, id?: string): Promise<string> {
  const row = await db
    .insertInto('performers')
    .values({ ...(id ? { id } : {}), ...fieldColumns(f) })
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

/** Many new performers at once, ids chosen by the caller (an import). */
export async function insertPerformers(db: Db, rows: readonly (PerformerFields & { id: string })[]): Promise<void> {
  for (let i = 0; i < rows.length; i += 500) {
    const chunk = rows.slice(i, i + 500);
    await db.insertInto('performers').values(chunk.map((r) => ({ id: r.id, ...fieldColumns(r) }))).execute();
  }
}

/** Updates only if the row is still at the version the editor saw; returns false when it is not. */
export async function updatePerformerAtVersion(db: Db, id: string, f: PerformerFields, version: number): Promise<boolean> {
  const res = await db
    .updateTable('performers')
    .set({ ...fieldColumns(f), version: sql`version + 1`, updated_at: sql`now()` })
    .where('id', '=', id)
    .where('version', '=', version)
    .executeTakeFirst();
  return Number(res.numUpdatedRows) === 1;
}

export async function insertEngagements(db: Db, rows: readonly (EngagementValues & { performerId: string })[]): Promise<void> {
  for (let i = 0; i < rows.length; i += 500) {
    const chunk = rows.slice(i, i + 500);
    if (chunk.length === 0) continue;
    await db
      .insertInto('engagements')
      .values(
        chunk.map((e) => ({
          performer_id: e.performerId,
          production_id: e.productionId,
          character_name: e.characterName,
          starts_on: e.startsOn,
          ends_on: e.endsOn,
        })),
      )
      .execute();
  }
}

export async function updateEngagement(db: Db, performerId: string, e: EngagementValues): Promise<void> {
  await db
    .updateTable('engagements')
    .set({ character_name: e.characterName, starts_on: e.startsOn, ends_on: e.endsOn })
    .where('performer_id', '=', performerId)
    .where('production_id', '=', e.productionId)
    .execute();
}

export async function deleteEngagements(db: Db, performerId: string, productionIds: readonly string[]): Promise<void> {
  if (productionIds.length === 0) return;
  await db.deleteFrom('engagements').where('performer_id', '=', performerId).where('production_id', 'in', [...productionIds]).execute();
}

export async function findPerformerLinkedTo(db: Db, userId: string): Promise<{ id: string; legalName: string } | undefined> {
  const row = await db.selectFrom('performers').select(['id', 'legal_name']).where('user_id', '=', userId).executeTakeFirst();
  return row ? { id: row.id, legalName: row.legal_name } : undefined;
}

export async function setPerformerUserAtVersion(db: Db, id: string, userId: string | null, version: number): Promise<boolean> {
  const res = await db
    .updateTable('performers')
    .set({ user_id: userId, version: sql`version + 1`, updated_at: sql`now()` })
    .where('id', '=', id)
    .where('version', '=', version)
    .executeTakeFirst();
  return Number(res.numUpdatedRows) === 1;
}

/** Gives the user the `performer` role on these productions where they lack it; returns where it was added. */
export async function addPerformerMemberships(db: Db, userId: string, productionIds: readonly string[], createdBy: string): Promise<string[]> {
  if (productionIds.length === 0) return [];
  const rows = await db
    .insertInto('memberships')
    .values(productionIds.map((p) => ({ user_id: userId, production_id: p, role: 'performer' as const, created_by: createdBy })))
    .onConflict((oc) => oc.columns(['user_id', 'production_id', 'role']).doNothing())
    .returning('production_id')
    .execute();
  return rows.map((r) => r.production_id);
}

/** Takes the `performer` role on these productions away from the user; returns where it was removed. */
export async function removePerformerMemberships(db: Db, userId: string, productionIds: readonly string[]): Promise<string[]> {
  if (productionIds.length === 0) return [];
  const rows = await db
    .deleteFrom('memberships')
    .where('user_id', '=', userId)
    .where('role', '=', 'performer')
    .where('production_id', 'in', [...productionIds])
    .returning('production_id')
    .execute();
  return rows.map((r) => r.production_id);
}

/** Points the performer at a new portrait (or none); returns the files it pointed at before. */
export async function setPortraitFiles(db: Db, id: string, portraitFileId: string | null, thumbFileId: string | null): Promise<string[]> {
  const before = await db.selectFrom('performers').select(['portrait_file_id', 'portrait_thumb_file_id']).where('id', '=', id).forUpdate().executeTakeFirstOrThrow();
  await db.updateTable('performers').set({ portrait_file_id: portraitFileId, portrait_thumb_file_id: thumbFileId, updated_at: sql`now()` }).where('id', '=', id).execute();
  return [before.portrait_file_id, before.portrait_thumb_file_id].filter((f): f is string => f !== null);
}

/** Deletes file rows nothing points at any more; returns their storage paths so the bytes can go after commit. */
export async function deleteFileRows(db: Db, ids: readonly string[]): Promise<{ storagePath: string }[]> {
  if (ids.length === 0) return [];
  const rows = await db.deleteFrom('files').where('id', 'in', [...ids]).returning('storage_path').execute();
  return rows.map((r) => ({ storagePath: r.storage_path }));
}

export async function productionNames(db: Db, ids: readonly string[]): Promise<Map<string, string>> {
  if (ids.length === 0) return new Map();
  const rows = await db.selectFrom('productions').select(['id', 'name']).where('id', 'in', [...ids]).execute();
  return new Map(rows.map((r) => [r.id, r.name]));
}
