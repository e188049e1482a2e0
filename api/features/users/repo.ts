import { sql } from 'kysely';
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
