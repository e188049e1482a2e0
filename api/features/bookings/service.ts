import type { Request } from 'express';
import { type ConsentForGate, sessionsMissingConsent } from '#shared/domain/bookings.ts';
import type { Actor } from '#shared/policy.ts';
import type { Booking, CreateBookingInput, RescheduleBookingInput } from '#shared/schemas/bookings.ts';
import type { AppContext } from '../../context.ts';
import type { Db } from '../../db/index.ts';
import { writeAudit } from '../../http/audit.ts';
import { authorize } from '../../http/authorize.ts';
import { conflict, invalid, notFound } from '../../http/errors.ts';
import { listConsentsForGate } from '../consents/index.ts';
import { isEngagedOn } from '../performers/index.ts';
import { sendSessionInvitations } from './invitations.ts';
import { type BookingFilter, type BookingJsonRow, bumpInvitationSequence, findBookingForChange, findBookingProduction, insertBooking, listBookingRows, moveBooking, setBookingStatus } from './repo.ts';

/** Sessions with, for each, whether its consent will be in force when it starts: one query for the sessions, one for the consents. */
export async function listBookings(db: Db, where: BookingFilter): Promise<Booking[]> {
  const rows = await listBookingRows(db, where);
  const consents = await listConsentsForGate(db, [...new Set(rows.map((r) => r.performerId))]);
  const missing = sessionsMissingConsent(rows, consents);
  return rows.map((r) => ({ ...r, startsAt: r.startsAt.toISOString(), consentMissing: missing.has(r.id) }));
}

async function bookingById(db: Db, id: string): Promise<Booking> {
  const [b] = await listBookings(db, { ids: [id] });
  if (!b) throw notFound('That booking');
  return b;
}

export async function createBooking(ctx: AppContext, actor: Actor, input: CreateBookingInput, req: Request): Promise<Booking> {
  authorize(actor, 'sessions.book', { productionId: input.productionId });
  if (!(await isEngagedOn(ctx.db, input.performerId, input.productionId))) throw invalid({ performerId: ['This performer is not engaged on this production.'] });
  const startsAt = new Date(input.startsAt);
  if (startsAt.getTime() < Date.now() - 60_000) throw invalid({ startsAt: ['Choose a time that has not passed'] });
  const id = await ctx.db.transaction().execute(async (trx) => {
    const newId = await insertBooking(trx, { performerId: input.performerId, productionId: input.productionId, purpose: input.purpose, startsAt, location: input.location || null, createdBy: actor.userId });
    await writeAudit(trx, { actorUserId: actor.userId, action: 'booking.create', entityType: 'booking', entityId: newId, productionId: input.productionId, req, details: { purpose: input.purpose } });
    return newId;
  });
  await sendSessionInvitations(ctx, id, 'request');
  return bookingById(ctx.db, id);
}

/** Moves a booked session to a new time or place; the performer's and the lead's calendars get an update with the same UID. */
export async function rescheduleBooking(ctx: AppContext, actor: Actor, id: string, input: RescheduleBookingInput, req: Request): Promise<Booking> {
  const productionId = await findBookingProduction(ctx.db, id);
  if (!productionId) throw notFound('That booking');
  authorize(actor, 'sessions.book', { productionId });
  const startsAt = new Date(input.startsAt);
  if (startsAt.getTime() < Date.now() - 60_000) throw invalid({ startsAt: ['Choose a time that has not passed'] });
  await ctx.db.transaction().execute(async (trx) => {
    const b = await findBookingForChange(trx, id);
    if (!b) throw notFound('That booking');
    if (b.status !== 'booked') throw conflict('Only a booked session can be moved.');
    if (b.sequence !== input.sequence) throw conflict('Someone changed this session after you opened it. Reload it to see the latest time.');
    const location = input.location === undefined ? b.location : input.location || null;
    await moveBooking(trx, id, { startsAt, location });
    await bumpInvitationSequence(trx, id);
    await writeAudit(trx, { actorUserId: actor.userId, action: 'booking.reschedule', entityType: 'booking', entityId: id, productionId: b.productionId, req, details: { from: b.startsAt.toISOString(), to: startsAt.toISOString() } });
  });
  await sendSessionInvitations(ctx, id, 'update');
  return bookingById(ctx.db, id);
}

export async function cancelBooking(ctx: AppContext, actor: Actor, id: string, req: Request): Promise<Booking> {
  const productionId = await findBookingProduction(ctx.db, id);
  if (!productionId) throw notFound('That booking');
  authorize(actor, 'sessions.book', { productionId });
  await ctx.db.transaction().execute(async (trx) => {
    const b = await findBookingForChange(trx, id);
    if (!b) throw notFound('That booking');
    if (b.status !== 'booked') throw conflict('Only a booked session can be cancelled.');
    await setBookingStatus(trx, id, 'cancelled');
    await bumpInvitationSequence(trx, id);
    await writeAudit(trx, { actorUserId: actor.userId, action: 'booking.cancel', entityType: 'booking', entityId: id, productionId: b.productionId, req });
  });
  await sendSessionInvitations(ctx, id, 'cancel');
  return bookingById(ctx.db, id);
}

/** Sessions read as JSON within another record's statement, with their consent flags from consents read the same way. */
export function bookingsFromJson(rows: readonly BookingJsonRow[], performer: { id: string; name: string }, consents: readonly ConsentForGate[], showsProduction: (productionId: string) => boolean): Booking[] {
  const sessions = rows
    .filter((r) => showsProduction(r.production_id))
    .map((r) => ({ id: r.id, performerId: performer.id, performerName: performer.name, productionId: r.production_id, purpose: r.purpose, startsAt: new Date(r.starts_at), location: r.location, status: r.status, sequence: r.sequence }));
  const missing = sessionsMissingConsent(sessions, consents);
  return sessions.map((s) => ({ ...s, startsAt: s.startsAt.toISOString(), consentMissing: missing.has(s.id) }));
}
