import { createRequire } from 'node:module';
import PDFDocument from 'pdfkit';
import type { Actor } from '#shared/policy.ts';
import type { AppContext } from '../../context.ts';
import { authorize } from '../../http/authorize.ts';
import { notFound } from '../../http/errors.ts';
import { drawQr, qrPng } from '../../files/qr.ts';
import { findPerformerScope } from '../performers/index.ts';

const require = createRequire(import.meta.url);
const FONT_REGULAR = require.resolve('@fontsource/nunito-sans/files/nunito-sans-latin-400-normal.woff');
const FONT_BOLD = require.resolve('@fontsource/nunito-sans/files/nunito-sans-latin-700-normal.woff');
const MM = 72 / 25.4;

/** What the performer's card holds: their name and the address that opens the check with them chosen. Nothing medical. */
async function cardFacts(ctx: AppContext, actor: Actor, performerId: string): Promise<{ name: string; url: string }> {
  const scope = await findPerformerScope(ctx.db, performerId);
  if (!scope) throw notFound('That performer');
  authorize(actor, 'performers.view', { performerId, performerProductionIds: scope.productionIds });
  return { name: scope.name, url: `${ctx.config.appOrigin}/check?performerId=${performerId}` };
}

/** The card's QR alone, as a PNG (for a badge or a lanyard sleeve). */
export async function performerCardPng(ctx: AppContext, actor: Actor, performerId: string): Promise<Buffer> {
  const { url } = await cardFacts(ctx, actor, performerId);
  return qrPng(url, { scale: 10 });
}

/** A printable card, 85.6 × 54 mm (a bank-card size) on an A4 page to cut out: name, QR and what it is for. */
export async function performerCardPdf(ctx: AppContext, actor: Actor, performerId: string): Promise<Buffer> {
  const { name, url } = await cardFacts(ctx, actor, performerId);
  return new Promise((resolve, reject) => {
    const pdf = new PDFDocument({ size: 'A4', margin: 0, info: { Title: `Plinth card: ${name}`, Author: 'Plinth' } });
    const chunks: Buffer[] = [];
    pdf.on('data', (c: Buffer) => chunks.push(c));
    pdf.on('end', () => resolve(Buffer.concat(chunks)));
    pdf.on('error', reject);
    pdf.registerFont('body', FONT_REGULAR);
    pdf.registerFont('bold', FONT_BOLD);
    const x = 20 * MM;
    const y = 20 * MM;
    const w = 85.6 * MM;
    const h = 54 * MM;
    const pad = 4 * MM;
    const qr = h - 2 * pad;
    pdf.save().roundedRect(x, y, w, h, 8).lineWidth(0.5).stroke('#c8c8c8').restore();
    drawQr(pdf, url, { x: x + pad, y: y + pad, size: qr });
    const textX = x + pad + qr + 3 * MM;
    const width = x + w - pad - textX;
    pdf.font('bold').fontSize(7).fillColor('#4a3f38').text('PLINTH · PERFORMER', textX, y + pad + 2, { width });
    pdf.font('bold').fontSize(12).fillColor('#000000').text(name, textX, y + pad + 14, { width });
    pdf.font('body').fontSize(7.5).fillColor('#2b2420').text('Scan before every application to run the check.', textX, pdf.y + 4, { width });
    pdf.end();
  });
}
