import { type Expression, type RawBuilder, type SqlBool, sql } from 'kysely';
import type { BodyRegion, CastKind, CastStatus, ConditionGrade } from '#shared/domain/archive-casts.ts';
import type { CastListQuery } from '#shared/schemas/archive.ts';
import { type Db, idArray } from '../../db/index.ts';
import { performersEngagedOn, performersMatchingName, withNameSearch } from '../performers/index.ts';
import { productionIdsMatchingName } from '../productions/index.ts';

/** A cast as stored, with the names of its performer and production for display. */
export interface CastRecord {
  id: string;
  labelCode: string;
  performerId: string;
  performerName: string;
  productionId: string;
  productionName: string;
  region: BodyRegion;
  kind: CastKind;
  material: string;
  madeOn: string;
  madeBy: string;
  pouredFromId: string | null;
  status: CastStatus;
  normalLocationId: string | null;
  currentLocationId: string | null;
  currentHolder: string | null;
  currentHolderUserId: string | null;
  currentProduction: string | null;
  dueBackAt: Date | null;
  since: Date;
  notes: string | null;
  version: number;
  condition: ConditionGrade | null;
  thumbnail: { photoId: string; fileId: string } | null;
}

/** Which casts an actor may read: those of these productions, or of performers engaged on them. */
export interface CastScope {
  productionIds: readonly string[];
}

function baseQuery(db: Db) {
  return db
    .selectFrom('casts')
    .innerJoin('performers as p', 'p.id', 'casts.performer_id')
    .innerJoin('productions as pr', 'pr.id', 'casts.production_id')
    .select([
      'casts.id',
      'casts.label_code',
      'casts.performer_id',
      sql<string>`coalesce(p.preferred_name, p.legal_name)`.as('performer_name'),
      'casts.production_id',
      'pr.name as production_name',
      'casts.region',
      'casts.kind',
      'casts.material',
      'casts.made_on',
      'casts.made_by',
      'casts.poured_from_id',
      'casts.status',
      'casts.normal_location_id',
      'casts.current_location_id',
      'casts.current_holder',
      'casts.current_holder_user_id',
      'casts.current_production',
      'casts.due_back_at',
      'casts.since',
      'casts.notes',
      'casts.version',
      // The newest check is the cast's condition: what was last seen (latestCondition).
      sql<ConditionGrade | null>`(select k.grade from cast_condition_checks k where k.cast_id = casts.id order by k.checked_on desc, k.created_at desc limit 1)`.as('condition'),
      // The first photo of the cast itself (not of a condition check) stands for it in lists.
      sql<string | null>`(select ph.id || ' ' || ph.thumb_file_id from cast_photos ph where ph.cast_id = casts.id order by (ph.condition_check_id is not null), ph.created_at, ph.id limit 1)`.as('thumb'),
    ]);
}
type Row = Awaited<ReturnType<ReturnType<typeof baseQuery>['executeTakeFirstOrThrow']>>;

function toRecord(r: Row): CastRecord {
  const [photoId, fileId] = r.thumb ? r.thumb.split(' ') : [];
  return {
    id: r.id,
    labelCode: r.label_code,
    performerId: r.performer_id,
    performerName: r.performer_name,
    productionId: r.production_id,
    productionName: r.production_name,
    region: r.region,
    kind: r.kind,
    material: r.material,
    madeOn: r.made_on,
    madeBy: r.made_by,
    pouredFromId: r.poured_from_id,
    status: r.status,
    normalLocationId: r.normal_location_id,
    currentLocationId: r.current_location_id,
    currentHolder: r.current_holder,
    currentHolderUserId: r.current_holder_user_id,
    currentProduction: r.current_production,
    dueBackAt: r.due_back_at ? new Date(r.due_back_at) : null,
    since: new Date(r.since),
    notes: r.notes,
    version: r.version,
    condition: r.condition,
    thumbnail: photoId && fileId ? { photoId, fileId } : null,
  };
}

/** The two ways a cast is in scope: from one of the productions, or of a performer engaged on one. */
function scopeArms(db: Db, scope: CastScope) {
  const ids = scope.productionIds.length ? [...scope.productionIds] : ['00000000-0000-0000-0000-000000000000'];
  return {
    own: sql<SqlBool>`casts.production_id = any(${idArray(ids)})`,
    // The performers as one array (not a subquery to hash against every cast): one index lookup each.
    engaged: sql<SqlBool>`casts.performer_id = any(array(${performersEngagedOn(db, ids)}))`,
    notOwn: sql<SqlBool>`casts.production_id <> all(${idArray(ids)})`,
  };
}

function inScope(db: Db, scope: CastScope): Expression<SqlBool> {
  const arms = scopeArms(db, scope);
  // Both arms are index lookups PostgreSQL ORs as bitmaps rather than a scan of the whole archive.
  return sql<SqlBool>`(${arms.own} or ${arms.engaged})`;
}

/**
 * How many casts in scope pass `rest`: the productions' own, plus the engaged performers' from other
 * productions (the two never overlap), each counted off its covering index (casts_production_scope_idx,
 * casts_performer_scope_idx) without reading the casts themselves when `rest` asks only what they carry.
 */
async function countInScope(db: Db, scope: CastScope, rest: readonly Expression<SqlBool>[]): Promise<number> {
  const arms = scopeArms(db, scope);
  const count = (conds: Expression<SqlBool>[]) =>
    db
      .selectFrom('casts')
      .select((eb) => eb.fn.countAll<string>().as('n'))
      .where((eb) => eb.and(conds));
  const row = await sql<{ n: string }>`select (${count([arms.own, ...rest])}) + (${count([arms.engaged, arms.notOwn, ...rest])}) as n`.execute(db);
  return Number(row.rows[0]!.n);
}

export async function findCast(db: Db, id: string): Promise<CastRecord | undefined> {
  const row = await baseQuery(db).where('casts.id', '=', id).executeTakeFirst();
  return row ? toRecord(row) : undefined;
}

export async function findCastsByIds(db: Db, ids: readonly string[]): Promise<CastRecord[]> {
  if (ids.length === 0) return [];
  return (await baseQuery(db).where('casts.id', 'in', [...ids]).execute()).map(toRecord);
}

/** Locks the cast's row for a change; the row as it stands once the lock is held. */
export async function lockCast(db: Db, id: string): Promise<CastRecord | undefined> {
  const locked = await db.selectFrom('casts').select('id').where('id', '=', id).forUpdate().executeTakeFirst();
  return locked ? findCast(db, id) : undefined;
}

export async function findCastByLabel(db: Db, labelCode: string): Promise<{ id: string } | undefined> {
  return db.selectFrom('casts').select('id').where('label_code', '=', labelCode).executeTakeFirst();
}

export async function castLabelTaken(db: Db, labelCode: string): Promise<boolean> {
  return Boolean(await findCastByLabel(db, labelCode));
}

/** Every cast of one performer, oldest first (the performer page). */
export async function listCastsOfPerformer(db: Db, performerId: string): Promise<CastRecord[]> {
  return (await baseQuery(db).where('casts.performer_id', '=', performerId).orderBy('casts.made_on').orderBy('casts.label_code').execute()).map(toRecord);
}

/**
 * Molds a production may run appliance pieces from: molds of performers engaged on it that the
 * archive still holds (in store, checked out or on loan), by performer and date.
 */
export async function listHeldMoldsFor(db: Db, productionId: string): Promise<CastRecord[]> {
  const rows = await baseQuery(db)
    .where('casts.kind', '=', 'mold')
    .where('casts.status', 'not in', ['returned_to_performer', 'destroyed'])
    .where('casts.performer_id', 'in', performersEngagedOn(db, [productionId]))
    .orderBy(sql`lower(coalesce(p.preferred_name, p.legal_name))`)
    .orderBy('casts.made_on')
    .orderBy('casts.label_code')
    .execute();
  return rows.map(toRecord);
}

/** Casts poured from this one (positives and cores from a mold). */
export async function listPouredFrom(db: Db, sourceId: string): Promise<CastRecord[]> {
  return (await baseQuery(db).where('casts.poured_from_id', '=', sourceId).orderBy('casts.made_on').execute()).map(toRecord);
}

/** Casts in scope whose current place is one of these places. */
export async function listCastsAt(db: Db, scope: CastScope, locationIds: readonly string[], which: 'current' | 'normal'): Promise<CastRecord[]> {
  if (locationIds.length === 0) return [];
  const column = which === 'current' ? 'casts.current_location_id' : 'casts.normal_location_id';
  const rows = await baseQuery(db).where(column, 'in', [...locationIds]).where(inScope(db, scope)).orderBy('casts.label_code').limit(1000).execute();
  return rows.map(toRecord);
}

/** Casts in store per place, counting only casts in scope. */
export async function countCastsByLocation(db: Db, scope: CastScope): Promise<Map<string, number>> {
  const rows = await db
    .selectFrom('casts')
    .select(['current_location_id', (eb) => eb.fn.countAll<string>().as('n')])
    .where('current_location_id', 'is not', null)
    .where(inScope(db, scope))
    .groupBy('current_location_id')
    .execute();
  return new Map(rows.map((r) => [r.current_location_id!, Number(r.n)]));
}

/** Casts in scope the archive still holds (not returned or destroyed), for retention review. */
export async function listHeldCasts(db: Db, scope: CastScope): Promise<CastRecord[]> {
  const rows = await baseQuery(db).where('casts.status', 'not in', ['returned_to_performer', 'destroyed']).where(inScope(db, scope)).orderBy('casts.label_code').execute();
  return rows.map(toRecord);
}

/** Casts out past their due-back time, in scope (or all, for the daily reminder), longest overdue first. */
export async function listOverdueCasts(db: Db, now: Date, scope: CastScope | null): Promise<CastRecord[]> {
  let q = baseQuery(db).where('casts.status', 'in', ['checked_out', 'on_loan']).where('casts.due_back_at', '<', now);
  if (scope) q = q.where(inScope(db, scope));
  return (await q.orderBy('casts.due_back_at').execute()).map(toRecord);
}

/** How the search box was read, turned into conditions by the service. */
export interface CastSearch {
  filters: Pick<CastListQuery, 'region' | 'kind' | 'status' | 'productionId' | 'overdue' | 'sort' | 'dir' | 'page' | 'pageSize'>;
  /** Exact label code of one cast. */
  labelCode?: string;
  /** Places whose casts are wanted (a place and everything below it). */
  placeIds?: readonly string[];
  /** Each term must match the performer's name (closely), the production, the region, the kind or a place's code. */
  terms?: readonly { term: string; regions: BodyRegion[]; kinds: CastKind[]; placeIds: string[] }[];
}

/** What each term matched among performers and productions, looked up first so the cast query only compares ids. */
interface TermHits {
  performerIds: string[];
  productionIds: string[];
}

const uuids = idArray;

/** The search's conditions besides the scope. */
function searchConditions(s: CastSearch, hits: readonly TermHits[], now: Date): Expression<SqlBool>[] {
  const conds: Expression<SqlBool>[] = [];
  const f = s.filters;
  if (f.region) conds.push(sql<SqlBool>`casts.region = ${f.region}`);
  if (f.kind) conds.push(sql<SqlBool>`casts.kind = ${f.kind}`);
  if (f.status) conds.push(sql<SqlBool>`casts.status = ${f.status}`);
  if (f.productionId) conds.push(sql<SqlBool>`casts.production_id = ${f.productionId}`);
  if (f.overdue === 'true') conds.push(sql<SqlBool>`(casts.status in ('checked_out', 'on_loan') and casts.due_back_at < ${now})`);
  if (s.labelCode) conds.push(sql<SqlBool>`casts.label_code = ${s.labelCode}`);
  if (s.placeIds) conds.push(sql<SqlBool>`casts.current_location_id = any(${uuids(s.placeIds)})`);
  (s.terms ?? []).forEach((t, i) => {
    // Each arm is a lookup a b-tree answers, so PostgreSQL can OR them as bitmaps.
    const arms: RawBuilder<unknown>[] = [];
    const hit = hits[i]!;
    if (hit.performerIds.length) arms.push(sql`casts.performer_id = any(${uuids(hit.performerIds)})`);
    if (hit.productionIds.length) arms.push(sql`casts.production_id = any(${uuids(hit.productionIds)})`);
    if (t.regions.length) arms.push(sql`casts.region in (${sql.join(t.regions)})`);
    if (t.kinds.length) arms.push(sql`casts.kind in (${sql.join(t.kinds)})`);
    if (t.placeIds.length) arms.push(sql`casts.current_location_id = any(${uuids(t.placeIds)})`);
    conds.push(arms.length ? sql<SqlBool>`(${sql.join(arms, sql` or `)})` : sql<SqlBool>`false`);
  });
  return conds;
}

function ordering(s: CastSearch, ranked: boolean): RawBuilder<unknown> {
  const dir = sql.raw(s.filters.dir === 'desc' ? 'desc' : 'asc');
  const name = sql`lower(coalesce(p.preferred_name, p.legal_name))`;
  const tail = sql`casts.label_code ${dir}`;
  switch (s.filters.sort) {
    case 'labelCode':
      return tail;
    case 'madeOn':
      return sql`casts.made_on ${dir}, ${tail}`;
    case 'performer':
      return sql`${name} ${dir}, casts.made_on, ${tail}`;
    case 'relevance':
      // Best-matching performer names first; without words to rank by, the newest casts first (indexed).
      return ranked ? sql`coalesce(rank.ordinality, 2147483647), casts.made_on desc, casts.label_code` : sql`casts.made_on desc, casts.label_code`;
  }
}

/** One page of casts in scope matching the search, and how many match in all. */
export async function searchCasts(db: Db, scope: CastScope, s: CastSearch, now: Date): Promise<{ items: CastRecord[]; total: number }> {
  return withNameSearch(db, async (trx) => {
    const hits: TermHits[] = [];
    const score = new Map<string, number>();
    for (const t of s.terms ?? []) {
      const performers = await performersMatchingName(trx, t.term);
      for (const p of performers) score.set(p.id, (score.get(p.id) ?? 0) + p.score);
      hits.push({ performerIds: performers.map((p) => p.id), productionIds: await productionIdsMatchingName(trx, t.term) });
    }
    const rest = searchConditions(s, hits, now);
    const where = (eb: { and: (e: Expression<SqlBool>[]) => Expression<SqlBool> }) => eb.and([inScope(trx, scope), ...rest]);
    const ranked = s.filters.sort === 'relevance' && score.size > 0;
    const byScore = [...score].sort((a, b) => b[1] - a[1]).map(([id]) => id);
    const page = baseQuery(trx);
    // Rank by a join on the ordered ids rather than a search of the array per row; a one-column
    // function aliased "rank" names its column "rank" too.
    const rank = sql<{ rank: string; ordinality: number }>`unnest(${uuids(byScore)}) with ordinality`.as('rank');
    const query = ranked ? page.leftJoin(rank, (j) => j.on(sql<SqlBool>`rank.rank = casts.performer_id`)) : page;
    const rows = await query
      .where(where)
      .orderBy(ordering(s, ranked))
      .limit(s.filters.pageSize)
      .offset((s.filters.page - 1) * s.filters.pageSize)
      .execute();
    // A page that is not full is the last one (or the first, empty), so it says the total itself; only a
    // full page, or one past the end, is counted.
    const offset = (s.filters.page - 1) * s.filters.pageSize;
    if (rows.length < s.filters.pageSize && (rows.length > 0 || offset === 0)) return { items: rows.map(toRecord), total: offset + rows.length };
    return { items: rows.map(toRecord), total: await countInScope(trx, scope, rest) };
  });
}

export interface NewCast {
  labelCode: string;
  performerId: string;
  productionId: string;
  region: BodyRegion;
  kind: CastKind;
  material: string;
  madeOn: string;
  madeBy: string;
  pouredFromId: string | null;
  locationId: string;
  since: Date;
  notes: string | null;
  createdBy: string | null;
}

export async function insertCast(db: Db, c: NewCast): Promise<string> {
  const row = await db
    .insertInto('casts')
    .values({
      label_code: c.labelCode,
      performer_id: c.performerId,
      production_id: c.productionId,
      region: c.region,
      kind: c.kind,
      material: c.material,
      made_on: c.madeOn,
      made_by: c.madeBy,
      poured_from_id: c.pouredFromId,
      normal_location_id: c.locationId,
      current_location_id: c.locationId,
      since: c.since,
      notes: c.notes,
      created_by: c.createdBy,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

export async function updateCastAtVersion(
  db: Db,
  id: string,
  v: { region: BodyRegion; kind: CastKind; material: string; madeOn: string; madeBy: string; pouredFromId: string | null; notes: string | null },
  version: number,
): Promise<boolean> {
  const r = await db
    .updateTable('casts')
    .set({ region: v.region, kind: v.kind, material: v.material, made_on: v.madeOn, made_by: v.madeBy, poured_from_id: v.pouredFromId, notes: v.notes, updated_at: new Date(), version: sql`version + 1` })
    .where('id', '=', id)
    .where('version', '=', version)
    .executeTakeFirst();
  return Number(r.numUpdatedRows) === 1;
}

/** Where a cast is, as the columns hold it: one current place, chosen by its status. */
export interface StoredWhereabouts {
  status: CastStatus;
  normalLocationId: string | null;
  currentLocationId: string | null;
  currentHolder: string | null;
  currentHolderUserId: string | null;
  currentProduction: string | null;
  dueBackAt: Date | null;
  since: Date;
}

export async function setWhereaboutsAtVersion(db: Db, id: string, w: StoredWhereabouts, version: number): Promise<boolean> {
  const r = await db
    .updateTable('casts')
    .set({
      status: w.status,
      normal_location_id: w.normalLocationId,
      current_location_id: w.currentLocationId,
      current_holder: w.currentHolder,
      current_holder_user_id: w.currentHolderUserId,
      current_production: w.currentProduction,
      due_back_at: w.dueBackAt,
      since: w.since,
      updated_at: new Date(),
      version: sql`version + 1`,
    })
    .where('id', '=', id)
    .where('version', '=', version)
    .executeTakeFirst();
  return Number(r.numUpdatedRows) === 1;
}
