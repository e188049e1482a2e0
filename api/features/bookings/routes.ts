import { IdParamsSchema } from '#shared/schemas/common.ts';
import { BookingListQuerySchema, BookingListSchema, BookingSchema, CreateBookingInputSchema, RescheduleBookingInputSchema } from '#shared/schemas/bookings.ts';
import { authorize } from '../../http/authorize.ts';
import { type AnyRoute, defineRoute } from '../../http/route.ts';
import { cancelBooking, createBooking, listBookings, rescheduleBooking } from './service.ts';

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
    handler: ({ ctx, actor, body, req }) => createBooking(ctx, actor, body, req),
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
