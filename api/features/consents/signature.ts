import sharp, { type Metadata } from 'sharp';
import { SIGNATURE_MAX_BYTES } from '#shared/schemas/consents.ts';
import { invalid } from '../../http/errors.ts';

const MIN_INK_PIXELS = 60;

/**
 * Checks a drawn signature: a real PNG within size, with enough ink to be a mark rather than
 * an empty pad or a stray tap. Returns the PNG re-encoded (no metadata).
 */
export async function acceptSignature(dataUrl: string): Promise<{ png: Buffer; width: number; height: number }> {
  const bytes = Buffer.from(dataUrl.slice(dataUrl.indexOf(',') + 1), 'base64');
  if (bytes.length === 0 || bytes.length > SIGNATURE_MAX_BYTES) throw invalid({ signaturePng: ['Sign in the box'] });
  let meta: Metadata;
  try {
    meta = await sharp(bytes).metadata();
  } catch {
    throw invalid({ signaturePng: ['The signature could not be read. Clear the box and sign again.'] });
  }
  if (meta.format !== 'png' || !meta.width || !meta.height || meta.width > 4000 || meta.height > 2000) {
    throw invalid({ signaturePng: ['The signature could not be read. Clear the box and sign again.'] });
  }
  // Count pixels that carry ink: visible (alpha) and not near-white.
  const { data, info } = await sharp(bytes).ensureAlpha().raw().toBuffer({ resolveWithObject: true });
  let ink = 0;
  for (let i = 0; i < data.length; i += info.channels) {
    const a = data[i + 3]!;
    const lum = (data[i]! + data[i + 1]! + data[i + 2]!) / 3;
    if (a > 64 && lum < 200) ink++;
  }
  if (ink < MIN_INK_PIXELS) throw invalid({ signaturePng: ['The signature box is empty. Sign with your finger in the box.'] });
  const png = await sharp(bytes).png().toBuffer();
  return { png, width: meta.width, height: meta.height };
}
