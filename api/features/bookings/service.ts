import type { Request } from 'express';
import { type BookingPurpose, type ConsentForGate, consentKindNeeded, sessionsMissingConsent, sessionsWithWithdrawnConsent } from '#shared/domain/bookings.ts';
import type { Actor } from '#shared/policy.ts';
import type { Booking, ConsentCheck, CreateBookingInput, RescheduleBookingInput } from '#shared/schemas/bookings.ts';
import type { AppContext } from '../../context.ts';
import type { Db } from '../../db/index.ts';
import { writeAudit } from '../../http/audit.ts';
import { authorize } from '../../http/authorize.ts';
import { conflict, invalid, notFound } from '../../http/errors.ts';
import { gateConsentsOfRows, listConsentsForGate } from '../consents/index.ts';
import { isEngagedOn } from '../performers/index.ts';
import { staffOf } from '../productions/index.ts';
import { sendSessionInvitations } from './invitations.ts';
import { type BookingFilter, type BookingJsonRow, bumpInvitationSequence, findBookingForChange, findBookingProduction, insertBooking, listBookingRows, moveBooking, setBookingStatus } from './repo.ts';

/** Longer than a working day is a typing slip, not a session. */
const MAX_SESSION_MS = 16 * 3_600_000;

/** Sessions with, for each, whether its consent will be in force when it starts: one query across performers, two for one performer's. */
export async function listBookings(db: Db, where: BookingFilter): Promise<Booking[]> {
  const rows = await listBookingRows(db, where);
  const consents = await gateConsentsOfRows(db, rows);
  const missing = sessionsMissingConsent(rows, consents);
  const withdrawn = sessionsWithWithdrawnConsent(rows, consents);
  return rows.map(({ gateConsents: _, ...r }) => ({ ...r, startsAt: r.startsAt.toISOString(), endsAt: r.endsAt?.toISOString() ?? null, consentMissing: missing.has(r.id), consentWithdrawn: withdrawn.has(r.id) }));
}

async function bookingById(db: Db, id: string): Promise<Booking> {
  const [b] = await listBookings(db, { ids: [id] });
  if (!b) throw notFound('That booking');
  return b;
}

export async function createBooking(ctx: AppContext, actor: Actor, input: CreateBookingInput, req: Request): Promise<Booking> {
  authorize(actor, 'sessions.book', { productionId: input.productionId });
  if (input.purpose === 'patch_test') throw invalid({ purpose: ["Book a patch test from the performer's Patch tests section, with its products and sites."] });
  if (!(await isEngagedOn(ctx.db, input.performerId, input.productionId))) throw invalid({ performerId: ['This performer is not engaged on this production.'] });
  const startsAt = new Date(input.startsAt);
  const endsAt = input.endsAt ? new Date(input.endsAt) : null;
  const fields: Record<string, string[]> = {};
  if (startsAt.getTime() < Date.now() - 60_000) fields.startsAt = ['Choose a time that has not passed'];
  if (endsAt && endsAt.getTime() <= startsAt.getTime()) fields.endsAt = ['The session must end after it starts'];
  if (endsAt && endsAt.getTime() - startsAt.getTime() > MAX_SESSION_MS) fields.endsAt = ['A session lasts at most 16 hours; book a second one for the next day'];
  if (input.artistUserId && !(await staffOf(ctx.db, [input.productionId])).some((s) => s.userId === input.artistUserId)) fields.artistUserId = ['Choose someone who works on this production'];
  if (Object.keys(fields).length) throw invalid(fields);
  const id = await ctx.db.transaction().execute(async (trx) => {
    const newId = await insertBooking(trx, {
      performerId: input.performerId,
      productionId: input.productionId,
      purpose: input.purpose,
      startsAt,
      endsAt,
      artistUserId: input.artistUserId ?? null,
      location: input.location || null,
      createdBy: actor.userId,
    });
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
    if (b.purpose === 'patch_test') throw conflict('A patch test is moved from its own page, so its sites and readings move with it.');
    if (b.sequence !== input.sequence) throw conflict('Someone changed this session after you opened it. Reload it to see the latest time.');
    const location = input.location === undefined ? b.location : input.location || null;
    await moveBooking(trx, id, { startsAt, location });
    await bumpInvitationSequence(trx, id);
    await writeAudit(trx, { actorUserId: actor.userId, action: 'booking.reschedule', entityType: 'booking', entityId: id, productionId: b.productionId, req, details: { from: b.startsAt.toISOString(), to: startsAt.toISOString() } });
  });
  await sendSessionInvitations(ctx, id, 'update');
  return bookingById(ctx.db, id);
}

/** Whether a session booked now would wait for consent: the same rule the list applies, asked before saving. */
export async function checkConsentForSession(ctx: AppContext, actor: Actor, q: { performerId: string; productionId: string; purpose: BookingPurpose; startsAt: string }): Promise<ConsentCheck> {
  authorize(actor, 'sessions.book', { productionId: q.productionId });
  if (!(await isEngagedOn(ctx.db, q.performerId, q.productionId))) throw invalid({ performerId: ['This performer is not engaged on this production.'] });
  const consents = await listConsentsForGate(ctx.db, [q.performerId]);
  const probe = { id: 'probe', performerId: q.performerId, productionId: q.productionId, purpose: q.purpose, startsAt: new Date(q.startsAt), status: 'booked' };
  return { kind: consentKindNeeded(q.purpose), missing: sessionsMissingConsent([probe], consents).has('probe') };
}

/** The production's staff, any of whom may be assigned to a session. */
export async function bookingStaff(ctx: AppContext, actor: Actor, productionId: string): Promise<{ id: string; name: string }[]> {
  authorize(actor, 'sessions.book', { productionId });
  return (await staffOf(ctx.db, [productionId])).map((s) => ({ id: s.userId, name: s.name }));
}

export async function cancelBooking(ctx: AppContext, actor: Actor, id: string, req: Request): Promise<Booking> {
  const productionId = await findBookingProduction(ctx.db, id);
  if (!productionId) throw notFound('That booking');
  authorize(actor, 'sessions.book', { productionId });
  await ctx.db.transaction().execute(async (trx) => {
    const b = await findBookingForChange(trx, id);
    if (!b) throw notFound('That booking');
    if (b.status !== 'booked') throw conflict('Only a booked session can be cancelled.');
    if (b.purpose === 'patch_test') throw conflict('A patch test is cancelled from its own page, so its record closes with it.');
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
    .map((r) => ({ id: r.id, performerId: performer.id, performerName: performer.name, productionId: r.production_id, purpose: r.purpose, startsAt: new Date(r.starts_at), location: r.location, status: r.status, sequence: r.sequence, endsAt: r.ends_at ? new Date(r.ends_at).toISOString() : null }));
  const missing = sessionsMissingConsent(sessions, consents);
  const withdrawn = sessionsWithWithdrawnConsent(sessions, consents);
  return sessions.map((s) => ({ ...s, startsAt: s.startsAt.toISOString(), consentMissing: missing.has(s.id), consentWithdrawn: withdrawn.has(s.id) }));
}
