import type { Request, Response } from 'express';
import { CAST_PHOTO_MAX_BYTES } from '#shared/limits.ts';
import type { Actor } from '#shared/policy.ts';
import type { BuildDetail } from '#shared/schemas/builds.ts';
import type { AppContext } from '../../context.ts';
import { processPhoto } from '../../files/photos.ts';
import { discardFiles, readStoredFile, storeFile, type StoredFile } from '../../files/store.ts';
import { writeAudit } from '../../http/audit.ts';
import { authorize } from '../../http/authorize.ts';
import { invalid, notFound } from '../../http/errors.ts';
import { receiveFile } from '../../http/upload.ts';
import { deleteFileRows, findBuild, lockBuild, setBuildPhoto } from './repo.ts';
import { buildDetail } from './service.ts';

/**
 * Sets (or replaces) the photo of a build. The permission is checked before a byte of the upload is
 * read; the photo is stored upright, without metadata, with a thumbnail; the replaced files go once committed.
 */
export async function setPhoto(ctx: AppContext, actor: Actor, id: string, req: Request, res: Response): Promise<BuildDetail> {
  const build = await findBuild(ctx.db, id);
  if (!build) throw notFound('That build');
  authorize(actor, 'builds.manage', { productionId: build.productionId });
  const file = await receiveFile(req, res, { field: 'photo', maxBytes: CAST_PHOTO_MAX_BYTES });
  if (!file) throw invalid({ photo: ['Choose a photo to upload.'] });
  const { photo, thumbnail } = await processPhoto(file.buffer, 'photo');
  const store = ctx.files;
  const written: StoredFile[] = [];
  let replaced: { storagePath: string }[] = [];
  try {
    await ctx.db.transaction().execute(async (trx) => {
      if (!(await lockBuild(trx, id))) throw notFound('That build');
      const big = await storeFile(trx, store, { purpose: 'build_photo', contentType: 'image/jpeg', ext: 'jpg', bytes: photo.bytes, width: photo.width, height: photo.height, createdBy: actor.userId });
      written.push(big);
      const small = await storeFile(trx, store, { purpose: 'build_photo_thumb', contentType: 'image/jpeg', ext: 'jpg', bytes: thumbnail.bytes, width: thumbnail.width, height: thumbnail.height, createdBy: actor.userId });
      written.push(small);
      replaced = await deleteFileRows(trx, await setBuildPhoto(trx, id, big.id, small.id));
      await writeAudit(trx, { actorUserId: actor.userId, action: 'build.photo_set', performerId: build.performerId, entityType: 'appliance_build', entityId: id, productionId: build.productionId, req, details: { fileId: big.id } });
    });
  } catch (err) {
    await discardFiles(store, written);
    throw err;
  }
  await discardFiles(store, replaced);
  return buildDetail(ctx, actor, id);
}

/** Sends a build's photo or thumbnail to staff who read the build, and to its performer. */
export async function sendPhoto(ctx: AppContext, actor: Actor, id: string, size: 'photo' | 'thumbnail', v: string | undefined, res: Response): Promise<void> {
  const build = await findBuild(ctx.db, id);
  if (!build) throw notFound('That build');
  if (!actor.performerIds.includes(build.performerId)) authorize(actor, 'builds.read', { productionId: build.productionId });
  const fileId = size === 'photo' ? build.photoFileId : build.photoThumbFileId;
  const file = fileId ? await readStoredFile(ctx.db, ctx.files, fileId) : null;
  if (!fileId || !file) throw notFound('That photo');
  // The URL carries the file id, so a matching ?v= names bytes that never change.
  res.set('Cache-Control', v === fileId ? 'private, max-age=86400, immutable' : 'private, no-cache');
  res.set('ETag', `"${file.sha256}"`);
  res.type(file.contentType).send(file.bytes);
}
