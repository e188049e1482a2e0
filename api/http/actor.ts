import { sql } from 'kysely';
import type { Actor } from '#shared/policy.ts';
import type { Db } from '../db/index.ts';

/** Loads who is asking, fresh on each request, so a revoked role stops working at once. */
export async function loadActor(db: Db, userId: string): Promise<Actor | null> {
  const user = await db.selectFrom('users').select(['id', 'is_admin']).where('id', '=', userId).executeTakeFirst();
  if (!user) return null;
  const [memberships, leads, performers] = await Promise.all([
    db.selectFrom('memberships').select(['production_id', 'role']).where('user_id', '=', userId).execute(),
    db
      .selectFrom('lead_appointments')
      .select('production_id')
      .where('user_id', '=', userId)
      .where('starts_at', '<=', sql<Date>`now()`)
      .where((eb) => eb.or([eb('ends_at', 'is', null), eb('ends_at', '>', sql<Date>`now()`)]))
      .execute(),
    db.selectFrom('performers').select('id').where('user_id', '=', userId).execute(),
  ]);
  return {
    userId: user.id,
    isAdmin: user.is_admin,
    memberships: memberships.map((m) => ({ productionId: m.production_id, role: m.role })),
    leadOf: leads.map((l) => l.production_id),
    performerIds: performers.map((p) => p.id),
  };
}
