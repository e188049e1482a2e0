import type { Request } from 'express';
import { CONSENT_KIND_LABELS } from '#shared/domain/consent.ts';
import { BOOKING_PURPOSE_LABELS } from '#shared/domain/bookings.ts';
import { can, type Actor } from '#shared/policy.ts';
import type { Booking } from '#shared/schemas/bookings.ts';
import type { WithdrawalNoticeList } from '#shared/schemas/consent-notices.ts';
import type { AppContext } from '../../context.ts';
import { recordEvent, writeAudit } from '../../http/audit.ts';
import { authorize } from '../../http/authorize.ts';
import { invalid } from '../../http/errors.ts';
import { mailDateTime } from '../../mail/dates.ts';
import { deliverAll } from '../../mail/deliver.ts';
import type { OutgoingMail } from '../../mail/mailer.ts';
import { listBookings } from '../bookings/index.ts';
import { findPerformerScope } from '../performers/index.ts';
import { findCurrentLeads, findDepartment, findHeads, findProductionName, mailFooter } from '../productions/index.ts';
import { findConsentSummary } from './consent-repo.ts';
import { findSeenAt, listWithdrawalsForProduction, markSeen, unseenWithdrawalsCount } from './notice-repo.ts';

const DAY = 86_400_000;
/** With nothing marked seen yet, the card looks this far back. */
const FIRST_LOOK_DAYS = 30;

function sessionLine(b: Booking, timeZone: string): string {
  return `- ${BOOKING_PURPOSE_LABELS[b.purpose]}, ${mailDateTime(new Date(b.startsAt), timeZone)}${b.location ? `, ${b.location}` : ''}`;
}

/**
 * Tells the staff of the consent's production (or, for a consent naming none, of every production
 * the performer works on) that it was withdrawn: heads without reason or health detail, leads told
 * the reason waits on their home. Sent after the commit; a failed send is kept for the Outbox.
 */
export async function sendWithdrawalNotices(ctx: AppContext, consentId: string): Promise<void> {
  const c = await findConsentSummary(ctx.db, consentId);
  if (!c || !c.withdrawnAt) return;
  const performer = await findPerformerScope(ctx.db, c.performerId);
  const productionIds = c.productionId ? [c.productionId] : (performer?.productionIds ?? []);
  const leads = await findCurrentLeads(ctx.db, productionIds);
  const sessions = (await listBookings(ctx.db, { performerId: c.performerId, productionIds, from: new Date() })).filter((b) => b.consentWithdrawn);
  const messages: OutgoingMail[] = [];
  for (const productionId of productionIds) {
    const [productionName, heads, dep] = await Promise.all([findProductionName(ctx.db, productionId), findHeads(ctx.db, productionId), findDepartment(ctx.db, productionId)]);
    const here = sessions.filter((s) => s.productionId === productionId);
    const leadsHere = leads.filter((l) => l.productionId === productionId);
    const opening = `${c.performerName} withdrew their ${CONSENT_KIND_LABELS[c.kind].toLowerCase()} consent ("${c.title}") on ${productionName ?? 'the production'}, on ${mailDateTime(new Date(c.withdrawnAt), ctx.config.timeZone)}.`;
    const sessionLines = here.length
      ? ['', `${here.length === 1 ? 'This upcoming session is' : `These ${here.length} upcoming sessions are`} now waiting for consent; do not go ahead until they sign again:`, ...here.map((s) => sessionLine(s, ctx.config.timeZone))]
      : ['', 'No upcoming session depends on it.'];
    const link = ['', `Sessions: ${ctx.config.appOrigin}/bookings`];
    const subject = `Consent withdrawn: ${c.performerName} (${productionName ?? 'Plinth'})`;
    for (const h of heads) {
      if (leadsHere.some((l) => l.email === h.email)) continue;
      messages.push({ to: h.email, subject, text: [`Hello ${h.name},`, '', opening, 'Any reason the performer gave stays with the designated lead.', ...sessionLines, ...link, ...mailFooter(dep)].join('\n') });
    }
    for (const l of leadsHere) {
      messages.push({
        to: l.email,
        subject,
        text: [`Hello ${l.name},`, '', opening, 'If the performer gave a reason, it is on your home in Plinth (each reading is logged).', ...sessionLines, '', `Your home: ${ctx.config.appOrigin}/`, ...mailFooter(dep)].join('\n'),
      });
    }
  }
  await deliverAll(ctx, messages);
}

/** Withdrawals on a production's record since this person last marked them seen, with the sessions each leaves waiting. */
export async function listWithdrawalNotices(ctx: AppContext, actor: Actor, productionId: string, req: Request): Promise<WithdrawalNoticeList> {
  authorize(actor, 'consents.request', { productionId });
  const readAt = new Date();
  const since = (await findSeenAt(ctx.db, actor.userId, productionId, 'withdrawals')) ?? new Date(readAt.getTime() - FIRST_LOOK_DAYS * DAY);
  const reasonsShown = can(actor, 'medical.read', { productionId });
  const rows = await listWithdrawalsForProduction(ctx.db, productionId, since, { withReasons: reasonsShown });
  const sessions = rows.length ? (await listBookings(ctx.db, { productionId, from: readAt })).filter((b) => b.consentWithdrawn) : [];
  // A withdrawal reason may speak of health: reading one is a medical read of that performer.
  if (reasonsShown) {
    for (const performerId of new Set(rows.filter((r) => r.reason).map((r) => r.performerId))) {
      await recordEvent(ctx.db, { actorUserId: actor.userId, action: 'medical.read', performerId, entityType: 'performer', entityId: performerId, productionId, req, details: { performerId, fields: ['withdrawal_reason'] } });
    }
  }
  return {
    since: since.toISOString(),
    readAt: readAt.toISOString(),
    reasonsShown,
    items: rows.map((r) => ({
      consentId: r.consentId,
      performerId: r.performerId,
      performerName: r.performerName,
      kind: r.kind,
      title: r.title,
      withdrawnAt: r.withdrawnAt.toISOString(),
      withdrawnVia: r.withdrawnVia,
      reason: r.reason,
      sessionsAffected: sessions.filter((s) => s.performerId === r.performerId),
    })),
  };
}

/** "I have looked": withdrawals up to the moment the list was read stop counting as new for this person. */
export async function markWithdrawalsSeen(ctx: AppContext, actor: Actor, productionId: string, seenAt: string, req: Request): Promise<{ ok: true }> {
  authorize(actor, 'consents.request', { productionId });
  const at = new Date(seenAt);
  if (at.getTime() > Date.now() + 60_000) throw invalid({ seenAt: ['This moment has not come yet'] });
  await ctx.db.transaction().execute(async (trx) => {
    await markSeen(trx, actor.userId, productionId, 'withdrawals', at);
    await writeAudit(trx, { actorUserId: actor.userId, action: 'consent_notices.seen', entityType: 'production', entityId: productionId, productionId, req });
  });
  return { ok: true };
}

/** The home's count of withdrawals the user has not seen, as a one-column query for its counts statement. */
export function newWithdrawalsCount(ctx: AppContext, userId: string, productionId: string, now: Date) {
  return unseenWithdrawalsCount(ctx.db, userId, productionId, new Date(now.getTime() - FIRST_LOOK_DAYS * DAY));
}
