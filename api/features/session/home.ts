import type { Seat } from '#shared/domain/seats.ts';
import type { Actor } from '#shared/policy.ts';
import type { Home } from '#shared/schemas/session.ts';
import type { AppContext } from '../../context.ts';
import { archivistTasks } from '../archive/index.ts';
import { listBookings } from '../bookings/index.ts';
import { piecesShortTask } from '../builds/index.ts';
import { countActiveConsents, countExpiringForProduction, countNewWithdrawals, countOpenLinkRequests } from '../consents/index.ts';
import { dateTimeInWords } from '#shared/domain/words.ts';
import { countEngagedNow } from '../performers/index.ts';
import { countProductionsWithoutLead } from '../productions/index.ts';
import { countUsersWithoutAccess } from '../users/index.ts';

const DAY = 86_400_000;
type Task = Home['tasks'][number];

async function consentTasks(ctx: AppContext, actor: Actor, productionId: string): Promise<Task[]> {
  const now = new Date();
  const until = new Date(now.getTime() + 30 * DAY);
  const [expiring, upcoming, waiting, withdrawn] = await Promise.all([
    countExpiringForProduction(ctx.db, productionId, now, until),
    // Every upcoming session waiting for consent stays listed until it is signed (or the session is cancelled).
    listBookings(ctx.db, { productionId, from: now }),
    countOpenLinkRequests(ctx.db, productionId, now),
    countNewWithdrawals(ctx, actor.userId, productionId),
  ]);
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
        ? missing.slice(0, 3).map((b) => `${b.performerName} (${dateTimeInWords(new Date(b.startsAt), ctx.config.timeZone)}${b.consentWithdrawn ? ', consent withdrawn' : ''})`).join('; ') + (missing.length > 3 ? '…' : '')
        : 'Every booked session has the consent it needs.',
      count: missing.length,
      href: '/bookings',
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
    const [waiting, noLead] = await Promise.all([countUsersWithoutAccess(ctx.db), countProductionsWithoutLead(ctx.db)]);
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
    return [
      {
        id: 'my-consents',
        title: 'Your consents',
        detail: 'See what you have agreed to, read your answers, and withdraw a consent at any time.',
        count: await countActiveConsents(ctx.db, performerId, new Date()),
        href: `/performers/${performerId}`,
      },
    ];
  }
  if (seat.role === 'archivist') return archivistTasks(ctx.db, actor);
  if (seat.role === 'head' || seat.role === 'lead') {
    const tasks = await consentTasks(ctx, actor, seat.productionId);
    tasks.push({
      id: 'performers-engaged',
      title: 'Performers engaged',
      detail: 'Performers currently engaged on this production.',
      count: await countEngagedNow(ctx.db, seat.productionId),
      href: '/performers',
    });
    tasks.push(await piecesShortTask(ctx.db, seat.productionId));
    return tasks;
  }
  return [];
}
