import { processPhoto, type ProcessedImage } from '../../files/photos.ts';

export { PORTRAIT_MAX_BYTES } from '#shared/limits.ts';
export { HEVC_UNREADABLE, NOT_A_PHOTO, PHOTO_MAX_SIDE as PORTRAIT_MAX_SIDE, THUMBNAIL_SIDE, TOO_MANY_PIXELS, type ProcessedImage } from '../../files/photos.ts';

/** The stored portrait and its thumbnail, by the photo rules of api/files/photos.ts; problems name the "portrait" field. */
export async function processPortrait(input: Buffer): Promise<{ portrait: ProcessedImage; thumbnail: ProcessedImage }> {
  const { photo, thumbnail } = await processPhoto(input, 'portrait');
  return { portrait: photo, thumbnail };
}
