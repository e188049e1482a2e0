import { sql } from 'kysely';
import type { Db } from '../../db/index.ts';

/** Remembers the seat a person chose, so their next sign-in starts on it. */
export async function saveLastSeat(db: Db, userId: string, seat: { productionId: string | null; role: string }): Promise<void> {
  await db
    .insertInto('user_last_seats')
    .values({ user_id: userId, production_id: seat.productionId, role: seat.role })
    .onConflict((oc) => oc.column('user_id').doUpdateSet({ production_id: seat.productionId, role: seat.role, chosen_at: sql`now()` }))
    .execute();
}

/**
 * Where a person's sign-in should start: the seat they last chose, else the production of their
 * latest entry in the audit log (the production they last worked on), in one statement.
 */
export async function findLastSeat(db: Db, userId: string): Promise<{ productionId: string | null; role?: string } | undefined> {
  const { rows } = await sql<{ production_id: string | null; role: string | null; chosen: boolean }>`
    select production_id, role, true as chosen from user_last_seats where user_id = ${userId}
    union all
    (select production_id, null, false from audit_log
      where actor_user_id = ${userId} and production_id is not null
      order by at desc limit 1)
    order by chosen desc
    limit 1`.execute(db);
  const hit = rows[0];
  if (!hit) return undefined;
  return hit.chosen ? { productionId: hit.production_id, role: hit.role ?? undefined } : { productionId: hit.production_id };
}
