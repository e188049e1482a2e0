import { createRequire } from 'node:module';
import PDFDocument from 'pdfkit';
import { drawQr } from '../../files/qr.ts';

const require = createRequire(import.meta.url);
const FONT_REGULAR = require.resolve('@fontsource/nunito-sans/files/nunito-sans-latin-400-normal.woff');
const FONT_BOLD = require.resolve('@fontsource/nunito-sans/files/nunito-sans-latin-700-normal.woff');

/** One label: the address its QR holds, the printed code, and two or three short lines saying what it is on. */
export interface SheetLabel {
  url: string;
  code: string;
  /** "CAST" or "PLACE", printed small above the code so a shelf label is told from a cast label at a glance. */
  kind: string;
  lines: string[];
}

const MM = 72 / 25.4;
// A common A4 label stock: 3 across, 7 down, 63.5 × 38.1 mm, 2.5 mm between columns.
const COLUMNS = 3;
const ROWS = 7;
const LABEL_W = 63.5 * MM;
const LABEL_H = 38.1 * MM;
const GAP_X = 2.5 * MM;
const PAGE_W = 595.28;
const PAGE_H = 841.89;
const LEFT = (PAGE_W - COLUMNS * LABEL_W - (COLUMNS - 1) * GAP_X) / 2;
const TOP = (PAGE_H - ROWS * LABEL_H) / 2;
const PAD = 3 * MM;
// About 30 mm of QR: at version 3 that is near 0.8 mm a module, read easily by a tablet at arm's length.
const QR_SIDE = LABEL_H - 2 * PAD;
export const LABELS_PER_PAGE = COLUMNS * ROWS;

/**
 * Renders a sheet of labels as a PDF in the app's own font. Cut lines are light grey, so a reader
 * (or a camera) finds nothing but the codes dark; each QR sits on white with its quiet zone and a
 * clear gap before the text.
 */
export function renderLabelSheet(labels: readonly SheetLabel[], opts: { title: string; createdAt: Date }): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const pdf = new PDFDocument({ size: 'A4', margin: 0, autoFirstPage: false, info: { Title: opts.title, Author: 'Plinth', CreationDate: opts.createdAt, ModDate: opts.createdAt } });
    const chunks: Buffer[] = [];
    pdf.on('data', (c: Buffer) => chunks.push(c));
    pdf.on('end', () => resolve(Buffer.concat(chunks)));
    pdf.on('error', reject);
    pdf.registerFont('body', FONT_REGULAR);
    pdf.registerFont('bold', FONT_BOLD);
    labels.forEach((label, i) => {
      const slot = i % LABELS_PER_PAGE;
      if (slot === 0) pdf.addPage({ size: 'A4', margin: 0 });
      const x = LEFT + (slot % COLUMNS) * (LABEL_W + GAP_X);
      const y = TOP + Math.floor(slot / COLUMNS) * LABEL_H;
      pdf.save().roundedRect(x + 1, y + 1, LABEL_W - 2, LABEL_H - 2, 6).lineWidth(0.5).stroke('#c8c8c8').restore();
      drawQr(pdf, label.url, { x: x + PAD, y: y + PAD, size: QR_SIDE });
      const textX = x + PAD + QR_SIDE + 2 * MM;
      const width = x + LABEL_W - PAD - textX;
      pdf.font('bold').fontSize(6.5).fillColor('#4a3f38').text(label.kind, textX, y + PAD + 2, { width, lineBreak: false });
      pdf.font('bold').fontSize(11).fillColor('#000000').text(label.code, textX, y + PAD + 12, { width, lineBreak: false });
      let lineY = y + PAD + 30;
      for (const line of label.lines) {
        pdf.font('body').fontSize(7).fillColor('#2b2420').text(line, textX, lineY, { width, height: 18, ellipsis: true });
        lineY = pdf.y + 1.5;
        if (lineY > y + LABEL_H - PAD - 8) break;
      }
    });
    if (labels.length === 0) pdf.addPage();
    pdf.end();
  });
}
