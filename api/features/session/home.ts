import type { Seat } from '#shared/domain/seats.ts';
import type { Actor } from '#shared/policy.ts';
import type { Home } from '#shared/schemas/session.ts';
import type { AppContext } from '../../context.ts';
import { dayIn } from '../../jobs/define.ts';
import { archivistTasks } from '../archive/index.ts';
import { listBookings } from '../bookings/index.ts';
import { piecesShortTask } from '../builds/index.ts';
import { BOOKING_PURPOSE_LABELS } from '#shared/domain/bookings.ts';
import { countActiveConsents, expiringForProductionCount, listOpenRequestsForPerformer, newWithdrawalsCount, openLinkRequestsCount } from '../consents/index.ts';
import { headPatchTestTasks, leadReadingTasks } from '../patch-tests/index.ts';
import { engagedNowCount } from '../performers/index.ts';
import { productionsWithoutLeadCount } from '../productions/index.ts';
import { usersWithoutAccessCount } from '../users/index.ts';

const DAY = 86_400_000;
type Task = Home['tasks'][number];

/**
 * The head's and lead's counts in one statement: each feature gives its count as a one-column query,
 * selected here side by side, so a home costs one round trip for all of them.
 */
async function productionCounts(ctx: AppContext, actor: Actor, productionId: string, now: Date) {
  const until = new Date(now.getTime() + 30 * DAY);
  const row = await ctx.db
    .selectNoFrom([
      expiringForProductionCount(ctx.db, productionId, now, until).as('expiring'),
      openLinkRequestsCount(ctx.db, productionId, now).as('waiting'),
      newWithdrawalsCount(ctx, actor.userId, productionId, now).as('withdrawn'),
      engagedNowCount(ctx.db, productionId, dayIn(ctx.config.timeZone, now)).as('engaged'),
    ])
    .executeTakeFirstOrThrow();
  return { expiring: Number(row.expiring), waiting: Number(row.waiting), withdrawn: Number(row.withdrawn), engaged: Number(row.engaged) };
}

type ProductionCounts = Awaited<ReturnType<typeof productionCounts>>;

function consentTasks(counts: ProductionCounts, upcoming: Awaited<ReturnType<typeof listBookings>>): Task[] {
  const { expiring, waiting, withdrawn } = counts;
  const missing = upcoming.filter((b) => b.status === 'booked' && b.consentMissing);
  return [
    {
      id: 'withdrawn-since-last-look',
      title: 'Withdrawn since you last looked',
      detail: withdrawn ? 'Consents performers withdrew, and the sessions each leaves waiting.' : 'No consent was withdrawn since you last looked.',
      count: withdrawn,
      href: '/consents/worklist',
    },
    {
      id: 'consents-expiring',
      title: 'Consents expiring within 30 days',
      detail: 'Ask these performers to sign again before their consent runs out.',
      count: expiring,
      href: '/performers?consent=expiring',
    },
    {
      id: 'bookings-missing-consent',
      title: 'Sessions waiting for consent',
      detail: missing.length
        ? `Ask for the consent before the session${missing.length > 3 ? `; the first three of ${missing.length}` : ''}:`
        : 'Every booked session has the consent it needs.',
      count: missing.length,
      href: '/bookings',
      items: missing.slice(0, 3).map((b) => ({ label: b.consentWithdrawn ? `${b.performerName} (consent withdrawn)` : b.performerName, at: b.startsAt })),
    },
    {
      id: 'signing-links-open',
      title: 'Signing links not yet signed',
      detail: 'Forms sent to performers by e-mail that are still open.',
      count: waiting,
      href: null,
    },
  ];
}

/** Today's list for a seat, gathered from each feature's own counts. Each capability adds its items here as it lands. */
export async function homeTasks(ctx: AppContext, actor: Actor, seat: Seat): Promise<Task[]> {
  if (seat.role === 'admin' && actor.isAdmin) {
    // Both counts in one statement, each the feature's own one-column query.
    const row = await ctx.db.selectNoFrom([usersWithoutAccessCount(ctx.db).as('waiting'), productionsWithoutLeadCount(ctx.db).as('no_lead')]).executeTakeFirstOrThrow();
    const [waiting, noLead] = [Number(row.waiting), Number(row.no_lead)];
    return [
      { id: 'users-without-access', title: 'People waiting for access', detail: 'Signed in, but not yet given a role on any production.', count: waiting, href: '/admin/users?access=none' },
      {
        id: 'productions-without-lead',
        title: 'Productions without a designated lead',
        detail: 'Health details cannot be read or recorded until a lead is appointed.',
        count: noLead,
        href: '/admin/productions',
      },
    ];
  }
  if (!seat.productionId) return [];
  if (seat.role === 'performer' && actor.performerIds[0]) {
    const performerId = actor.performerIds[0];
    const now = new Date();
    const [sessions, waiting, active] = await Promise.all([
      listBookings(ctx.db, { performerId, from: now, status: 'booked' }),
      listOpenRequestsForPerformer(ctx.db, performerId, now),
      countActiveConsents(ctx.db, performerId, now),
    ]);
    const next = sessions[0];
    return [
      {
        id: 'my-next-session',
        title: 'Your next session',
        detail: next ? `${BOOKING_PURPOSE_LABELS[next.purpose]}${next.location ? `, ${next.location}` : ''}` : 'No session is booked for you.',
        count: sessions.length,
        href: `/performers/${performerId}#sessions`,
        items: next ? [{ label: BOOKING_PURPOSE_LABELS[next.purpose], at: next.startsAt }] : [],
      },
      {
        id: 'my-forms-to-sign',
        title: 'Waiting for you to sign',
        detail: waiting.length
          ? 'Open the link in the e-mail the department sent you, or sign on their tablet when you are in. You are free not to sign.'
          : 'Nothing is waiting for your signature.',
        count: waiting.length,
        href: null,
        items: waiting.map((r) => ({ label: r.title, at: null })),
      },
      {
        id: 'my-consents',
        title: 'Your consents',
        detail: 'See what you have agreed to, read your answers, and withdraw a consent at any time.',
        count: active,
        href: `/performers/${performerId}`,
      },
    ];
  }
  if (seat.role === 'archivist') return archivistTasks(ctx.db, actor);
  if (seat.role === 'head' || seat.role === 'lead') {
    const now = new Date();
    // The lists are independent reads: asked for together, not one after another.
    const [counts, upcoming, pieces, readings, patchTests] = await Promise.all([
      productionCounts(ctx, actor, seat.productionId, now),
      // Every upcoming session waiting for consent stays listed until it is signed (or the session is cancelled).
      listBookings(ctx.db, { productionId: seat.productionId, from: now }),
      piecesShortTask(ctx.db, seat.productionId),
      seat.role === 'lead' ? leadReadingTasks(ctx.db, seat.productionId, now, ctx.config.timeZone) : Promise.resolve([]),
      headPatchTestTasks(ctx.db, seat.productionId, now),
    ]);
    return [
      ...readings,
      ...consentTasks(counts, upcoming),
      { id: 'performers-engaged', title: 'Performers engaged', detail: 'Performers currently engaged on this production.', count: counts.engaged, href: '/performers' },
      pieces,
      ...patchTests,
    ];
  }
  return [];
}
