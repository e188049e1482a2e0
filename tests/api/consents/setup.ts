// Shared set-up of the consent API tests, one file per endpoint.
import { promises as fs } from 'node:fs';
import path from 'node:path';
import { simpleParser, type ParsedMail } from 'mailparser';
import request from 'supertest';
import { afterAll, beforeAll, expect } from 'vitest';
import { type RunningIdp, startIdp } from '../../../fake-idp/server.ts';
import { createTestApp, type TestApp } from '../../support/app.ts';
import { drawnSignature } from '../../support/signature.ts';

// Live bindings: each test file calls useConsentApp() and reads these once the hooks have run.
export let t: TestApp;
/** Only with `{ idp: true }`: the identity provider the tablet's sign-outs go through. */
export let idp: RunningIdp;
export let head: string;
export let lead: string;
/** The Lantern Keeper, the production the requests are made on. */
export let production: string;
/** A drawn signature, as the pad sends it. */
export let signature: string;

/** The real app on one database for the file (changes carry from test to test within it). */
export function useConsentApp(opts: { idp?: boolean } = {}): void {
  beforeAll(async () => {
    if (opts.idp) {
      idp = await startIdp({ port: 0, quiet: true, clients: [{ clientId: 'plinth', clientSecret: 'plinth-dev-secret', redirectUris: ['http://127.0.0.1:3999/api/auth/callback'], postLogoutRedirectUris: ['http://127.0.0.1:3999/'] }] });
    }
    t = await createTestApp(opts.idp ? { OIDC_ISSUER: idp.issuer } : {});
    head = await t.sessionFor('head@plinth.test');
    lead = await t.sessionFor('lead@plinth.test');
    production = (await t.db.db.selectFrom('productions').select('id').where('name', '=', 'The Lantern Keeper').executeTakeFirstOrThrow()).id;
    signature = await drawnSignature();
  });
  afterAll(async () => {
    await t?.close();
    await idp?.close();
  });
}

export async function performerId(legalName: string): Promise<string> {
  return (await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', legalName).executeTakeFirstOrThrow()).id;
}

export async function templateId(kind: string): Promise<string> {
  // The seeded template of that kind (tests add others later).
  return (await t.db.db.selectFrom('consent_templates').select('id').where('kind', '=', kind as never).orderBy('created_at').orderBy('id').executeTakeFirstOrThrow()).id;
}

async function mails(): Promise<ParsedMail[]> {
  const files = (await fs.readdir(t.mail.dir)).filter((f) => f.endsWith('.eml')).sort();
  return Promise.all(files.map(async (f) => simpleParser(await fs.readFile(path.join(t.mail.dir, f)))));
}

export async function lastMailTo(address: string): Promise<ParsedMail> {
  const all = (await mails()).filter((m) => (m.to && 'text' in m.to ? m.to.text : '').includes(address));
  expect(all.length).toBeGreaterThan(0);
  return all.at(-1)!;
}

/** The head sends a one-time signing link; the token is read from the mail the performer gets. */
export async function linkRequest(legalName: string, kind: string): Promise<{ token: string; requestId: string; email: string }> {
  const pid = await performerId(legalName);
  const res = await request(t.app).post('/api/signing-requests').set('Cookie', head).send({ performerId: pid, templateId: await templateId(kind), productionId: production, mode: 'link' });
  expect(res.status).toBe(201);
  const email = res.body.sentTo as string;
  const mail = await lastMailTo(email);
  const token = /\/sign\/([A-Za-z0-9_-]{40,60})/.exec(mail.text ?? '')?.[1];
  expect(token).toBeTruthy();
  return { token: token!, requestId: res.body.id, email };
}

/** Answers to the seeded patch-testing questionnaire. */
export const PATCH_ANSWERS = { known_allergies: 'Reacted to a fragranced remover in 2024', skin_condition: false, medication: false, sun: false, photos_ok: true };
