import type { Request, Response } from 'express';
import { checkReadingTime } from '#shared/domain/reading-schedule.ts';
import { CAST_PHOTO_MAX_BYTES } from '#shared/limits.ts';
import type { Actor } from '#shared/policy.ts';
import type { PatchTestDetail, ReadingsInput } from '#shared/schemas/patch-test-log.ts';
import type { AppContext } from '../../context.ts';
import { processPhoto } from '../../files/photos.ts';
import { discardFiles, readStoredFile, storeFile, type StoredFile } from '../../files/store.ts';
import { recordEvent, writeAudit } from '../../http/audit.ts';
import { authorize } from '../../http/authorize.ts';
import { conflict, invalid, isUniqueViolation, notFound } from '../../http/errors.ts';
import { receiveFile } from '../../http/upload.ts';
import { findPhoto, findReading, findTestRow, insertPhoto, insertReadings, listTestProducts, lockTest, readSitesAtPoint, updateTest } from './repo.ts';
import { detailFor } from './service.ts';

const SECOND_READING = 'A reading for this site at this point is already recorded; the first one stands.';

/**
 * Records one point's grid (lead): a code per site with an optional note. The whole grid lands in one
 * transaction or not at all; a reading before its window, or on a closed or cancelled test, is refused
 * with the reason, and a second reading for a site and point is a 409 that leaves the first as it was.
 */
export async function recordReadings(ctx: AppContext, actor: Actor, id: string, input: ReadingsInput, req: Request): Promise<PatchTestDetail> {
  const row = await findTestRow(ctx.db, id);
  if (!row) throw notFound('That patch test');
  authorize(actor, 'patchtests.record', { productionId: row.productionId, performerId: row.performerId });
  const products = await listTestProducts(ctx.db, id);
  const onTest = new Set(products.map((p) => p.id));
  const fields: Record<string, string[]> = {};
  const seen = new Set<string>();
  input.sites.forEach((s, i) => {
    if (!onTest.has(s.testProductId)) fields[`sites.${i}.testProductId`] = ['That site is not on this test.'];
    else if (seen.has(s.testProductId)) fields[`sites.${i}.testProductId`] = ['This site is graded twice in one reading.'];
    seen.add(s.testProductId);
  });
  if (Object.keys(fields).length > 0) throw invalid(fields);
  const readAt = new Date(input.readAt);
  try {
    await ctx.db.transaction().execute(async (trx) => {
      const locked = await lockTest(trx, id);
      if (!locked) throw notFound('That patch test');
      if (locked.version !== input.version) throw conflict('This test was changed by someone else. Reload it to see the change.');
      const check = checkReadingTime(row.protocol, { status: locked.status, appliedAt: locked.appliedAt, removedAt: locked.removedAt, pointId: input.pointId, at: readAt, now: new Date(), timeZone: ctx.config.timeZone });
      if (!check.ok) {
        if (check.reason === 'unknown_point') throw invalid({ pointId: [check.message] });
        if (check.reason === 'in_future' || check.reason === 'before_window') throw invalid({ readAt: [check.message] });
        throw conflict(check.message, { reason: check.reason });
      }
      const already = await readSitesAtPoint(trx, id, input.pointId);
      if (input.sites.some((s) => already.has(s.testProductId))) throw conflict(SECOND_READING);
      await insertReadings(
        trx,
        input.sites.map((s) => ({ testProductId: s.testProductId, pointId: input.pointId, readAt, code: s.code, note: s.note?.trim() || null, late: check.late, readBy: actor.userId })),
      );
      await updateTest(trx, id, {});
      await writeAudit(trx, { actorUserId: actor.userId, action: 'patch_test.read', performerId: row.performerId, entityType: 'patch_test', entityId: id, productionId: row.productionId, req, details: { pointId: input.pointId, sites: input.sites.length, late: check.late } });
    });
  } catch (err) {
    if (isUniqueViolation(err, 'patch_test_readings_point_key')) throw conflict(SECOND_READING);
    throw err;
  }
  return detailFor(ctx, actor, id, req);
}

/** Adds a photo of a site to a reading (lead): type read from the content, metadata stripped, sealed at rest, with a thumbnail. */
export async function addReadingPhoto(ctx: AppContext, actor: Actor, id: string, readingId: string, req: Request, res: Response): Promise<PatchTestDetail> {
  const row = await findTestRow(ctx.db, id);
  if (!row) throw notFound('That patch test');
  authorize(actor, 'patchtests.record', { productionId: row.productionId, performerId: row.performerId });
  const reading = await findReading(ctx.db, readingId);
  if (!reading || reading.testId !== id) throw notFound('That reading');
  const file = await receiveFile(req, res, { field: 'photo', maxBytes: CAST_PHOTO_MAX_BYTES });
  if (!file) throw invalid({ photo: ['Choose a photo to upload.'] });
  const { photo, thumbnail } = await processPhoto(file.buffer, 'photo');
  const store = ctx.files;
  const written: StoredFile[] = [];
  try {
    await ctx.db.transaction().execute(async (trx) => {
      if (!(await lockTest(trx, id))) throw notFound('That patch test');
      const big = await storeFile(trx, store, { purpose: 'reading_photo', contentType: 'image/jpeg', ext: 'jpg', bytes: photo.bytes, width: photo.width, height: photo.height, createdBy: actor.userId, sealed: true });
      written.push(big);
      const small = await storeFile(trx, store, { purpose: 'reading_photo_thumb', contentType: 'image/jpeg', ext: 'jpg', bytes: thumbnail.bytes, width: thumbnail.width, height: thumbnail.height, createdBy: actor.userId, sealed: true });
      written.push(small);
      const photoId = await insertPhoto(trx, { readingId, fileId: big.id, thumbFileId: small.id, width: photo.width, height: photo.height, createdBy: actor.userId });
      await writeAudit(trx, { actorUserId: actor.userId, action: 'patch_test.read', performerId: row.performerId, entityType: 'patch_test', entityId: id, productionId: row.productionId, req, details: { photoId } });
    });
  } catch (err) {
    await discardFiles(store, written);
    throw err;
  }
  return detailFor(ctx, actor, id, req);
}

/** A reading photo, only for the lead and the performer (a health detail), each read audited. */
export async function sendReadingPhoto(ctx: AppContext, actor: Actor, id: string, photoId: string, size: 'photo' | 'thumbnail', req: Request, res: Response): Promise<void> {
  const row = await findTestRow(ctx.db, id);
  if (!row) throw notFound('That patch test');
  const resource = { productionId: row.productionId, performerId: row.performerId };
  authorize(actor, 'patchtests.read', resource);
  authorize(actor, 'medical.read', resource);
  const photo = await findPhoto(ctx.db, id, photoId);
  if (!photo) throw notFound('That photo');
  const file = await readStoredFile(ctx.db, ctx.files, size === 'photo' ? photo.fileId : photo.thumbFileId);
  if (!file) throw notFound('That photo');
  await recordEvent(ctx.db, { actorUserId: actor.userId, action: 'medical.read', performerId: row.performerId, entityType: 'reading_photo', entityId: photoId, productionId: row.productionId, req, details: { performerId: row.performerId, fields: [size === 'photo' ? 'readingPhoto' : 'readingPhotoThumbnail'] } });
  res.set('Cache-Control', 'private, no-store');
  res.type(file.contentType).send(file.bytes);
}
