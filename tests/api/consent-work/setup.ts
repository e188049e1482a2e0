// Shared set-up of the tests of consent work around the signing: bundles, withdrawals reaching the
// staff, the staff-safe copy, the gate on booking and the lead's worklist.
import { promises as fs } from 'node:fs';
import path from 'node:path';
import { simpleParser, type ParsedMail } from 'mailparser';
import request from 'supertest';
import { afterAll, beforeAll, beforeEach, expect } from 'vitest';
import { createTestApp, type TestApp } from '../../support/app.ts';
import { drawnSignature } from '../../support/signature.ts';
import { productionId, sessions, type Who } from '../../fixtures/performers.ts';
import { snapshotData } from '../../fixtures/snapshot.ts';

export let t: TestApp;
export let as: Record<Who, string>;
export let lantern: string;
export let signature: string;
let restore: () => Promise<void>;

/** The real app on one database for the file, with the demo data (and caught mail) put back before every test. */
export function useConsentWorkApp(): void {
  beforeAll(async () => {
    t = await createTestApp();
    as = await sessions(t);
    restore = await snapshotData(t);
    signature = await drawnSignature();
  });
  beforeEach(async () => {
    await restore();
    for (const f of await fs.readdir(t.mail.dir)) if (f.endsWith('.eml')) await fs.rm(path.join(t.mail.dir, f));
    lantern = await productionId(t, 'The Lantern Keeper');
  });
  afterAll(async () => {
    await t?.close();
  });
}

export const api = () => request(t.app);

export async function performerId(legalName: string): Promise<string> {
  return (await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', legalName).executeTakeFirstOrThrow()).id;
}

/** The seeded form of that kind. */
export async function templateId(kind: string): Promise<string> {
  return (await t.db.db.selectFrom('consent_templates').select('id').where('kind', '=', kind as never).orderBy('created_at').orderBy('id').executeTakeFirstOrThrow()).id;
}

export async function mails(): Promise<ParsedMail[]> {
  const files = (await fs.readdir(t.mail.dir)).filter((f) => f.endsWith('.eml')).sort();
  return Promise.all(files.map(async (f) => simpleParser(await fs.readFile(path.join(t.mail.dir, f)))));
}

export function recipients(m: ParsedMail): string {
  return m.to && 'text' in m.to ? m.to.text : '';
}

export async function mailsTo(address: string): Promise<ParsedMail[]> {
  return (await mails()).filter((m) => recipients(m).includes(address));
}

export async function lastMailTo(address: string): Promise<ParsedMail> {
  const all = await mailsTo(address);
  expect(all.length, `mail to ${address}`).toBeGreaterThan(0);
  return all.at(-1)!;
}

/** Answers each seeded form accepts (the demo seed answers the same). */
export const ANSWERS: Record<string, Record<string, boolean | string>> = {
  life_casting: { area: 'Face', stop_signal: 'Raise the right hand', claustrophobia: false, breathing: false, contact_lenses: true },
  patch_testing: { known_allergies: '', skin_condition: false, medication: false, sun: false, photos_ok: true },
  application: { wear_hours: 'Up to 8 hours' },
  cast_storage: { end_choice: 'Ask me at the time', portfolio_photos: true },
  health_data: { share_with_medic: true },
};

export function submission(form: { template: { versionId: string; kind: string } }, idempotencyKey: string, signerName: string, answers?: Record<string, boolean | string>) {
  return { templateVersionId: form.template.versionId, idempotencyKey, signerName, agreed: true, answers: answers ?? ANSWERS[form.template.kind], signaturePng: signature };
}
