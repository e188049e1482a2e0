// Codes made by api/files/qr.ts (the qrcode package) are read back by jsQR, an independent
// decoder, through tests/support/pdf-qr.ts; PDF pages are drawn to pixels by Mozilla's pdf.js.
import { createRequire } from 'node:module';
import PDFDocument from 'pdfkit';
import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { drawQr, qrMatrix, qrPng, qrSvg, type QrErrorCorrection } from '../../api/files/qr.ts';
import { imageQrCodes, imageQrTexts, pdfPageQrTexts } from '../support/pdf-qr.ts';

const require = createRequire(import.meta.url);
const FONT_REGULAR = require.resolve('@fontsource/nunito-sans/files/nunito-sans-latin-400-normal.woff');
const FONT_BOLD = require.resolve('@fontsource/nunito-sans/files/nunito-sans-latin-700-normal.woff');

const PERFORMER_LINK = 'https://plinth.test/performers/7d1f0c52-3b7e-4c1a-9a55-2f4a1d6e8b90';

function pdfBytes(draw: (doc: PDFKit.PDFDocument) => void): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const doc = new PDFDocument({ size: 'A4', margin: 36 });
    const chunks: Buffer[] = [];
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
    doc.registerFont('body', FONT_REGULAR);
    doc.registerFont('bold', FONT_BOLD);
    draw(doc);
    doc.end();
  });
}

describe('QR images', () => {
  it.each([
    ['a link to a performer', PERFORMER_LINK],
    ['a shelf code', 'R3-S2-B07'],
    ['text beyond ASCII', 'Moulage · Vitrine Ø 4 — “face, left”'],
    ['digits only', '000123456789'],
  ])('a PNG of %s decodes back to the exact text', async (_what, text) => {
    expect(await imageQrTexts(await qrPng(text))).toEqual([text]);
  });

  it('an SVG decodes back to the exact text once drawn to pixels', async () => {
    const svg = await qrSvg(PERFORMER_LINK);
    expect(svg.startsWith('<svg')).toBe(true);
    expect(await imageQrTexts(svg)).toEqual([PERFORMER_LINK]);
  });

  it('keeps a light quiet zone of four modules on every side', async () => {
    const png = await qrPng(PERFORMER_LINK, { scale: 10 });
    const [decoded] = await imageQrCodes(png);
    // ISO/IEC 18004: a symbol is 17 + 4·version modules a side, with a quiet zone 4 modules wide (from memory).
    const modules = 17 + 4 * decoded!.version + 2 * 4;
    const { data, info } = await sharp(png).greyscale().raw().toBuffer({ resolveWithObject: true });
    expect(info.width).toBe(modules * 10);
    expect(info.height).toBe(modules * 10);
    const dark = (x: number, y: number) => data[y * info.width + x]! < 128;
    const firstDarkInRow = (y: number) => Array.from({ length: info.width }, (_, x) => x).find((x) => dark(x, y));
    for (let y = 0; y < 40; y++) expect(firstDarkInRow(y)).toBeUndefined();
    // Row 40 is the top edge of the top-left finder pattern, whose corner module is dark.
    expect(firstDarkInRow(40)).toBe(40);
  });

  // Byte-mode capacities per ISO/IEC 18004 (from memory): version 4 holds 46 bytes at Q and 62 at M;
  // version 5 holds 60 at Q; version 6 holds 58 at H.
  it.each<[string, QrErrorCorrection | undefined, number, number]>([
    ['the default (Q)', undefined, 46, 4],
    ['the default (Q)', undefined, 47, 5],
    ['the default (Q)', undefined, 60, 5],
    ['the default (Q)', undefined, 61, 6],
    ['M', 'M', 62, 4],
    ['M', 'M', 63, 5],
    ['H', 'H', 58, 6],
  ])('at error correction %s, %i bytes of link need version %i', async (_label, level, length, version) => {
    const text = `https://plinth.test/c/${'a'.repeat(length - 22)}`;
    expect(text).toHaveLength(length);
    const codes = await imageQrCodes(await qrPng(text, level ? { errorCorrection: level } : {}));
    expect(codes).toEqual([{ text, version }]);
  });

  it('refuses empty text, text too long for any QR code, and a broken quiet zone', async () => {
    expect(() => qrMatrix('')).toThrow();
    // ISO/IEC 18004: version 40 at L holds at most 2,953 bytes (from memory).
    expect(() => qrMatrix('a'.repeat(2954), { errorCorrection: 'L' })).toThrow();
    expect(qrMatrix('a'.repeat(2953), { errorCorrection: 'L' }).version).toBe(40);
    expect(() => qrMatrix('x', { quietZone: -1 })).toThrow(/quiet zone/);
    await expect(qrPng('x', { quietZone: 1.5 })).rejects.toThrow(/quiet zone/);
  });
});

describe('QR codes on a PDF page', () => {
  it('one code drawn as vector squares decodes back to the exact text', async () => {
    const pdf = await pdfBytes((doc) => {
      doc.font('bold').fontSize(16).text('Performer card');
      drawQr(doc, PERFORMER_LINK, { x: 36, y: 80, size: 144 });
    });
    expect(await pdfPageQrTexts(pdf)).toEqual([PERFORMER_LINK]);
  });

  it('a sheet of labels with captions decodes to every code, in reading order', async () => {
    const codes = Array.from({ length: 12 }, (_, i) => `https://plinth.test/casts/${String(i + 1).padStart(4, '0')}-${['mold', 'positive', 'core'][i % 3]}`);
    const pdf = await pdfBytes((doc) => {
      codes.forEach((code, i) => {
        const x = 36 + (i % 3) * 180;
        const y = 36 + Math.floor(i / 3) * 190;
        drawQr(doc, code, { x, y, size: 120 });
        doc.font('body').fontSize(9).fillColor('#2a211c').text(`Cast ${i + 1} · rack 3, shelf ${Math.floor(i / 3) + 1}`, x, y + 124, { width: 160 });
      });
    });
    expect(await pdfPageQrTexts(pdf)).toEqual(codes);
  });

  it('a code one inch wide (72 pt) still reads from a 216 dpi rendering', async () => {
    const pdf = await pdfBytes((doc) => {
      drawQr(doc, PERFORMER_LINK, { x: 200, y: 300, size: 72 });
    });
    expect(await pdfPageQrTexts(pdf, 1, 3)).toEqual([PERFORMER_LINK]);
  });

  it('reads codes on the page they were drawn on, and none on a page without', async () => {
    const pdf = await pdfBytes((doc) => {
      doc.font('body').fontSize(11).text('Cover page: no code here.');
      doc.addPage();
      drawQr(doc, 'R3-S2-B07', { x: 300, y: 500, size: 100 });
    });
    expect(await pdfPageQrTexts(pdf, 1)).toEqual([]);
    expect(await pdfPageQrTexts(pdf, 2)).toEqual(['R3-S2-B07']);
  });
});
