import sharp, { type Metadata } from 'sharp';
import { invalid } from '../../http/errors.ts';

export { PORTRAIT_MAX_BYTES } from '#shared/limits.ts';
export const PORTRAIT_MAX_SIDE = 1600;
export const THUMBNAIL_SIDE = 256;
export const NOT_A_PHOTO = 'This is not a photo Plinth can read (JPEG, PNG, WebP or AVIF)';
export const HEVC_UNREADABLE =
  'This HEIC photo uses a compression (HEVC) this server cannot decode. Send it as JPEG, or set the camera to "Most Compatible".';

export const TOO_MANY_PIXELS = 'This photo has more than 100 megapixels. Send a smaller copy.';

/** Formats we accept, as sharp names them after reading the bytes (HEIC and AVIF are both "heif"). */
const ACCEPTED_FORMATS = new Set(['jpeg', 'png', 'webp', 'heif']);

/**
 * A decompression bomb (a small file of enormous dimensions) is refused before decoding: 100
 * megapixels is more than any phone or camera saves inside the 10 MB limit.
 */
const MAX_INPUT_PIXELS = 100_000_000;

export interface ProcessedImage {
  bytes: Buffer;
  width: number;
  height: number;
}

/**
 * Turns an uploaded photo into the stored portrait and its thumbnail. The type is read from the
 * content, never from the name or the declared type. Both outputs are freshly encoded JPEGs:
 * turned upright from the EXIF orientation, then written without any metadata (no EXIF, GPS,
 * XMP or ICC profile leave sharp unless asked to keep them, and we never ask).
 */
export async function processPortrait(input: Buffer): Promise<{ portrait: ProcessedImage; thumbnail: ProcessedImage }> {
  const options = { limitInputPixels: MAX_INPUT_PIXELS };
  let meta: Metadata;
  try {
    // The header only: dimensions are checked against the limit below, before any pixel is decoded.
    meta = await sharp(input, { limitInputPixels: false }).metadata();
  } catch {
    throw invalid({ portrait: [NOT_A_PHOTO] });
  }
  if (!meta.format || !ACCEPTED_FORMATS.has(meta.format)) throw invalid({ portrait: [NOT_A_PHOTO] });
  if ((meta.width ?? 0) * (meta.height ?? 0) > MAX_INPUT_PIXELS) throw invalid({ portrait: [TOO_MANY_PIXELS] });
  try {
    const portrait = await sharp(input, options)
      .rotate()
      // A transparent PNG or WebP lands on white rather than JPEG's black.
      .flatten({ background: '#ffffff' })
      .resize({ width: PORTRAIT_MAX_SIDE, height: PORTRAIT_MAX_SIDE, fit: 'inside', withoutEnlargement: true })
      .jpeg({ quality: 85, mozjpeg: true })
      .toBuffer({ resolveWithObject: true });
    // From the upright, already-stripped portrait: one decode of the upload, not two.
    const thumbnail = await sharp(portrait.data)
      .resize({ width: THUMBNAIL_SIDE, height: THUMBNAIL_SIDE, fit: 'cover', position: sharp.strategy.attention })
      .jpeg({ quality: 80, mozjpeg: true })
      .toBuffer({ resolveWithObject: true });
    return {
      portrait: { bytes: portrait.data, width: portrait.info.width, height: portrait.info.height },
      thumbnail: { bytes: thumbnail.data, width: thumbnail.info.width, height: thumbnail.info.height },
    };
  } catch {
    // The header looked like a photo but the pixels cannot be decoded: truncated, too large, or HEVC without a decoder.
    throw invalid({ portrait: [meta.format === 'heif' && meta.compression === 'hevc' ? HEVC_UNREADABLE : NOT_A_PHOTO] });
  }
}
