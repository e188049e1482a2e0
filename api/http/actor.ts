import { sql } from 'kysely';
import { jsonArrayFrom } from 'kysely/helpers/postgres';
import type { Actor, ProductionRole } from '#shared/policy.ts';
import type { Db } from '../db/index.ts';

/**
 * Who is asking, with what it was read at: the user's `access_version` (every change to their
 * memberships, lead appointments, performer links or admin flag gives it a new value) and the
 * next moment a lead appointment of theirs starts or ends, when it must be read again.
 */
export interface StampedActor {
  actor: Actor;
  accessVersion: string;
  /** ISO time of the earliest future lead appointment start or end; null when there is none. */
  validUntil: string | null;
  /** What the session screen shows of the user, under the same stamp (their name, address or a production's name moves it). */
  profile: SessionProfile;
}

export interface SessionProfile {
  email: string;
  displayName: string;
  /** Names of every production the user has a membership or a lead appointment on, by id. */
  productionNames: Record<string, string>;
}

/** Reads the actor in one statement, so the stamp, the roles and the profile come from the same snapshot. */
export async function loadActor(db: Db, userId: string): Promise<StampedActor | null> {
  const row = await db
    .selectFrom('users as u')
    .where('u.id', '=', userId)
    .select((eb) => [
      'u.id',
      'u.is_admin',
      'u.access_version',
      'u.email',
      'u.display_name',
      jsonArrayFrom(eb.selectFrom('memberships as m').select(['m.production_id', 'm.role']).whereRef('m.user_id', '=', 'u.id')).as('memberships'),
      jsonArrayFrom(
        eb
          .selectFrom('lead_appointments as l')
          .select('l.production_id')
          .whereRef('l.user_id', '=', 'u.id')
          .where('l.starts_at', '<=', sql<Date>`now()`)
          .where((w) => w.or([w('l.ends_at', 'is', null), w('l.ends_at', '>', sql<Date>`now()`)])),
      ).as('leads'),
      jsonArrayFrom(eb.selectFrom('performers as p').select('p.id').whereRef('p.user_id', '=', 'u.id')).as('performers'),
      jsonArrayFrom(
        eb
          .selectFrom('productions as pr')
          .select(['pr.id', 'pr.name'])
          .where((w) =>
            w.or([
              w.exists(w.selectFrom('memberships as m2').select('m2.user_id').whereRef('m2.production_id', '=', 'pr.id').whereRef('m2.user_id', '=', 'u.id')),
              w.exists(w.selectFrom('lead_appointments as l2').select('l2.user_id').whereRef('l2.production_id', '=', 'pr.id').whereRef('l2.user_id', '=', 'u.id')),
            ]),
          ),
      ).as('production_names'),
      sql<Date | null>`(
        select min(b.at) from lead_appointments la
        cross join lateral (values (la.starts_at), (la.ends_at)) as b(at)
        where la.user_id = u.id and b.at > now()
      )`.as('valid_until'),
    ])
    .executeTakeFirst();
  if (!row) return null;
  return {
    actor: {
      userId: row.id,
      isAdmin: row.is_admin,
      memberships: row.memberships.map((m) => ({ productionId: m.production_id, role: m.role as ProductionRole })),
      leadOf: row.leads.map((l) => l.production_id),
      performerIds: row.performers.map((p) => p.id),
    },
    accessVersion: row.access_version,
    validUntil: row.valid_until ? new Date(row.valid_until).toISOString() : null,
    profile: { email: row.email, displayName: row.display_name, productionNames: Object.fromEntries(row.production_names.map((p) => [p.id, p.name])) },
  };
}
