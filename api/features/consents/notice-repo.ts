import { type RawBuilder, sql } from 'kysely';
import type { ConsentKind } from '#shared/domain/consent.ts';
import { openJson } from '../../crypto/medical.ts';
import type { Db } from '../../db/index.ts';

/** The most withdrawals one list holds (and the home's count says). */
const WITHDRAWALS_LISTED = 200;

export interface WithdrawalRow {
  consentId: string;
  performerId: string;
  performerName: string;
  productionId: string | null;
  kind: ConsentKind;
  title: string;
  withdrawnAt: Date;
  withdrawnVia: 'performer' | 'lead' | 'link' | null;
  /** Opened only when the caller asks (the lead's reads); null otherwise. */
  reason: string | null;
}

/** The withdrawals a production's record holds after `since` (a moment, or an expression giving one). */
function withdrawalsSince(db: Db, productionId: string, since: Date | RawBuilder<Date>) {
  return db
    .selectFrom('consents as c')
    .where('c.withdrawn_at', 'is not', null)
    .where('c.withdrawn_at', '>', since)
    .where((eb) =>
      eb.or([
        eb('c.production_id', '=', productionId),
        eb.and([eb('c.production_id', 'is', null), eb.exists(eb.selectFrom('engagements as e').select('e.id').whereRef('e.performer_id', '=', 'c.performer_id').where('e.production_id', '=', productionId))]),
      ]),
    );
}

/**
 * Consents of a production's record withdrawn after `since`: those given to it, and those naming no
 * production of performers engaged on it. Newest first, at most 200.
 */
export async function listWithdrawalsForProduction(db: Db, productionId: string, since: Date, opts: { withReasons: boolean }): Promise<WithdrawalRow[]> {
  const rows = await withdrawalsSince(db, productionId, since)
    .innerJoin('consent_template_versions as v', 'v.id', 'c.template_version_id')
    .innerJoin('performers as p', 'p.id', 'c.performer_id')
    .select([
      'c.id',
      'c.performer_id',
      sql<string>`coalesce(p.preferred_name, p.legal_name)`.as('performer_name'),
      'c.production_id',
      'c.kind',
      'v.title',
      'c.withdrawn_at',
      'c.withdrawn_via',
      'c.withdrawal_reason',
    ])
    .orderBy('c.withdrawn_at', 'desc')
    .limit(WITHDRAWALS_LISTED)
    .execute();
  return rows.map((r) => ({
    consentId: r.id,
    performerId: r.performer_id,
    performerName: r.performer_name,
    productionId: r.production_id,
    kind: r.kind,
    title: r.title,
    withdrawnAt: new Date(r.withdrawn_at!),
    withdrawnVia: r.withdrawn_via,
    reason: opts.withReasons && r.withdrawal_reason !== null ? openJson<string>(r.withdrawal_reason) : null,
  }));
}

export async function findSeenAt(db: Db, userId: string, productionId: string, topic: 'withdrawals'): Promise<Date | null> {
  const r = await db.selectFrom('staff_seen').select('seen_at').where('user_id', '=', userId).where('production_id', '=', productionId).where('topic', '=', topic).executeTakeFirst();
  return r ? new Date(r.seen_at) : null;
}

export async function markSeen(db: Db, userId: string, productionId: string, topic: 'withdrawals', at: Date): Promise<void> {
  await db
    .insertInto('staff_seen')
    .values({ user_id: userId, production_id: productionId, topic, seen_at: at })
    .onConflict((oc) => oc.columns(['user_id', 'production_id', 'topic']).doUpdateSet({ seen_at: sql`greatest(staff_seen.seen_at, excluded.seen_at)` }))
    .execute();
}

/**
 * How many withdrawals the user has not seen: those after their last look at the list, or in the
 * `firstLookSince` window when they never looked; as many as the list holds at most. A one-column
 * query (`n`) for a counts statement, reading the last look in the same statement.
 */
export function unseenWithdrawalsCount(db: Db, userId: string, productionId: string, firstLookSince: Date) {
  const seen = sql<Date>`coalesce((select s.seen_at from staff_seen s where s.user_id = ${userId} and s.production_id = ${productionId} and s.topic = 'withdrawals'), ${firstLookSince})`;
  return db.selectFrom(withdrawalsSince(db, productionId, seen).select('c.id').limit(WITHDRAWALS_LISTED).as('w')).select((eb) => eb.fn.countAll<string>().as('n'));
}
