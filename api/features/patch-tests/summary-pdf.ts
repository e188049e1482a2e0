import { createRequire } from 'node:module';
import PDFDocument from 'pdfkit';
import { CLEARANCE_STATE_LABELS } from '#shared/domain/clearance.ts';
import { ICDRG_LABELS } from '#shared/domain/icdrg.ts';
import { TEST_KIND_LABELS } from '#shared/domain/protocols.ts';
import { TEST_STATUS_LABELS } from '#shared/domain/reading-schedule.ts';
import { READING_PATTERN_LABELS } from '#shared/domain/test-outcome.ts';
import type { ClearanceRow, PatchTestDetail } from '#shared/schemas/patch-test-log.ts';

const require = createRequire(import.meta.url);
const FONT_REGULAR = require.resolve('@fontsource/nunito-sans/files/nunito-sans-latin-400-normal.woff');
const FONT_BOLD = require.resolve('@fontsource/nunito-sans/files/nunito-sans-latin-700-normal.woff');

export interface SummaryDocument {
  performerName: string;
  printedAt: Date;
  timeZone: string;
  clearances: readonly ClearanceRow[];
  /** Products Caution only because they share an ingredient with one that reacted: printed as one list of names. */
  sharedCautions: readonly ClearanceRow[];
  tests: readonly PatchTestDetail[];
}

const CAUTION =
  'Patch testing screens for reactions; it is not a medical diagnosis. Stop and remove a product at any burning, itching or swelling; a severe or spreading reaction, or any breathing difficulty, needs medical help at once. Follow a dermatologist’s or doctor’s advice over any result in Plinth, and the production’s licensed medical staff.';

/** A printable summary of one performer's patch tests: clearance per product, then each test's grades and notes. Health details throughout. */
export function renderSummaryPdf(doc: SummaryDocument): Promise<Buffer> {
  const when = (iso: string | Date) => new Intl.DateTimeFormat('en-GB', { timeZone: doc.timeZone, dateStyle: 'medium', timeStyle: 'short' }).format(new Date(iso));
  const day = (iso: string) => new Intl.DateTimeFormat('en-GB', { timeZone: doc.timeZone, dateStyle: 'medium' }).format(new Date(iso));
  return new Promise((resolve, reject) => {
    const pdf = new PDFDocument({ size: 'A4', margins: { top: 56, bottom: 64, left: 56, right: 56 }, info: { Title: `Patch-test results — ${doc.performerName}`, Author: 'Plinth', CreationDate: doc.printedAt } });
    const chunks: Buffer[] = [];
    pdf.on('data', (c: Buffer) => chunks.push(c));
    pdf.on('end', () => resolve(Buffer.concat(chunks)));
    pdf.on('error', reject);
    pdf.registerFont('body', FONT_REGULAR);
    pdf.registerFont('bold', FONT_BOLD);

    pdf.font('bold').fontSize(18).fillColor('#2b2420').text(`Patch-test results: ${doc.performerName}`);
    pdf.font('body').fontSize(10).fillColor('#4a3f38').text(`Printed ${when(doc.printedAt)}. Screening, not diagnosis. Health details: keep this with the performer's medical records.`);
    pdf.moveDown(0.5);
    pdf.font('body').fontSize(9).fillColor('#6b4e16').text(CAUTION);
    pdf.moveDown();

    pdf.font('bold').fontSize(13).fillColor('#2b2420').text('Clearance per product');
    pdf.moveDown(0.3);
    if (doc.clearances.length === 0) pdf.font('body').fontSize(10).text('No product has been tested.');
    for (const c of doc.clearances) {
      pdf.font('bold').fontSize(10).fillColor('#2b2420').text(`${c.productName}: ${CLEARANCE_STATE_LABELS[c.state]}${c.overridden ? ' (set by the designated lead)' : ''}`);
      const extra = [c.reasons.map((r) => r.text).join('; '), c.validUntil ? `valid until ${day(c.validUntil)}` : null, c.outcome ? `latest test: strongest ${c.outcome.strongest ?? '—'}, final ${c.outcome.final ?? '—'}, ${READING_PATTERN_LABELS[c.outcome.pattern].toLowerCase()}` : null, c.override?.note ? `lead’s note: ${c.override.note}` : null];
      pdf.font('body').fontSize(9).fillColor('#4a3f38').text(extra.filter(Boolean).join(' · '), { indent: 12 });
    }
    if (doc.sharedCautions.length > 0) {
      pdf.moveDown(0.5);
      pdf.font('bold').fontSize(10).fillColor('#2b2420').text(`${CLEARANCE_STATE_LABELS.caution}, sharing an ingredient with a product that reacted (${doc.sharedCautions.length}):`);
      pdf.font('body').fontSize(9).fillColor('#4a3f38').text(doc.sharedCautions.map((c) => c.productName).join(', '), { indent: 12 });
    }
    pdf.moveDown();

    pdf.font('bold').fontSize(13).fillColor('#2b2420').text('Tests');
    for (const t of doc.tests) {
      pdf.moveDown(0.5);
      pdf.font('bold').fontSize(11).fillColor('#2b2420').text(`${t.protocolName} (${TEST_KIND_LABELS[t.testKind]}), ${TEST_STATUS_LABELS[t.status].toLowerCase()}`);
      pdf.font('body').fontSize(9).fillColor('#4a3f38').text(`Applied ${t.appliedAt ? when(t.appliedAt) : 'not yet'}${t.removedAt ? ` · patches off ${when(t.removedAt)}` : ''}${t.location ? ` · ${t.location}` : ''}`);
      for (const p of t.products) {
        const reads = (p.readings ?? []).map((r) => `${t.schedule.find((s) => s.pointId === r.pointId)?.label ?? r.pointId}: ${r.code} ${ICDRG_LABELS[r.code].toLowerCase()}${r.note ? ` (${r.note})` : ''}`);
        pdf.font('body').fontSize(9).fillColor('#2b2420').text(`${p.site}: ${p.productName}, lot ${p.lotCode} — ${reads.length ? reads.join('; ') : 'no readings'}`, { indent: 12 });
      }
    }
    pdf.end();
  });
}
