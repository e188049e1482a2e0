import type { Request } from 'express';
import { sessionEnd, sessionsMissingConsent } from '#shared/domain/bookings.ts';
import { lotRefusal } from '#shared/domain/catalogue.ts';
import type { Protocol } from '#shared/domain/protocols.ts';
import { checkRemovalTime, readingSchedule } from '#shared/domain/reading-schedule.ts';
import { sharedSites, spansOverlap } from '#shared/domain/test-sites.ts';
import { type Actor, can } from '#shared/policy.ts';
import type { BookPatchTestInput, PatchTestDetail } from '#shared/schemas/patch-test-log.ts';
import type { AppContext } from '../../context.ts';
import type { Db } from '../../db/index.ts';
import { recordEvent, writeAudit, type Trx } from '../../http/audit.ts';
import { authorize } from '../../http/authorize.ts';
import { conflict, invalid, notFound } from '../../http/errors.ts';
import { bumpInvitationSequence, type InvitationKind, insertBooking, sendSessionInvitations, setBookingStatus, setBookingTime } from '../bookings/index.ts';
import { findLotsForTest } from '../catalogue/index.ts';
import { listConsentsForGate } from '../consents/index.ts';
import { isEngagedOn } from '../performers/index.ts';
import { findCurrentProtocolVersion } from '../protocols/index.ts';
import { findTestRow, insertTest, insertTestedProducts, listTestRows, lockTest, updateTest, type TestRow } from './repo.ts';
import { testDetail } from './view.ts';

/** The longest one session may be booked for, as for any other session. */
const MAX_TEST_SESSION_MS = 16 * 3_600_000;

/** The time a test occupies its sites: from application (or the booked start) to the close of its last reading window. */
export function testSpan(protocol: Protocol, start: Date, removedAt: Date | null): { from: Date; to: Date } {
  const schedule = readingSchedule(protocol, { appliedAt: start, removedAt, now: start });
  const to = Math.max(start.getTime() + 1, ...schedule.map((s) => s.closesAt.getTime()));
  return { from: start, to: new Date(to) };
}

/** Another booked or running test of this performer on any of these sites while this one would run: refused by field. */
async function refuseOverlap(db: Db, performerId: string, protocol: Protocol, start: Date, sites: readonly string[], exceptId: string | null): Promise<void> {
  const others = (await listTestRows(db, { performerId, statuses: ['booked', 'applied'] })).filter((t) => t.id !== exceptId);
  if (others.length === 0) return;
  const span = testSpan(protocol, start, null);
  for (const o of others) {
    const shared = sharedSites(sites, o.sites);
    if (shared.length === 0) continue;
    const theirs = testSpan(o.protocol, o.appliedAt ?? o.startsAt, o.removedAt);
    if (spansOverlap(span, theirs)) {
      throw invalid({ products: [`${shared.join(', ')} ${shared.length === 1 ? 'is' : 'are'} already in use by another test of this performer at that time. Choose other sites or another time.`] });
    }
  }
}

/**
 * One test for someone who may read it (staff on its production, or its performer). The lead and the
 * performer get the codes, notes and photos, and that read is written to the audit log.
 */
export async function detailFor(ctx: AppContext, actor: Actor, id: string, req: Request): Promise<PatchTestDetail> {
  const row = await findTestRow(ctx.db, id);
  if (!row) throw notFound('That patch test');
  const resource = { productionId: row.productionId, performerId: row.performerId };
  authorize(actor, 'patchtests.read', resource);
  const medical = can(actor, 'medical.read', resource);
  const detail = await testDetail(ctx.db, row, { medical, now: new Date(), timeZone: ctx.config.timeZone });
  if (medical) {
    await recordEvent(ctx.db, { actorUserId: actor.userId, action: 'medical.read', performerId: row.performerId, entityType: 'patch_test', entityId: id, productionId: row.productionId, req, details: { performerId: row.performerId, fields: ['readingCodes', 'readingNotes', 'readingPhotos'] } });
  }
  return detail;
}

/** Books a test (head): the session row and the test's own rows in one transaction, or nothing. */
export async function bookTest(ctx: AppContext, actor: Actor, input: BookPatchTestInput, req: Request): Promise<PatchTestDetail> {
  authorize(actor, 'patchtests.book', { productionId: input.productionId });
  if (!(await isEngagedOn(ctx.db, input.performerId, input.productionId))) throw invalid({ performerId: ['This performer is not engaged on this production.'] });
  const startsAt = new Date(input.startsAt);
  if (startsAt.getTime() < Date.now() - 60_000) throw invalid({ startsAt: ['Choose a time that has not passed'] });
  const pv = await findCurrentProtocolVersion(ctx.db, input.protocolId);
  if (!pv) throw invalid({ protocolId: ['That protocol is not in the list.'] });
  const lots = await findLotsForTest(
    ctx.db,
    input.products.map((p) => p.lotId),
  );
  const fields: Record<string, string[]> = {};
  // The session is booked with its end, so every calendar entry for it ends when it was booked to.
  const endsAt = input.endsAt ? new Date(input.endsAt) : sessionEnd('patch_test', startsAt);
  if (endsAt.getTime() <= startsAt.getTime()) fields.endsAt = ['The session must end after it starts'];
  else if (endsAt.getTime() - startsAt.getTime() > MAX_TEST_SESSION_MS) fields.endsAt = ['A session lasts at most 16 hours'];
  input.products.forEach((p, i) => {
    const refusal = lotRefusal(lots.get(p.lotId), p.productId, startsAt);
    if (refusal) fields[`products.${i}.lotId`] = [refusal];
  });
  if (Object.keys(fields).length > 0) throw invalid(fields);
  await refuseOverlap(
    ctx.db,
    input.performerId,
    pv.protocol,
    startsAt,
    input.products.map((p) => p.site),
    null,
  );
  const id = await ctx.db.transaction().execute(async (trx) => {
    const bookingId = await insertBooking(trx, { performerId: input.performerId, productionId: input.productionId, purpose: 'patch_test', startsAt, endsAt, location: input.location, createdBy: actor.userId });
    await insertTest(trx, { bookingId, performerId: input.performerId, productionId: input.productionId, protocolVersionId: pv.versionId, createdBy: actor.userId });
    await insertTestedProducts(
      trx,
      bookingId,
      input.products.map((p) => ({ productId: p.productId, lotId: p.lotId, formulationId: lots.get(p.lotId)!.formulationId, site: p.site })),
    );
    await writeAudit(trx, { actorUserId: actor.userId, action: 'patch_test.book', performerId: input.performerId, entityType: 'patch_test', entityId: bookingId, productionId: input.productionId, req, details: { protocolVersionId: pv.versionId, products: input.products.length } });
    return bookingId;
  });
  await sendSessionInvitations(ctx, id, 'request');
  return detailFor(ctx, actor, id, req);
}

/** Loads a test, checks the action on its production, and runs the change on the locked row at the version the screen had. */
async function change(
  ctx: AppContext,
  actor: Actor,
  id: string,
  action: 'patchtests.book' | 'patchtests.record',
  version: number,
  req: Request,
  /** May answer which calendar message the change calls for, sent once it has committed. */
  work: (trx: Trx, row: TestRow, locked: NonNullable<Awaited<ReturnType<typeof lockTest>>>) => Promise<InvitationKind | void>,
): Promise<PatchTestDetail> {
  const row = await findTestRow(ctx.db, id);
  if (!row) throw notFound('That patch test');
  authorize(actor, action, { productionId: row.productionId });
  const invitation = await ctx.db.transaction().execute(async (trx) => {
    const locked = await lockTest(trx, id);
    if (!locked) throw notFound('That patch test');
    if (locked.version !== version) throw conflict('This test was changed by someone else. Reload it to see the change.');
    return work(trx, row, locked);
  });
  if (invitation) await sendSessionInvitations(ctx, id, invitation);
  return detailFor(ctx, actor, id, req);
}

export function rescheduleTest(ctx: AppContext, actor: Actor, id: string, v: { startsAt: string; location: string; version: number }, req: Request): Promise<PatchTestDetail> {
  return change(ctx, actor, id, 'patchtests.book', v.version, req, async (trx, row, locked) => {
    if (locked.status !== 'booked') throw conflict('Only a test not yet applied can be moved.');
    const startsAt = new Date(v.startsAt);
    if (startsAt.getTime() < Date.now() - 60_000) throw invalid({ startsAt: ['Choose a time that has not passed'] });
    await refuseOverlap(trx, row.performerId, row.protocol, startsAt, row.sites, id);
    await setBookingTime(trx, id, startsAt, v.location);
    await bumpInvitationSequence(trx, id);
    await updateTest(trx, id, {});
    await writeAudit(trx, { actorUserId: actor.userId, action: 'patch_test.reschedule', performerId: row.performerId, entityType: 'patch_test', entityId: id, productionId: row.productionId, req, details: { from: row.startsAt.toISOString(), to: startsAt.toISOString() } });
    return 'update';
  });
}

export function cancelTest(ctx: AppContext, actor: Actor, id: string, version: number, req: Request): Promise<PatchTestDetail> {
  return change(ctx, actor, id, 'patchtests.book', version, req, async (trx, row, locked) => {
    if (locked.status !== 'booked' && locked.status !== 'applied') throw conflict(`This test is ${locked.status} and cannot be cancelled.`);
    await updateTest(trx, id, { status: 'cancelled', cancelled_at: new Date() });
    if (locked.status === 'booked') {
      await setBookingStatus(trx, id, 'cancelled');
      await bumpInvitationSequence(trx, id);
    }
    await writeAudit(trx, { actorUserId: actor.userId, action: 'patch_test.cancel', performerId: row.performerId, entityType: 'patch_test', entityId: id, productionId: row.productionId, req, details: { was: locked.status } });
    // Once applied, the appointment has happened: the calendars keep it.
    return locked.status === 'booked' ? 'cancel' : undefined;
  });
}

/** Records when the products went on (lead). It needs a patch-testing consent in force for the production then. */
export function applyTest(ctx: AppContext, actor: Actor, id: string, v: { appliedAt: string; version: number }, req: Request): Promise<PatchTestDetail> {
  return change(ctx, actor, id, 'patchtests.record', v.version, req, async (trx, row, locked) => {
    if (locked.status !== 'booked') throw conflict(locked.status === 'applied' ? 'The application is already recorded.' : `This test is ${locked.status}; it cannot be applied.`);
    const appliedAt = new Date(v.appliedAt);
    if (appliedAt.getTime() > Date.now() + 5 * 60_000) throw invalid({ appliedAt: ['An application cannot be dated in the future.'] });
    const consents = await listConsentsForGate(trx, [row.performerId]);
    const missing = sessionsMissingConsent([{ id, performerId: row.performerId, productionId: row.productionId, purpose: 'patch_test', startsAt: appliedAt, status: 'booked' }], consents);
    if (missing.size > 0) throw conflict('There is no patch-testing consent in force for this production. Ask the performer to sign one before applying the test.');
    await updateTest(trx, id, { status: 'applied', applied_at: appliedAt, applied_by: actor.userId });
    await setBookingStatus(trx, id, 'done');
    await writeAudit(trx, { actorUserId: actor.userId, action: 'patch_test.apply', performerId: row.performerId, entityType: 'patch_test', entityId: id, productionId: row.productionId, req, details: { appliedAt: appliedAt.toISOString() } });
  });
}

export function recordRemoval(ctx: AppContext, actor: Actor, id: string, v: { removedAt: string; version: number }, req: Request): Promise<PatchTestDetail> {
  return change(ctx, actor, id, 'patchtests.record', v.version, req, async (trx, row, locked) => {
    if (locked.status !== 'applied' || !locked.appliedAt) throw conflict('Removal can be recorded only on a test under reading.');
    if (locked.removedAt) throw conflict('The removal is already recorded.');
    const removedAt = new Date(v.removedAt);
    const check = checkRemovalTime(locked.appliedAt, removedAt, new Date());
    if (!check.ok) throw invalid({ removedAt: [check.message] });
    await updateTest(trx, id, { removed_at: removedAt });
    await writeAudit(trx, { actorUserId: actor.userId, action: 'patch_test.remove', performerId: row.performerId, entityType: 'patch_test', entityId: id, productionId: row.productionId, req, details: { removedAt: removedAt.toISOString() } });
  });
}

/** Closes a test (lead): no more readings; whatever is outstanding stays so in the clearance. */
export function closeTest(ctx: AppContext, actor: Actor, id: string, version: number, req: Request): Promise<PatchTestDetail> {
  return change(ctx, actor, id, 'patchtests.record', version, req, async (trx, row, locked) => {
    if (locked.status !== 'applied') throw conflict('Only a test under reading can be closed.');
    await updateTest(trx, id, { status: 'closed', closed_at: new Date(), closed_by: actor.userId });
    await writeAudit(trx, { actorUserId: actor.userId, action: 'patch_test.close', performerId: row.performerId, entityType: 'patch_test', entityId: id, productionId: row.productionId, req });
  });
}
