import type { Request, Response } from 'express';
import { CAST_PHOTO_MAX_BYTES } from '#shared/limits.ts';
import type { Actor } from '#shared/policy.ts';
import type { Photo } from '#shared/schemas/archive.ts';
import type { AppContext } from '../../context.ts';
import { processPhoto } from '../../files/photos.ts';
import { discardFiles, readStoredFile, storeFile, type StoredFile } from '../../files/store.ts';
import { writeAudit } from '../../http/audit.ts';
import { invalid, notFound } from '../../http/errors.ts';
import { receiveFile } from '../../http/upload.ts';
import { findCast, lockCast } from './repo-casts.ts';
import { deletePhoto, findConditionCheck, findPhoto, insertPhoto } from './repo-history.ts';
import { loadCastFor, photoUrl } from './cast-view.ts';

/**
 * Adds one photo to a cast (or to one of its condition checks). The permission is checked before
 * a byte of the upload is read; the photo is stored upright, without metadata, with a thumbnail.
 */
export async function addPhoto(ctx: AppContext, actor: Actor, castId: string, conditionCheckId: string | undefined, req: Request, res: Response): Promise<Photo> {
  const { cast } = await loadCastFor(ctx.db, actor, castId, 'casts.manage');
  if (conditionCheckId) {
    const check = await findConditionCheck(ctx.db, conditionCheckId);
    if (!check || check.castId !== castId) throw notFound('That condition check');
  }
  const file = await receiveFile(req, res, { field: 'photo', maxBytes: CAST_PHOTO_MAX_BYTES });
  if (!file) throw invalid({ photo: ['Choose a photo to upload.'] });
  const { photo, thumbnail } = await processPhoto(file.buffer, 'photo');
  const written: StoredFile[] = [];
  try {
    return await ctx.db.transaction().execute(async (trx) => {
      if (!(await lockCast(trx, castId))) throw notFound('That cast');
      const big = await storeFile(trx, ctx.files, { purpose: 'cast_photo', contentType: 'image/jpeg', ext: 'jpg', bytes: photo.bytes, width: photo.width, height: photo.height, createdBy: actor.userId });
      written.push(big);
      const small = await storeFile(trx, ctx.files, { purpose: 'cast_photo_thumb', contentType: 'image/jpeg', ext: 'jpg', bytes: thumbnail.bytes, width: thumbnail.width, height: thumbnail.height, createdBy: actor.userId });
      written.push(small);
      const id = await insertPhoto(trx, { castId, conditionCheckId: conditionCheckId ?? null, fileId: big.id, thumbFileId: small.id, width: photo.width, height: photo.height, createdBy: actor.userId });
      await writeAudit(trx, { actorUserId: actor.userId, action: 'cast.photo_add', entityType: 'cast', entityId: castId, productionId: cast.productionId, req, details: { photoId: id, conditionCheckId: conditionCheckId ?? null } });
      return {
        id,
        url: photoUrl(castId, id, big.id, 'photo'),
        thumbnailUrl: photoUrl(castId, id, small.id, 'thumbnail'),
        width: photo.width,
        height: photo.height,
        conditionCheckId: conditionCheckId ?? null,
        createdAt: new Date().toISOString(),
      };
    });
  } catch (err) {
    await discardFiles(ctx.files, written);
    throw err;
  }
}

export async function removePhoto(ctx: AppContext, actor: Actor, castId: string, photoId: string, req: Request): Promise<void> {
  const { cast } = await loadCastFor(ctx.db, actor, castId, 'casts.manage');
  const removed = await ctx.db.transaction().execute(async (trx) => {
    const photo = await findPhoto(trx, castId, photoId);
    if (!photo) throw notFound('That photo');
    const rows = await deletePhoto(trx, photo);
    await writeAudit(trx, { actorUserId: actor.userId, action: 'cast.photo_remove', entityType: 'cast', entityId: castId, productionId: cast.productionId, req, details: { photoId } });
    return rows;
  });
  await discardFiles(ctx.files, removed);
}

/** Sends a photo or its thumbnail to staff who may see the cast, and to its performer. */
export async function sendPhoto(ctx: AppContext, actor: Actor, castId: string, photoId: string, which: 'photo' | 'thumbnail', v: string | undefined, res: Response): Promise<void> {
  const cast = await findCast(ctx.db, castId);
  if (!cast) throw notFound('That cast');
  // A performer sees photos of their own casts; anyone else needs to be allowed to see the cast.
  if (!actor.performerIds.includes(cast.performerId)) await loadCastFor(ctx.db, actor, castId);
  const photo = await findPhoto(ctx.db, castId, photoId);
  if (!photo) throw notFound('That photo');
  const fileId = which === 'photo' ? photo.fileId : photo.thumbFileId;
  const file = await readStoredFile(ctx.db, ctx.files, fileId);
  if (!file) throw notFound('That photo');
  // The URL carries the file id, so a matching ?v= names bytes that never change; private: it is a person's likeness.
  res.set('Cache-Control', v === fileId ? 'private, max-age=86400, immutable' : 'private, no-cache');
  res.set('ETag', `"${file.sha256}"`);
  res.type(file.contentType).send(file.bytes);
}
