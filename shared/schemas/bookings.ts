import { z } from 'zod';
import { BOOKING_PURPOSES } from '../domain/bookings.ts';
import { IdSchema, MomentInputSchema } from './common.ts';

/** A session of a production (patch test, life cast, application) and whether its consent will be in force. */
export const BookingSchema = z.object({
  id: IdSchema,
  performerId: IdSchema,
  performerName: z.string(),
  productionId: IdSchema,
  purpose: z.enum(BOOKING_PURPOSES),
  startsAt: z.iso.datetime(),
  location: z.string().nullable(),
  status: z.enum(['booked', 'cancelled', 'done']),
  consentMissing: z.boolean(),
  /** Missing because the consent that covered it was withdrawn (derived, like consentMissing). */
  consentWithdrawn: z.boolean().optional(),
});
export type Booking = z.infer<typeof BookingSchema>;
export const CreateBookingInputSchema = z.object({
  performerId: IdSchema,
  productionId: IdSchema,
  purpose: z.enum(BOOKING_PURPOSES, { message: 'Choose what the session is for' }),
  startsAt: MomentInputSchema,
  location: z.string().trim().max(200).optional(),
});
export type CreateBookingInput = z.infer<typeof CreateBookingInputSchema>;
export const BookingListSchema = z.object({ items: z.array(BookingSchema) });
export const BookingListQuerySchema = z.object({ productionId: IdSchema, performerId: IdSchema.optional(), upcoming: z.enum(['true', 'false']).default('true') });
export type BookingListQuery = z.infer<typeof BookingListQuerySchema>;
