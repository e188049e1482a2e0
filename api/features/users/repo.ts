import { type RawBuilder, sql } from 'kysely';
import { jsonArrayFrom } from 'kysely/helpers/postgres';
import type { User, UserListQuery } from '#shared/schemas/admin.ts';
import type { Db } from '../../db/index.ts';

const SORT_COLUMNS = { displayName: 'users.display_name', email: 'users.email', createdAt: 'users.created_at' } as const;

function likePattern(q: string): string {
  return `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

function baseQuery(db: Db) {
  return db
    .selectFrom('users')
    .select((eb) => [
      'users.id',
      'users.email',
      'users.display_name',
      'users.is_admin',
      'users.oidc_subject',
      'users.created_at',
      'users.version',
      eb.selectFrom('memberships').select(eb.fn.countAll<string>().as('n')).whereRef('memberships.user_id', '=', 'users.id').as('membership_count'),
    ]);
}

type Row = Awaited<ReturnType<ReturnType<typeof baseQuery>['executeTakeFirstOrThrow']>>;

function toUser(r: Row): User {
  return {
    id: r.id,
    email: r.email,
    displayName: r.display_name,
    isAdmin: r.is_admin,
    linked: r.oidc_subject !== null,
    membershipCount: Number(r.membership_count ?? 0),
    createdAt: new Date(r.created_at).toISOString(),
    version: r.version,
  };
}

export async function listUsers(db: Db, q: UserListQuery): Promise<{ items: User[]; total: number }> {
  let query = baseQuery(db);
  let count = db.selectFrom('users').select((eb) => eb.fn.countAll<string>().as('n'));
  if (q.q) {
    const pat = likePattern(q.q);
    query = query.where((eb) => eb.or([eb('users.display_name', 'ilike', pat), eb('users.email', 'ilike', pat)]));
    count = count.where((eb) => eb.or([eb('users.display_name', 'ilike', pat), eb('users.email', 'ilike', pat)]));
  }
  if (q.access === 'none') {
    const noRole = sql<boolean>`not exists (select 1 from memberships m where m.user_id = users.id) and not users.is_admin`;
    query = query.where(noRole);
    count = count.where(noRole);
  }
  const [rows, total] = await Promise.all([
    query
      .orderBy(sql.ref(SORT_COLUMNS[q.sort]), q.dir)
      .orderBy('users.id')
      .limit(q.pageSize)
      .offset((q.page - 1) * q.pageSize)
      .execute(),
    count.executeTakeFirstOrThrow(),
  ]);
  return { items: rows.map(toUser), total: Number(total.n) };
}

export async function findUserById(db: Db, id: string): Promise<User | undefined> {
  const row = await baseQuery(db).where('users.id', '=', id).executeTakeFirst();
  return row ? toUser(row) : undefined;
}

export async function insertUser(db: Db, v: { email: string; displayName: string; isAdmin: boolean }): Promise<string> {
  const row = await db
    .insertInto('users')
    .values({ email: v.email, display_name: v.displayName, is_admin: v.isAdmin })
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

/** Updates only if the row is still at the version the editor saw; returns false when it is not. */
export async function updateUserAtVersion(db: Db, id: string, v: { displayName: string; isAdmin: boolean; version: number }): Promise<boolean> {
  const res = await db
    .updateTable('users')
    .set({ display_name: v.displayName, is_admin: v.isAdmin, version: sql`version + 1`, updated_at: sql`now()` })
    .where('id', '=', id)
    .where('version', '=', v.version)
    .executeTakeFirst();
  return Number(res.numUpdatedRows) === 1;
}

export async function countAdmins(db: Db): Promise<number> {
  const r = await db.selectFrom('users').select((eb) => eb.fn.countAll<string>().as('n')).where('is_admin', '=', true).executeTakeFirstOrThrow();
  return Number(r.n);
}

export async function isEmailTaken(db: Db, email: string): Promise<boolean> {
  return Boolean(await db.selectFrom('users').select('id').where(sql`lower(email)`, '=', email.toLowerCase()).executeTakeFirst());
}

export async function lockUser(db: Db, id: string): Promise<{ id: string; isAdmin: boolean; version: number } | undefined> {
  const r = await db.selectFrom('users').select(['id', 'is_admin', 'version']).where('id', '=', id).forUpdate().executeTakeFirst();
  return r ? { id: r.id, isAdmin: r.is_admin, version: r.version } : undefined;
}

/** Name and address of a user, for notices and for who-is-linked views. */
export async function findUserSummary(db: Db, id: string): Promise<{ id: string; email: string; displayName: string; isAdmin: boolean } | undefined> {
  const r = await db.selectFrom('users').select(['id', 'email', 'display_name', 'is_admin']).where('id', '=', id).executeTakeFirst();
  return r ? { id: r.id, email: r.email, displayName: r.display_name, isAdmin: r.is_admin } : undefined;
}

/** Signed-in people given no role anywhere yet (the administrator's home), as a one-column query (`n`) for its counts statement. */
export function usersWithoutAccessCount(db: Db) {
  return db
    .selectFrom('users')
    .select((eb) => eb.fn.countAll<string>().as('n'))
    .where('is_admin', '=', false)
    .where((eb) => eb.not(eb.exists(eb.selectFrom('memberships').select('id').whereRef('memberships.user_id', '=', 'users.id'))));
}

/** Whether an address is the sign-in of an administrator, a lead or anyone with a staff role. */
export async function isStaffAddress(db: Db, email: string): Promise<boolean> {
  return (await staffAddressesAmong(db, [email])).size > 0;
}

/** Which of these (lower-cased) addresses are staff sign-ins, in one query. */
export async function staffAddressesAmong(db: Db, emails: readonly string[]): Promise<Set<string>> {
  if (emails.length === 0) return new Set();
  const rows = await db
    .selectFrom('users as u')
    .select(sql<string>`lower(u.email)`.as('email'))
    .where(sql`lower(u.email)`, 'in', emails.map((e) => e.toLowerCase()))
    .where((eb) =>
      eb.or([
        eb('u.is_admin', '=', true),
        eb.exists(eb.selectFrom('memberships as m').select('m.id').whereRef('m.user_id', '=', 'u.id').where('m.role', '!=', 'performer')),
        eb.exists(eb.selectFrom('lead_appointments as l').select('l.id').whereRef('l.user_id', '=', 'u.id')),
      ]),
    )
    .execute();
  return new Set(rows.map((r) => r.email));
}


/** The signed-in user with the names of the productions they hold roles on, in one statement. */
export async function findUserWithProductionNames(
  db: Db,
  userId: string,
  productionIds: readonly string[],
): Promise<{ id: string; email: string; displayName: string; isAdmin: boolean; productions: Map<string, string> } | undefined> {
  const user = await db
    .selectFrom('users as u')
    .select((eb) => [
      'u.id',
      'u.email',
      'u.display_name',
      'u.is_admin',
      jsonArrayFrom(eb.selectFrom('productions as p').select(['p.id', 'p.name']).where('p.id', '=', eb.fn.any(eb.val([...productionIds])))).as('productions'),
    ])
    .where('u.id', '=', userId)
    .executeTakeFirst();
  if (!user) return undefined;
  return { id: user.id, email: user.email, displayName: user.display_name, isAdmin: user.is_admin, productions: new Map(user.productions.map((p) => [p.id, p.name])) };
}

/** A user's name and address as a JSON object (null when `userId` is null), for one-statement reads. */
export function userSummaryJsonSql(userId: RawBuilder<string | null>): RawBuilder<{ id: string; email: string; display_name: string } | null> {
  return sql<{ id: string; email: string; display_name: string } | null>`(select json_build_object('id', u.id, 'email', u.email, 'display_name', u.display_name) from users u where u.id = ${userId})`;
}
