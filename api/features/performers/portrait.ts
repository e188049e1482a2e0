import sharp from 'sharp';
import { invalid } from '../../http/errors.ts';

export const PORTRAIT_MAX_BYTES = 10 * 1024 * 1024;
export const PORTRAIT_MAX_SIDE = 1600;
export const THUMBNAIL_SIDE = 256;
export const NOT_A_PHOTO = 'This is not a photo Plinth can read (JPEG, PNG, WebP or HEIC)';

/** Formats we accept, as sharp names them after reading the bytes (HEIC and AVIF are both "heif"). */
const ACCEPTED_FORMATS = new Set(['jpeg', 'png', 'webp', 'heif']);

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
  let format: string | undefined;
  try {
    format = (await sharp(input).metadata()).format;
  } catch {
    throw invalid({ portrait: [NOT_A_PHOTO] });
  }
  if (!format || !ACCEPTED_FORMATS.has(format)) throw invalid({ portrait: [NOT_A_PHOTO] });
  try {
    // A transparent PNG or WebP lands on white rather than JPEG's black.
    const [portrait, thumbnail] = await Promise.all([
      sharp(input)
        .rotate()
        .flatten({ background: '#ffffff' })
        .resize({ width: PORTRAIT_MAX_SIDE, height: PORTRAIT_MAX_SIDE, fit: 'inside', withoutEnlargement: true })
        .jpeg({ quality: 85, mozjpeg: true })
        .toBuffer({ resolveWithObject: true }),
      sharp(input)
        .rotate()
        .flatten({ background: '#ffffff' })
        .resize({ width: THUMBNAIL_SIDE, height: THUMBNAIL_SIDE, fit: 'cover', position: sharp.strategy.attention })
        .jpeg({ quality: 80, mozjpeg: true })
        .toBuffer({ resolveWithObject: true }),
    ]);
    return {
      portrait: { bytes: portrait.data, width: portrait.info.width, height: portrait.info.height },
      thumbnail: { bytes: thumbnail.data, width: thumbnail.info.width, height: thumbnail.info.height },
    };
  } catch {
    // The header looked like a photo but the pixels cannot be decoded (truncated, or HEVC without a decoder).
    throw invalid({ portrait: [NOT_A_PHOTO] });
  }
}
