import type { Request } from 'express';
import type { Actor } from '#shared/policy.ts';
import { HomeSchema, SelectSeatInputSchema, SessionSchema } from '#shared/schemas/session.ts';
import { chooseSeat, chooseSeatByRoles, seatsFor } from '#shared/domain/seats.ts';
import type { AppContext } from '../../context.ts';
import { invalid, notFound } from '../../http/errors.ts';
import { sessionProfile } from '../../http/session.ts';
import { type AnyRoute, defineRoute } from '../../http/route.ts';
import { findUserWithProductionNames } from '../users/index.ts';
import { homeTasks } from './home.ts';
import { saveLastSeat } from './repo.ts';

async function buildSession(ctx: AppContext, actor: Actor, req: Request) {
  const ids = [...new Set([...actor.memberships.map((m) => m.productionId), ...actor.leadOf])];
  // Kept with the actor under its stamp; otherwise one statement: the user and the names of their productions.
  const kept = sessionProfile(req);
  const found = kept
    ? { id: actor.userId, email: kept.email, displayName: kept.displayName, isAdmin: actor.isAdmin, productions: new Map(ids.flatMap((id) => (kept.productionNames[id] === undefined ? [] : [[id, kept.productionNames[id]!] as const]))) }
    : await findUserWithProductionNames(ctx.db, actor.userId, ids);
  if (!found) throw notFound('Your user record');
  const { productions, ...user } = found;
  const seats = seatsFor(actor, productions);
  const current = chooseSeat(seats, req.session.current);
  return {
    user,
    memberships: [...actor.memberships],
    leadOf: [...actor.leadOf],
    performerIds: [...actor.performerIds],
    seats,
    current,
  };
}

export const sessionRoutes: AnyRoute[] = [
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
      await saveLastSeat(ctx.db, actor.userId, seat);
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
      // The seat from the roles alone where production names cannot change it; otherwise as the session reads it.
      const quick = chooseSeatByRoles(actor, req.session.current);
      const seat = quick === undefined ? (await buildSession(ctx, actor, req)).current : quick;
      if (!seat) return { role: 'performer' as const, productionId: null, tasks: [] };
      return { role: seat.role, productionId: seat.productionId, tasks: await homeTasks(ctx, actor, seat) };
    },
  }),
];
