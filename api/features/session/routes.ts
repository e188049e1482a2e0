import type { Request } from 'express';
import { jsonArrayFrom } from 'kysely/helpers/postgres';
import type { Actor } from '#shared/policy.ts';
import { HomeSchema, SelectSeatInputSchema, SessionSchema } from '#shared/schemas/session.ts';
import { chooseSeat, seatsFor } from '#shared/domain/seats.ts';
import type { AppContext } from '../../context.ts';
import { invalid, notFound } from '../../http/errors.ts';
import { defineRoute } from '../../http/route.ts';
import { homeTasks } from './home.ts';

async function buildSession(ctx: AppContext, actor: Actor, req: Request) {
  const ids = [...new Set([...actor.memberships.map((m) => m.productionId), ...actor.leadOf])];
  // One statement: the user and the names of their productions.
  const user = await ctx.db
    .selectFrom('users as u')
    .select((eb) => [
      'u.id',
      'u.email',
      'u.display_name',
      'u.is_admin',
      jsonArrayFrom(eb.selectFrom('productions as p').select(['p.id', 'p.name']).where('p.id', '=', eb.fn.any(eb.val(ids)))).as('productions'),
    ])
    .where('u.id', '=', actor.userId)
    .executeTakeFirst();
  if (!user) throw notFound('Your user record');
  const productions = user.productions;
  const seats = seatsFor(actor, new Map(productions.map((p) => [p.id, p.name])));
  const current = chooseSeat(seats, req.session.current);
  return {
    user: { id: user.id, email: user.email, displayName: user.display_name, isAdmin: user.is_admin },
    memberships: [...actor.memberships],
    leadOf: [...actor.leadOf],
    performerIds: [...actor.performerIds],
    seats,
    current,
  };
}

export const sessionRoutes = [
  defineRoute({
    method: 'get',
    path: '/api/session',
    summary: 'Who is signed in, every production and role they hold, and the one they act in now',
    tag: 'session',
    auth: 'session',
    response: SessionSchema,
    handler: ({ ctx, actor, req }) => buildSession(ctx, actor, req),
  }),
  defineRoute({
    method: 'put',
    path: '/api/session/current',
    summary: 'Switch the production and role the signed-in person acts in',
    tag: 'session',
    auth: 'session',
    body: SelectSeatInputSchema,
    response: SessionSchema,
    async handler({ ctx, actor, req, body }) {
      const before = await buildSession(ctx, actor, req);
      const seat = before.seats.find((s) => s.productionId === body.productionId && s.role === body.role);
      if (!seat) throw invalid({ role: ['You do not hold that role on that production.'] });
      req.session.current = { productionId: seat.productionId, role: seat.role };
      return { ...before, current: seat };
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/home',
    summary: 'What needs doing today for the role the person acts in now',
    tag: 'session',
    auth: 'session',
    response: HomeSchema,
    async handler({ ctx, actor, req }) {
      const session = await buildSession(ctx, actor, req);
      const seat = session.current;
      if (!seat) return { role: 'performer' as const, productionId: null, tasks: [] };
      return { role: seat.role, productionId: seat.productionId, tasks: await homeTasks(ctx, actor, seat) };
    },
  }),
];
