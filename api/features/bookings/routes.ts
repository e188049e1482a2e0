import { sql } from 'kysely';
import { z } from 'zod';
import { bookingsMissingConsent, type ConsentKind, type ConsentTimes } from '#shared/domain/consent.ts';
import { IdParamsSchema } from '#shared/schemas/common.ts';
import { type Booking, BookingListSchema, BookingSchema, CreateBookingInputSchema } from '#shared/schemas/consents.ts';
import type { Db } from '../../db/index.ts';
import { writeAudit } from '../../http/audit.ts';
import { authorize } from '../../http/authorize.ts';
import { conflict, invalid, notFound } from '../../http/errors.ts';
import { defineRoute } from '../../http/route.ts';

/** Bookings with, for each, whether its consent will be in force when it starts. */
export async function listBookings(db: Db, where: { productionId?: string; performerId?: string; from?: Date; to?: Date; ids?: string[] }): Promise<Booking[]> {
  let q = db
    .selectFrom('bookings as b')
    .innerJoin('performers as p', 'p.id', 'b.performer_id')
    .select(['b.id', 'b.performer_id', sql<string>`coalesce(p.preferred_name, p.legal_name)`.as('performer_name'), 'b.production_id', 'b.purpose', 'b.starts_at', 'b.location', 'b.status']);
  if (where.productionId) q = q.where('b.production_id', '=', where.productionId);
  if (where.performerId) q = q.where('b.performer_id', '=', where.performerId);
  if (where.from) q = q.where('b.starts_at', '>=', where.from);
  if (where.to) q = q.where('b.starts_at', '<', where.to);
  if (where.ids) q = q.where('b.id', 'in', where.ids);
  const rows = await q.orderBy('b.starts_at').limit(500).execute();
  const performerIds = [...new Set(rows.map((r) => r.performer_id))];
  const consents = performerIds.length
    ? await db.selectFrom('consents').select(['performer_id', 'production_id', 'kind', 'signed_at', 'expires_at', 'withdrawn_at']).where('performer_id', 'in', performerIds).execute()
    : [];
  // A session needs a consent given to its own production (or to none named).
  const missing = new Set<string>();
  for (const productionId of new Set(rows.map((r) => r.production_id))) {
    const byPerformer = new Map<string, (ConsentTimes & { kind: ConsentKind })[]>();
    for (const c of consents) {
      if (c.production_id !== null && c.production_id !== productionId) continue;
      const list = byPerformer.get(c.performer_id) ?? [];
      list.push({ kind: c.kind, signedAt: new Date(c.signed_at), expiresAt: c.expires_at, withdrawnAt: c.withdrawn_at });
      byPerformer.set(c.performer_id, list);
    }
    const due = rows.filter((r) => r.status === 'booked' && r.production_id === productionId);
    for (const m of bookingsMissingConsent(due.map((r) => ({ id: r.id, performerId: r.performer_id, purpose: r.purpose, startsAt: new Date(r.starts_at) })), byPerformer)) missing.add(m.booking.id);
  }
  return rows.map((r) => ({
    id: r.id,
    performerId: r.performer_id,
    performerName: r.performer_name,
    productionId: r.production_id,
    purpose: r.purpose,
    startsAt: new Date(r.starts_at).toISOString(),
    location: r.location,
    status: r.status,
    consentMissing: missing.has(r.id),
  }));
}

export const bookingRoutes = [
  defineRoute({
    method: 'get',
    path: '/api/bookings',
    summary: "A production's sessions (patch tests, life casts, applications) and whether each has its consent",
    tag: 'bookings',
    auth: 'session',
    query: z.object({ productionId: z.uuid(), performerId: z.uuid().optional(), upcoming: z.enum(['true', 'false']).default('true') }),
    response: BookingListSchema,
    errors: [403],
    async handler({ ctx, actor, query }) {
      authorize(actor, 'performers.view', { productionId: query.productionId });
      const items = await listBookings(ctx.db, { productionId: query.productionId, performerId: query.performerId, from: query.upcoming === 'true' ? new Date() : undefined });
      return { items };
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/bookings',
    summary: 'Book a session for a performer',
    tag: 'bookings',
    auth: 'session',
    body: CreateBookingInputSchema,
    response: BookingSchema,
    status: 201,
    errors: [403],
    async handler({ ctx, actor, body, req }) {
      authorize(actor, 'patchtests.book', { productionId: body.productionId });
      const engaged = await ctx.db.selectFrom('engagements').select('id').where('performer_id', '=', body.performerId).where('production_id', '=', body.productionId).executeTakeFirst();
      if (!engaged) throw invalid({ performerId: ['This performer is not engaged on this production.'] });
      if (new Date(body.startsAt).getTime() < Date.now() - 60_000) throw invalid({ startsAt: ['Choose a time that has not passed'] });
      const id = await ctx.db.transaction().execute(async (trx) => {
        const b = await trx
          .insertInto('bookings')
          .values({ performer_id: body.performerId, production_id: body.productionId, purpose: body.purpose, starts_at: new Date(body.startsAt), location: body.location || null, created_by: actor.userId })
          .returning('id')
          .executeTakeFirstOrThrow();
        await writeAudit(trx, { actorUserId: actor.userId, action: 'booking.create', entityType: 'booking', entityId: b.id, productionId: body.productionId, req, details: { purpose: body.purpose } });
        return b.id;
      });
      return (await listBookings(ctx.db, { ids: [id] }))[0]!;
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/bookings/:id/cancel',
    summary: 'Cancel a booked session',
    tag: 'bookings',
    auth: 'session',
    params: IdParamsSchema,
    response: BookingSchema,
    errors: [403, 404, 409],
    async handler({ ctx, actor, params, req }) {
      const b = await ctx.db.selectFrom('bookings').select(['id', 'production_id', 'status']).where('id', '=', params.id).executeTakeFirst();
      if (!b) throw notFound('That booking');
      authorize(actor, 'patchtests.book', { productionId: b.production_id });
      if (b.status !== 'booked') throw conflict('Only a booked session can be cancelled.');
      await ctx.db.transaction().execute(async (trx) => {
        await trx.updateTable('bookings').set({ status: 'cancelled' }).where('id', '=', params.id).execute();
        await writeAudit(trx, { actorUserId: actor.userId, action: 'booking.cancel', entityType: 'booking', entityId: params.id, productionId: b.production_id, req });
      });
      return (await listBookings(ctx.db, { ids: [params.id] }))[0]!;
    },
  }),
];
