import { IdParamsSchema } from '#shared/schemas/common.ts';
import { z } from 'zod';
import { BookingListQuerySchema, BookingListSchema, BookingSchema, BookingStaffSchema, ConsentCheckQuerySchema, ConsentCheckSchema, CreateBookingInputSchema, RescheduleBookingInputSchema } from '#shared/schemas/bookings.ts';
import { IdSchema } from '#shared/schemas/common.ts';
import { authorize } from '../../http/authorize.ts';
import { type AnyRoute, defineRoute } from '../../http/route.ts';
import { bookingStaff, cancelBooking, checkConsentForSession, createBooking, listBookings, rescheduleBooking } from './service.ts';

export const bookingRoutes: AnyRoute[] = [
  defineRoute({
    method: 'get',
    path: '/api/bookings',
    summary: "A production's sessions (patch tests, life casts, applications) and whether each has its consent",
    tag: 'bookings',
    auth: 'session',
    query: BookingListQuerySchema,
    response: BookingListSchema,
    errors: [403],
    async handler({ ctx, actor, query }) {
      authorize(actor, 'sessions.view', { productionId: query.productionId });
      // A calendar asks for a window, past sessions included; otherwise the list runs from now on.
      const window = query.from || query.to ? { from: query.from ? new Date(query.from) : undefined, to: query.to ? new Date(query.to) : undefined } : { from: query.upcoming === 'true' ? new Date() : undefined };
      const items = await listBookings(ctx.db, { productionId: query.productionId, performerId: query.performerId, ...window });
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
    handler: ({ ctx, actor, body, req }) => createBooking(ctx, actor, body, req),
  }),
  defineRoute({
    method: 'get',
    path: '/api/bookings/consent-check',
    summary: 'Before booking: the consent a session needs, and whether the performer will have it in force when it starts',
    tag: 'bookings',
    auth: 'session',
    query: ConsentCheckQuerySchema,
    response: ConsentCheckSchema,
    errors: [403],
    handler: ({ ctx, actor, query }) => checkConsentForSession(ctx, actor, query),
  }),
  defineRoute({
    method: 'get',
    path: '/api/bookings/staff',
    summary: 'Who can be assigned to a session on a production',
    tag: 'bookings',
    auth: 'session',
    query: z.object({ productionId: IdSchema }),
    response: BookingStaffSchema,
    errors: [403],
    handler: async ({ ctx, actor, query }) => ({ items: await bookingStaff(ctx, actor, query.productionId) }),
  }),
  defineRoute({
    method: 'post',
    path: '/api/bookings/:id/reschedule',
    summary: 'Move a booked session to a new time or place (calendars get an update)',
    tag: 'bookings',
    auth: 'session',
    params: IdParamsSchema,
    body: RescheduleBookingInputSchema,
    response: BookingSchema,
    errors: [403, 404, 409],
    handler: ({ ctx, actor, params, body, req }) => rescheduleBooking(ctx, actor, params.id, body, req),
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
    handler: ({ ctx, actor, params, req }) => cancelBooking(ctx, actor, params.id, req),
  }),
];
