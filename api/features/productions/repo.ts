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
