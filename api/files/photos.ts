import sharp, { type Metadata } from 'sharp';
import { PHOTO_MAX_PIXELS } from '#shared/limits.ts';
import { invalid } from '../http/errors.ts';

export const PHOTO_MAX_SIDE = 1600;
export const THUMBNAIL_SIDE = 256;
export const NOT_A_PHOTO = 'This is not a photo Plinth can read (JPEG, PNG, WebP or AVIF)';
export const HEVC_UNREADABLE =
  'This HEIC photo uses a compression (HEVC) this server cannot decode. Send it as JPEG, or set the camera to "Most Compatible".';
export const TOO_MANY_PIXELS = 'This photo has more than 100 megapixels. Send a smaller copy.';

/** Formats we accept, as sharp names them after reading the bytes (HEIC and AVIF are both "heif"). */
const ACCEPTED_FORMATS = new Set(['jpeg', 'png', 'webp', 'heif']);

export interface ProcessedImage {
  bytes: Buffer;
  width: number;
  height: number;
}

/**
 * Turns an uploaded photo into a stored copy and its thumbnail; problems are reported against
 * `field`. The type is read from the content, never from the name or the declared type. Both
 * outputs are freshly encoded JPEGs: turned upright from the EXIF orientation, then written
 * without any metadata (no EXIF, GPS, XMP or ICC profile leave sharp unless asked, and we never
 * ask). A decompression bomb (a small file of enormous dimensions) is refused from its header,
 * before a pixel is decoded: 100 megapixels is more than any camera saves inside the size limit.
 */
export async function processPhoto(input: Buffer, field: string): Promise<{ photo: ProcessedImage; thumbnail: ProcessedImage }> {
  let meta: Metadata;
  try {
    meta = await sharp(input, { limitInputPixels: false }).metadata();
  } catch {
    throw invalid({ [field]: [NOT_A_PHOTO] });
  }
  if (!meta.format || !ACCEPTED_FORMATS.has(meta.format)) throw invalid({ [field]: [NOT_A_PHOTO] });
  if ((meta.width ?? 0) * (meta.height ?? 0) > PHOTO_MAX_PIXELS) throw invalid({ [field]: [TOO_MANY_PIXELS] });
  try {
    const photo = await sharp(input, { limitInputPixels: PHOTO_MAX_PIXELS })
      .rotate()
      // A transparent PNG or WebP lands on white rather than JPEG's black.
      .flatten({ background: '#ffffff' })
      .resize({ width: PHOTO_MAX_SIDE, height: PHOTO_MAX_SIDE, fit: 'inside', withoutEnlargement: true })
      .jpeg({ quality: 85, mozjpeg: true })
      .toBuffer({ resolveWithObject: true });
    // From the upright, already-stripped copy: one decode of the upload, not two.
    const thumbnail = await sharp(photo.data)
      .resize({ width: THUMBNAIL_SIDE, height: THUMBNAIL_SIDE, fit: 'cover', position: sharp.strategy.attention })
      .jpeg({ quality: 80, mozjpeg: true })
      .toBuffer({ resolveWithObject: true });
    return {
      photo: { bytes: photo.data, width: photo.info.width, height: photo.info.height },
      thumbnail: { bytes: thumbnail.data, width: thumbnail.info.width, height: thumbnail.info.height },
    };
  } catch {
    // The header looked like a photo but the pixels cannot be decoded: truncated, too large, or HEVC without a decoder.
    throw invalid({ [field]: [meta.format === 'heif' && meta.compression === 'hevc' ? HEVC_UNREADABLE : NOT_A_PHOTO] });
  }
}
