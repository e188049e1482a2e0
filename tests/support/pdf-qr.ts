import { createRequire } from 'node:module';
import path from 'node:path';
import { createCanvas } from '@napi-rs/canvas';
import jsQRModule from 'jsqr';
import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';
import sharp from 'sharp';

const require = createRequire(import.meta.url);
// jsQR is CommonJS: Node hands its module object over as the default import.
const jsQR = jsQRModule.default;
const STANDARD_FONTS = `${path.join(path.dirname(require.resolve('pdfjs-dist/package.json')), 'standard_fonts')}${path.sep}`;

export interface DecodedQr {
  text: string;
  /** QR version (1–40) as the decoder measured it from the symbol. */
  version: number;
}

export interface RgbaImage {
  width: number;
  height: number;
  data: Uint8ClampedArray;
}

interface Box {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}

/** Runs of indexes in [from, to) where `occupied` holds, split by the stretches where it does not. */
function runs(from: number, to: number, occupied: (i: number) => boolean): [number, number][] {
  const out: [number, number][] = [];
  let start = -1;
  for (let i = from; i < to; i++) {
    if (occupied(i) && start < 0) start = i;
    if (!occupied(i) && start >= 0) {
      out.push([start, i]);
      start = -1;
    }
  }
  if (start >= 0) out.push([start, to]);
  return out;
}

/**
 * Recursive XY-cut, the classic page-segmentation step: a region is split wherever a whole row
 * (then a whole column) of it holds no dark pixel, until no blank stripe is left. A QR code has no
 * blank row or column inside it (its finder and timing patterns cross every line), so each code
 * ends up whole in a block of its own, in reading order.
 */
function blocks(dark: Uint8Array, width: number, height: number): Box[] {
  const leaves: Box[] = [];
  const stack: { box: Box; rowsFirst: boolean; splitOther: boolean }[] = [{ box: { x0: 0, y0: 0, x1: width, y1: height }, rowsFirst: true, splitOther: true }];
  while (stack.length) {
    const { box, rowsFirst, splitOther } = stack.pop()!;
    const rowDark = (y: number) => dark.subarray(y * width + box.x0, y * width + box.x1).includes(1);
    const colDark = (x: number) => {
      for (let y = box.y0; y < box.y1; y++) if (dark[y * width + x]) return true;
      return false;
    };
    const parts = rowsFirst
      ? runs(box.y0, box.y1, rowDark).map(([y0, y1]) => ({ ...box, y0, y1 }))
      : runs(box.x0, box.x1, colDark).map(([x0, x1]) => ({ ...box, x0, x1 }));
    if (parts.length > 1) {
      // Pushed in reverse so the stack hands them back top to bottom, left to right.
      for (const part of parts.toReversed()) stack.push({ box: part, rowsFirst: !rowsFirst, splitOther: true });
    } else if (parts.length === 1 && splitOther) {
      stack.push({ box: parts[0]!, rowsFirst: !rowsFirst, splitOther: false });
    } else if (parts.length === 1) {
      leaves.push(parts[0]!);
    }
  }
  return leaves;
}

/**
 * Every QR code in an image, read by jsQR (a decoder independent of the library that made the
 * codes). jsQR reads one code per image, so the page is cut into blocks first and each block
 * that could hold a code (square, at least 21 pixels a side) is decoded on its own white margin.
 */
export function decodeAllQr(image: RgbaImage): DecodedQr[] {
  const { width, height, data } = image;
  const dark = new Uint8Array(width * height);
  for (let i = 0; i < dark.length; i++) {
    const luma = 0.299 * data[i * 4]! + 0.587 * data[i * 4 + 1]! + 0.114 * data[i * 4 + 2]!;
    dark[i] = luma < 128 ? 1 : 0;
  }
  const found: DecodedQr[] = [];
  for (const box of blocks(dark, width, height)) {
    const w = box.x1 - box.x0;
    const h = box.y1 - box.y0;
    if (w < 21 || h < 21 || w > h * 1.25 || h > w * 1.25) continue;
    const pad = Math.max(8, Math.ceil(w * 0.15));
    const cw = w + 2 * pad;
    const ch = h + 2 * pad;
    const crop = new Uint8ClampedArray(cw * ch * 4).fill(255);
    for (let y = 0; y < h; y++) {
      const from = ((box.y0 + y) * width + box.x0) * 4;
      crop.set(data.subarray(from, from + w * 4), ((y + pad) * cw + pad) * 4);
    }
    const code = jsQR(crop, cw, ch, { inversionAttempts: 'dontInvert' });
    if (code) found.push({ text: code.data, version: code.version });
  }
  return found;
}

/** One page of a PDF drawn to pixels by Mozilla's pdf.js on a Skia canvas; `scale` is pixels per point. */
export async function renderPdfPage(bytes: Buffer, pageNumber = 1, scale = 2): Promise<RgbaImage> {
  const doc = await getDocument({ data: new Uint8Array(bytes), standardFontDataUrl: STANDARD_FONTS, isEvalSupported: false, verbosity: 0 }).promise;
  try {
    const page = await doc.getPage(pageNumber);
    const viewport = page.getViewport({ scale });
    const width = Math.ceil(viewport.width);
    const height = Math.ceil(viewport.height);
    const canvas = createCanvas(width, height);
    const context = canvas.getContext('2d');
    context.fillStyle = '#ffffff';
    context.fillRect(0, 0, width, height);
    await page.render({ canvasContext: context as unknown as CanvasRenderingContext2D, viewport }).promise;
    const pixels = context.getImageData(0, 0, width, height);
    return { width, height, data: new Uint8ClampedArray(pixels.data) };
  } finally {
    await doc.destroy();
  }
}

/** The texts of every QR code drawn on one page of a PDF. */
export async function pdfPageQrTexts(bytes: Buffer, pageNumber = 1, scale = 2): Promise<string[]> {
  return decodeAllQr(await renderPdfPage(bytes, pageNumber, scale)).map((c) => c.text);
}

/** Every QR code in a PNG, JPEG or SVG image, decoded to pixels by sharp first. */
export async function imageQrCodes(bytes: Buffer | string, density = 144): Promise<DecodedQr[]> {
  const input = typeof bytes === 'string' ? Buffer.from(bytes) : bytes;
  const { data, info } = await sharp(input, { density }).flatten({ background: '#ffffff' }).ensureAlpha().raw().toBuffer({ resolveWithObject: true });
  return decodeAllQr({ width: info.width, height: info.height, data: new Uint8ClampedArray(data.buffer, data.byteOffset, data.length) });
}

/** The texts of every QR code in a PNG, JPEG or SVG image. */
export async function imageQrTexts(bytes: Buffer | string): Promise<string[]> {
  return (await imageQrCodes(bytes)).map((c) => c.text);
}
