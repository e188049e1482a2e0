import { sql } from 'kysely';
import type { Seat } from '#shared/domain/seats.ts';
import type { Actor } from '#shared/policy.ts';
import type { Home } from '#shared/schemas/session.ts';
import type { AppContext } from '../../context.ts';

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
  if (seat.role === 'head' || seat.role === 'lead') {
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
      href: null,
    });
  }
  return tasks;
}
