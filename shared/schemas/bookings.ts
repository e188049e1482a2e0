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
  /** How many times the session has been moved or cancelled since it was booked; a change names the one it saw. */
  sequence: z.number().int().min(0),
  consentMissing: z.boolean(),
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
export const RescheduleBookingInputSchema = z.object({
  startsAt: MomentInputSchema,
  location: z.string().trim().max(200).optional(),
  /** The session's `sequence` as the editor saw it. */
  sequence: z.number({ message: 'Reload the session and try again' }).int().min(0),
});
export type RescheduleBookingInput = z.infer<typeof RescheduleBookingInputSchema>;
export const BookingListSchema = z.object({ items: z.array(BookingSchema) });
export const BookingListQuerySchema = z.object({ productionId: IdSchema, performerId: IdSchema.optional(), upcoming: z.enum(['true', 'false']).default('true') });
export type BookingListQuery = z.infer<typeof BookingListQuerySchema>;
