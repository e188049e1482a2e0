import { z } from 'zod';
import { BOOKING_PURPOSES } from '../domain/bookings.ts';
import { CONSENT_KINDS } from '../domain/consent.ts';
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
  /** Missing because the consent that covered it was withdrawn (derived, like consentMissing). */
  consentWithdrawn: z.boolean().optional(),
  /** When the session ends, if booked with an end. */
  endsAt: z.iso.datetime().nullable().optional(),
  /** The staff member assigned to carry it out. */
  artist: z.object({ id: IdSchema, name: z.string() }).nullable().optional(),
});
export type Booking = z.infer<typeof BookingSchema>;
export const CreateBookingInputSchema = z.object({
  performerId: IdSchema,
  productionId: IdSchema,
  purpose: z.enum(BOOKING_PURPOSES, { message: 'Choose what the session is for' }),
  startsAt: MomentInputSchema,
  location: z.string().trim().max(200).optional(),
  endsAt: MomentInputSchema.optional(),
  artistUserId: IdSchema.optional(),
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
export const BookingListQuerySchema = z.object({
  productionId: IdSchema,
  performerId: IdSchema.optional(),
  upcoming: z.enum(['true', 'false']).default('true'),
  /** A calendar's window (past sessions included): sessions starting from `from` and before `to`, instead of "from now on". */
  from: MomentInputSchema.optional(),
  to: MomentInputSchema.optional(),
});

/** Before booking: whether the performer will have the consent this session needs when it starts. */
export const ConsentCheckQuerySchema = z.object({
  performerId: IdSchema,
  productionId: IdSchema,
  purpose: z.enum(BOOKING_PURPOSES, { message: 'Choose what the session is for' }),
  startsAt: MomentInputSchema,
});
export const ConsentCheckSchema = z.object({
  kind: z.enum(CONSENT_KINDS),
  missing: z.boolean(),
});
export type ConsentCheck = z.infer<typeof ConsentCheckSchema>;

/** Who can be assigned to a session: the production's staff. */
export const BookingStaffSchema = z.object({ items: z.array(z.object({ id: IdSchema, name: z.string() })) });
export type BookingListQuery = z.infer<typeof BookingListQuerySchema>;
