import { sql } from 'kysely';
import type { LeadAppointment, Membership, Production } from '#shared/schemas/admin.ts';
import type { Db } from '../../db/index.ts';

const SORT = { name: 'productions.name', startsOn: 'productions.starts_on' } as const;

function baseQuery(db: Db) {
  return db
    .selectFrom('productions')
    .leftJoin('lead_appointments as la', (j) => j.onRef('la.production_id', '=', 'productions.id').on('la.ends_at', 'is', null))
    .leftJoin('users as lu', 'lu.id', 'la.user_id')
    .select([
      'productions.id',
      'productions.name',
      'productions.kind',
      'productions.starts_on',
      'productions.ends_on',
      'productions.version',
      'la.user_id as lead_user_id',
      'lu.display_name as lead_name',
      sql<string>`(select count(distinct m.user_id) from memberships m where m.production_id = productions.id)`.as('member_count'),
    ]);
}
type Row = Awaited<ReturnType<ReturnType<typeof baseQuery>['executeTakeFirstOrThrow']>>;

function toProduction(r: Row): Production {
  return {
    id: r.id,
    name: r.name,
    kind: r.kind,
    startsOn: r.starts_on ?? null,
    endsOn: r.ends_on ?? null,
    lead: r.lead_user_id ? { userId: r.lead_user_id, displayName: r.lead_name ?? '' } : null,
    memberCount: Number(r.member_count ?? 0),
    version: r.version,
  };
}

export async function listProductions(db: Db, q: { q?: string; page: number; pageSize: number; sort: 'name' | 'startsOn'; dir: 'asc' | 'desc' }) {
  let query = baseQuery(db);
  let count = db.selectFrom('productions').select((eb) => eb.fn.countAll<string>().as('n'));
  if (q.q) {
    const pat = `%${q.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    query = query.where('productions.name', 'ilike', pat);
    count = count.where('productions.name', 'ilike', pat);
  }
  const [rows, total] = await Promise.all([
    query.orderBy(sql.ref(SORT[q.sort]), sql.raw(q.dir === 'asc' ? 'asc nulls last' : 'desc nulls last')).orderBy('productions.id').limit(q.pageSize).offset((q.page - 1) * q.pageSize).execute(),
    count.executeTakeFirstOrThrow(),
  ]);
  return { items: rows.map(toProduction), total: Number(total.n) };
}

export async function findProduction(db: Db, id: string): Promise<Production | undefined> {
  const row = await baseQuery(db).where('productions.id', '=', id).executeTakeFirst();
  return row ? toProduction(row) : undefined;
}

export async function listMemberships(db: Db, productionId: string): Promise<Membership[]> {
  const rows = await db
    .selectFrom('memberships')
    .innerJoin('users', 'users.id', 'memberships.user_id')
    .select(['memberships.id', 'memberships.user_id', 'users.display_name', 'users.email', 'memberships.role', 'memberships.created_at'])
    .where('memberships.production_id', '=', productionId)
    .orderBy('users.display_name')
    .orderBy('memberships.role')
    .execute();
  return rows.map((r) => ({
    id: r.id,
    userId: r.user_id,
    displayName: r.display_name,
    email: r.email,
    role: r.role,
    createdAt: new Date(r.created_at).toISOString(),
  }));
}

export async function listLeadHistory(db: Db, productionId: string): Promise<LeadAppointment[]> {
  const rows = await db
    .selectFrom('lead_appointments as la')
    .innerJoin('users as u', 'u.id', 'la.user_id')
    .leftJoin('users as ab', 'ab.id', 'la.appointed_by')
    .leftJoin('users as eb', 'eb.id', 'la.ended_by')
    .select(['la.id', 'la.user_id', 'u.display_name', 'la.starts_at', 'la.ends_at', 'ab.display_name as appointed_by', 'eb.display_name as ended_by'])
    .where('la.production_id', '=', productionId)
    .orderBy('la.starts_at', 'desc')
    .execute();
  return rows.map((r) => ({
    id: r.id,
    userId: r.user_id,
    displayName: r.display_name,
    startsAt: new Date(r.starts_at).toISOString(),
    endsAt: r.ends_at ? new Date(r.ends_at).toISOString() : null,
    appointedBy: r.appointed_by,
    endedBy: r.ended_by,
  }));
}

/** Takes the production row lock, so two writers to one production queue rather than race. */
export async function lockProduction(db: Db, id: string) {
  return db.selectFrom('productions').select(['id', 'name', 'version']).where('id', '=', id).forUpdate().executeTakeFirst();
}

export async function bumpProductionVersion(db: Db, id: string): Promise<void> {
  await db.updateTable('productions').set({ version: sql`version + 1`, updated_at: sql`now()` }).where('id', '=', id).execute();
}

/**
 * Whether a user may be a production's designated lead: they hold a staff role there, and no
 * performer record of theirs is engaged there (nor do they hold the performer role there).
 */
export async function leadFitness(db: Db, userId: string, productionId: string): Promise<{ staff: boolean; performer: boolean }> {
  const roles = await db.selectFrom('memberships').select('role').where('user_id', '=', userId).where('production_id', '=', productionId).execute();
  const engaged = await db
    .selectFrom('performers as p')
    .innerJoin('engagements as e', 'e.performer_id', 'p.id')
    .select('p.id')
    .where('p.user_id', '=', userId)
    .where('e.production_id', '=', productionId)
    .executeTakeFirst();
  return { staff: roles.some((r) => r.role !== 'performer'), performer: roles.some((r) => r.role === 'performer') || Boolean(engaged) };
}

export async function displayNameOf(db: Db, userId: string): Promise<string> {
  return (await db.selectFrom('users').select('display_name').where('id', '=', userId).executeTakeFirst())?.display_name ?? 'Someone';
}

/** The department heads of a production, to be told who holds the health data. */
export async function findHeads(db: Db, productionId: string): Promise<{ email: string; name: string }[]> {
  return db
    .selectFrom('memberships as m')
    .innerJoin('users as u', 'u.id', 'm.user_id')
    .select(['u.email', 'u.display_name as name'])
    .where('m.production_id', '=', productionId)
    .where('m.role', '=', 'head')
    .execute();
}

export async function findProductionName(db: Db, id: string): Promise<string | null> {
  return (await db.selectFrom('productions').select('name').where('id', '=', id).executeTakeFirst())?.name ?? null;
}

export async function productionNames(db: Db, ids: readonly string[]): Promise<Map<string, string>> {
  if (ids.length === 0) return new Map();
  const rows = await db.selectFrom('productions').select(['id', 'name']).where('id', 'in', [...ids]).execute();
  return new Map(rows.map((r) => [r.id, r.name]));
}

export async function isProductionNameTaken(db: Db, name: string, exceptId?: string): Promise<boolean> {
  let q = db.selectFrom('productions').select('id').where(sql`lower(name)`, '=', name.toLowerCase());
  if (exceptId) q = q.where('id', '!=', exceptId);
  return Boolean(await q.executeTakeFirst());
}

export interface ProductionValues {
  name: string;
  kind: 'film' | 'television' | 'stage' | 'other';
  startsOn: string | null;
  endsOn: string | null;
}

export async function insertProduction(db: Db, v: ProductionValues): Promise<string> {
  const row = await db.insertInto('productions').values({ name: v.name, kind: v.kind, starts_on: v.startsOn, ends_on: v.endsOn }).returning('id').executeTakeFirstOrThrow();
  return row.id;
}

export async function updateProduction(db: Db, id: string, v: ProductionValues): Promise<void> {
  await db
    .updateTable('productions')
    .set({ name: v.name, kind: v.kind, starts_on: v.startsOn, ends_on: v.endsOn, version: sql`version + 1`, updated_at: sql`now()` })
    .where('id', '=', id)
    .execute();
}

export async function hasMembership(db: Db, userId: string, productionId: string, role: string): Promise<boolean> {
  const row = await db.selectFrom('memberships').select('id').where('user_id', '=', userId).where('production_id', '=', productionId).where('role', '=', role as never).executeTakeFirst();
  return Boolean(row);
}

export async function insertMembership(db: Db, v: { userId: string; productionId: string; role: 'head' | 'artist' | 'archivist' | 'performer'; createdBy: string }): Promise<void> {
  await db.insertInto('memberships').values({ user_id: v.userId, production_id: v.productionId, role: v.role, created_by: v.createdBy }).execute();
}

export async function deleteMembership(db: Db, id: string, productionId: string): Promise<{ userId: string; role: string } | undefined> {
  const r = await db.deleteFrom('memberships').where('id', '=', id).where('production_id', '=', productionId).returning(['user_id', 'role']).executeTakeFirst();
  return r ? { userId: r.user_id, role: r.role } : undefined;
}

/** The current lead appointment's row, if any. */
export async function findOpenLeadAppointment(db: Db, productionId: string): Promise<{ id: string; userId: string } | undefined> {
  const r = await db.selectFrom('lead_appointments').select(['id', 'user_id']).where('production_id', '=', productionId).where('ends_at', 'is', null).executeTakeFirst();
  return r ? { id: r.id, userId: r.user_id } : undefined;
}

export async function endLeadAppointment(db: Db, id: string, endedBy: string): Promise<void> {
  await db.updateTable('lead_appointments').set({ ends_at: sql`now()`, ended_by: endedBy }).where('id', '=', id).execute();
}

export async function endOpenLeadAppointment(db: Db, productionId: string, endedBy: string): Promise<string | undefined> {
  const r = await db
    .updateTable('lead_appointments')
    .set({ ends_at: sql`now()`, ended_by: endedBy })
    .where('production_id', '=', productionId)
    .where('ends_at', 'is', null)
    .returning('user_id')
    .executeTakeFirst();
  return r?.user_id;
}

export async function insertLeadAppointment(db: Db, productionId: string, userId: string, appointedBy: string): Promise<void> {
  await db.insertInto('lead_appointments').values({ production_id: productionId, user_id: userId, appointed_by: appointedBy }).execute();
}

/** Productions with no lead now (the administrator's home), as a one-column query (`n`) for its counts statement. */
export function productionsWithoutLeadCount(db: Db) {
  return db
    .selectFrom('productions')
    .select((eb) => eb.fn.countAll<string>().as('n'))
    .where((eb) => eb.not(eb.exists(eb.selectFrom('lead_appointments').select('id').whereRef('lead_appointments.production_id', '=', 'productions.id').where('ends_at', 'is', null))));
}

// ---- the performer role, which follows a linked performer's engagements

/** Gives the user the `performer` role on these productions where they lack it; returns where it was added. */
export async function addPerformerMemberships(db: Db, userId: string, productionIds: readonly string[], createdBy: string | null): Promise<string[]> {
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


/** The designated leads now in post on these productions, to be told of identity changes. */
export async function findCurrentLeads(db: Db, productionIds: readonly string[]): Promise<{ email: string; name: string; productionId: string }[]> {
  if (productionIds.length === 0) return [];
  return db
    .selectFrom('lead_appointments as l')
    .innerJoin('users as u', 'u.id', 'l.user_id')
    .select(['u.email', 'u.display_name as name', 'l.production_id as productionId'])
    .where('l.production_id', 'in', [...productionIds])
    .where('l.starts_at', '<=', sql<Date>`now()`)
    .where((eb) => eb.or([eb('l.ends_at', 'is', null), eb('l.ends_at', '>', sql<Date>`now()`)]))
    .execute();
}

/** Ids of productions whose name holds the term (trigram-indexed). */
export async function productionIdsMatchingName(db: Db, term: string): Promise<string[]> {
  const rows = await db.selectFrom('productions').select('productions.id').where('productions.name', 'ilike', `%${term.replace(/[\\%_]/g, (c) => `\\${c}`)}%`).execute();
  return rows.map((r) => r.id);
}

/** Staff who work on these productions (any role but performer), by name, for naming who holds or authorises something. */
export async function staffOf(db: Db, productionIds: readonly string[]): Promise<{ userId: string; name: string; email: string }[]> {
  if (productionIds.length === 0) return [];
  const rows = await db
    .selectFrom('memberships as m')
    .innerJoin('users as u', 'u.id', 'm.user_id')
    .select(['u.id', 'u.display_name', 'u.email'])
    .where('m.production_id', 'in', [...productionIds])
    .where('m.role', '<>', 'performer')
    .distinct()
    .orderBy('u.display_name')
    .execute();
  return rows.map((r) => ({ userId: r.id, name: r.display_name, email: r.email }));
}
