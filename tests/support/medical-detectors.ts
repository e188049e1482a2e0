// Detectors for health details in a reply, shared by the GET sweep (tests/api/medical-exposure.test.ts)
// and the permission matrix: the demo's real health answers, read back from the sealed rows, and the
// shape of an answer marked medical.
import type { Response } from 'supertest';
import { openJson } from '../../api/crypto/medical.ts';
import type { TestApp } from './app.ts';
import { pdfText } from './pdf.ts';

export interface MedicalText {
  text: string;
  performerId: string;
}

/** An answer object marked medical (question definitions in templates may say medical: true; answers never may). */
export const MEDICAL_ANSWER_PATTERN = /"medical":true,"answer"/;

/** Every health answer on file long enough to recognise, with whose it is. */
export async function loadMedicalTexts(t: TestApp): Promise<MedicalText[]> {
  const rows = await t.db.db
    .selectFrom('consent_answers as a')
    .innerJoin('consents as c', 'c.id', 'a.consent_id')
    .select(['a.answer', 'c.performer_id'])
    .where('a.medical', '=', true)
    .execute();
  const out: MedicalText[] = [];
  for (const r of rows) {
    const text = openJson(r.answer);
    if (typeof text === 'string' && text.length > 3) out.push({ text, performerId: r.performer_id });
  }
  return out;
}

/** Asks supertest to keep the raw bytes whatever the content type (JSON, CSV, PDF, images). */
export function rawBody(res: Response, cb: (err: Error | null, body: Buffer) => void): void {
  const chunks: Buffer[] = [];
  const stream = res as unknown as NodeJS.ReadableStream;
  stream.on('data', (c: Buffer) => chunks.push(c));
  stream.on('end', () => cb(null, Buffer.concat(chunks)));
}

/** The reply as text to search: the bytes as latin1, and a PDF's extracted text too. */
export async function replyText(res: Response): Promise<string> {
  const bytes = Buffer.isBuffer(res.body) ? (res.body as Buffer) : Buffer.from(res.text ?? '');
  let text = bytes.toString('latin1');
  if ((res.headers['content-type'] ?? '').includes('application/pdf') && res.status === 200) text += `\n${(await pdfText(bytes)).text}`;
  return text;
}

/** Health answers in the text of performers whose health details the reader may not see. */
export function medicalLeaks(text: string, texts: readonly MedicalText[], mayRead: (performerId: string) => boolean): string[] {
  const leaks = texts.filter((m) => !mayRead(m.performerId) && text.includes(m.text)).map((m) => m.text);
  if (MEDICAL_ANSWER_PATTERN.test(text) && texts.some((m) => !mayRead(m.performerId))) leaks.push('an answer marked medical');
  return leaks;
}
