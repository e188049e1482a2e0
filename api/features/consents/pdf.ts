import { createRequire } from 'node:module';
import { marked, type Token, type Tokens } from 'marked';
import PDFDocument from 'pdfkit';
import { CONSENT_KIND_LABELS, type ConsentKind } from '#shared/domain/consent.ts';
import { mailDateTime } from '../../mail/dates.ts';

const require = createRequire(import.meta.url);
const FONT_REGULAR = require.resolve('@fontsource/nunito-sans/files/nunito-sans-latin-400-normal.woff');
const FONT_BOLD = require.resolve('@fontsource/nunito-sans/files/nunito-sans-latin-700-normal.woff');

export interface ConsentDocument {
  consentId: string;
  kind: ConsentKind;
  title: string;
  templateVersion: number;
  body: string;
  performerName: string;
  productionName: string | null;
  answers: { label: string; answer: string; medical: boolean }[];
  signerName: string;
  signedAt: Date;
  /** The studio's clock, for the signing time in words beside the UTC record. */
  timeZone: string;
  signingMethod: 'tablet' | 'link';
  ip: string | null;
  userAgent: string | null;
  signaturePng: Buffer;
  contentSha256: string;
  /** The staff-safe copy: the same record with every health answer left out, and a line saying so. */
  staffCopy?: boolean;
}

export const STAFF_COPY_NOTICE =
  'Staff copy: health answers are withheld from this copy. The full signed copy, with every answer, is kept for the designated lead and the performer.';

function inlineText(tokens: Token[] | undefined, fallback: string): string {
  if (!tokens) return fallback;
  return tokens.map((t) => ('tokens' in t && t.tokens ? inlineText(t.tokens, '') : 'text' in t ? String(t.text) : '')).join('');
}

/** Renders the signed consent: the exact text, the answers, the signature and the evidence, hash in every footer. */
export function renderConsentPdf(doc: ConsentDocument): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const pdf = new PDFDocument({
      size: 'A4',
      margins: { top: 56, bottom: 72, left: 56, right: 56 },
      bufferPages: true,
      info: {
        Title: `${doc.title} — ${doc.performerName}`,
        Author: 'Plinth',
        Subject: `${doc.staffCopy ? 'Staff copy of signed consent' : 'Signed consent'} ${doc.consentId}`,
        // A fixed date keeps the same record rendering to the same bytes.
        CreationDate: doc.signedAt,
        ModDate: doc.signedAt,
      },
    });
    const chunks: Buffer[] = [];
    pdf.on('data', (c: Buffer) => chunks.push(c));
    pdf.on('end', () => resolve(Buffer.concat(chunks)));
    pdf.on('error', reject);
    pdf.registerFont('body', FONT_REGULAR);
    pdf.registerFont('bold', FONT_BOLD);

    pdf.font('bold').fontSize(18).fillColor('#2b2420').text(doc.title);
    pdf.moveDown(0.3);
    if (doc.staffCopy) pdf.font('bold').fontSize(10.5).fillColor('#7a2e1f').text(STAFF_COPY_NOTICE).moveDown(0.3);
    pdf.font('body').fontSize(10).fillColor('#4a3f38');
    pdf.text(`${CONSENT_KIND_LABELS[doc.kind]} consent · form version ${doc.templateVersion}`);
    pdf.text(`Performer: ${doc.performerName}${doc.productionName ? ` · Production: ${doc.productionName}` : ''}`);
    pdf.moveDown();
    pdf.fillColor('#2b2420');

    for (const token of marked.lexer(doc.body)) {
      if (token.type === 'heading') {
        const h = token as Tokens.Heading;
        pdf.moveDown(0.4).font('bold').fontSize(h.depth <= 2 ? 13 : 11.5).text(inlineText(h.tokens, h.text)).font('body').fontSize(10.5);
      } else if (token.type === 'paragraph') {
        const p = token as Tokens.Paragraph;
        pdf.font('body').fontSize(10.5).text(inlineText(p.tokens, p.text), { paragraphGap: 6 });
      } else if (token.type === 'list') {
        const l = token as Tokens.List;
        l.items.forEach((item, i) => {
          pdf.font('body').fontSize(10.5).text(`${l.ordered ? `${Number(l.start || 1) + i}.` : '•'}  ${inlineText(item.tokens, item.text)}`, { indent: 12, paragraphGap: 3 });
        });
        pdf.moveDown(0.3);
      } else if (token.type === 'space' || token.type === 'hr') {
        pdf.moveDown(0.4);
      } else if ('text' in token) {
        pdf.font('body').fontSize(10.5).text(String(token.text), { paragraphGap: 6 });
      }
    }

    if (doc.answers.length) {
      pdf.moveDown().font('bold').fontSize(13).text('Answers');
      pdf.font('body').fontSize(10.5);
      for (const a of doc.answers) {
        // The staff copy keeps each question, so the record reads whole, but never a health answer.
        pdf.font('bold').text(a.label + (a.medical ? ' (health detail)' : ''), { continued: false });
        pdf.font('body').text(doc.staffCopy && a.medical ? 'Withheld from the staff copy' : a.answer, { indent: 12, paragraphGap: 4 });
      }
    }

    pdf.moveDown().font('bold').fontSize(13).text('Signature');
    pdf.font('body').fontSize(10.5).text(`Printed name: ${doc.signerName}`);
    pdf.text('I agreed to the text above by ticking the agreement box and signing below.');
    if (pdf.y > pdf.page.height - 260) pdf.addPage();
    pdf.image(doc.signaturePng, { fit: [320, 120] });
    pdf.moveDown(0.5);
    pdf.fontSize(9).fillColor('#4a3f38');
    pdf.text(`Signed: ${mailDateTime(doc.signedAt, doc.timeZone)} (recorded as ${doc.signedAt.toISOString()} UTC, server time)`);
    pdf.text(`Method: ${doc.signingMethod === 'tablet' ? "on the department's tablet" : 'through a one-time link on the performer\'s own device'}`);
    pdf.text(`IP address: ${doc.ip ?? 'not recorded'}`);
    pdf.text(`Device: ${doc.userAgent ?? 'not recorded'}`);
    pdf.text(`Record: ${doc.consentId}`);
    pdf.text(`Content SHA-256: ${doc.contentSha256}`);

    const range = pdf.bufferedPageRange();
    for (let i = range.start; i < range.start + range.count; i++) {
      pdf.switchToPage(i);
      const bottom = pdf.page.margins.bottom;
      pdf.page.margins.bottom = 0;
      pdf.font('body').fontSize(7.5).fillColor('#4a3f38');
      pdf.text(`Plinth consent ${doc.consentId}${doc.staffCopy ? ' (staff copy, health answers withheld)' : ''} · page ${i + 1} of ${range.count} · SHA-256 of the signed content: ${doc.contentSha256}`, 56, pdf.page.height - 48, {
        width: pdf.page.width - 112,
        align: 'center',
        lineBreak: true,
      });
      pdf.page.margins.bottom = bottom;
    }
    pdf.end();
  });
}
