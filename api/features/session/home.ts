import { sql } from 'kysely';
import type { Seat } from '#shared/domain/seats.ts';
import type { Actor } from '#shared/policy.ts';
import type { Home } from '#shared/schemas/session.ts';
import type { AppContext } from '../../context.ts';
import { archivistTasks } from '../archive/home-tasks.ts';
import { listBookings } from '../bookings/routes.ts';

const DAY = 86_400_000;

async function consentTasks(ctx: AppContext, productionId: string): Promise<Task[]> {
  const now = new Date();
  const expiring = await ctx.db
    .selectFrom('consents as c')
    .innerJoin('engagements as e', (j) => j.onRef('e.performer_id', '=', 'c.performer_id').on('e.production_id', '=', productionId))
    .select((eb) => eb.fn.count<string>('c.id').distinct().as('n'))
    .where((eb) => eb.or([eb('c.production_id', '=', productionId), eb('c.production_id', 'is', null)]))
    .where('c.withdrawn_at', 'is', null)
    .where('c.expires_at', '>', now)
    .where('c.expires_at', '<=', new Date(now.getTime() + 30 * DAY))
    .executeTakeFirstOrThrow();
  const upcoming = await listBookings(ctx.db, { productionId, from: now, to: new Date(now.getTime() + 30 * DAY) });
  const missing = upcoming.filter((b) => b.status === 'booked' && b.consentMissing);
  const waiting = await ctx.db
    .selectFrom('signing_requests')
    .select((eb) => eb.fn.countAll<string>().as('n'))
    .where('production_id', '=', productionId)
    .where('status', '=', 'open')
    .where('mode', '=', 'link')
    .where('expires_at', '>', now)
    .executeTakeFirstOrThrow();
  return [
    {
      id: 'consents-expiring',
      title: 'Consents expiring within 30 days',
      detail: 'Ask these performers to sign again before their consent runs out.',
      count: Number(expiring.n),
      href: '/performers?consent=expiring',
    },
    {
      id: 'bookings-missing-consent',
      title: 'Upcoming sessions missing a consent',
      detail: missing.length
        ? missing.slice(0, 3).map((b) => `${b.performerName} (${new Date(b.startsAt).toISOString().slice(0, 10)})`).join(', ') + (missing.length > 3 ? '…' : '')
        : 'Every booked session in the next 30 days has the consent it needs.',
      count: missing.length,
      href: '/bookings',
    },
    {
      id: 'signing-links-open',
      title: 'Signing links not yet signed',
      detail: 'Forms sent to performers by e-mail that are still open.',
      count: Number(waiting.n),
      href: null,
    },
  ];
}

type Task = Home['tasks'][number];

/** Today's list for a seat. Each capability adds its own items here as it lands. */
export async function homeTasks(ctx: AppContext, actor: Actor, seat: Seat): Promise<Task[]> {
  const tasks: Task[] = [];
  if (seat.role === 'admin' && actor.isAdmin) {
    const waiting = await ctx.db
      .selectFrom('users')
      .select((eb) => eb.fn.countAll<string>().as('n'))
      .where('is_admin', '=', false)
      .where((eb) => eb.not(eb.exists(eb.selectFrom('memberships').select('id').whereRef('memberships.user_id', '=', 'users.id'))))
      .executeTakeFirstOrThrow();
    tasks.push({
      id: 'users-without-access',
      title: 'People waiting for access',
      detail: 'Signed in, but not yet given a role on any production.',
      count: Number(waiting.n),
      href: '/admin/users?access=none',
    });
    const noLead = await ctx.db
      .selectFrom('productions')
      .select((eb) => eb.fn.countAll<string>().as('n'))
      .where((eb) =>
        eb.not(
          eb.exists(
            eb
              .selectFrom('lead_appointments')
              .select('id')
              .whereRef('lead_appointments.production_id', '=', 'productions.id')
              .where('ends_at', 'is', null),
          ),
        ),
      )
      .executeTakeFirstOrThrow();
    tasks.push({
      id: 'productions-without-lead',
      title: 'Productions without a designated lead',
      detail: 'Health details cannot be read or recorded until a lead is appointed.',
      count: Number(noLead.n),
      href: '/admin/productions',
    });
    return tasks;
  }
  if (!seat.productionId) return tasks;
  if (seat.role === 'performer' && actor.performerIds[0]) {
    const performerId = actor.performerIds[0];
    const now = new Date();
    const rows = await ctx.db.selectFrom('consents').select(['signed_at', 'expires_at', 'withdrawn_at']).where('performer_id', '=', performerId).execute();
    const active = rows.filter((c) => !c.withdrawn_at && (!c.expires_at || c.expires_at > now)).length;
    tasks.push({
      id: 'my-consents',
      title: 'Your consents',
      detail: 'See what you have agreed to, read your answers, and withdraw a consent at any time.',
      count: active,
      href: `/performers/${performerId}`,
    });
    return tasks;
  }
  if (seat.role === 'archivist') {
    tasks.push(...(await archivistTasks(ctx.db, actor)));
    return tasks;
  }
  if (seat.role === 'head' || seat.role === 'lead') {
    tasks.push(...(await consentTasks(ctx, seat.productionId)));
    const engaged = await ctx.db
      .selectFrom('engagements')
      .select((eb) => eb.fn.countAll<string>().as('n'))
      .where('production_id', '=', seat.productionId)
      .where((eb) => eb.or([eb('ends_on', 'is', null), eb('ends_on', '>=', sql<string>`current_date`)]))
      .executeTakeFirstOrThrow();
    tasks.push({
      id: 'performers-engaged',
      title: 'Performers engaged',
      detail: 'Performers currently engaged on this production.',
      count: Number(engaged.n),
      href: '/performers',
    });
  }
  return tasks;
}
