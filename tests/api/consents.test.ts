import { openBytes, openJson } from '../../api/crypto/medical.ts';
import { afterResponseSettled } from '../../api/http/after-response.ts';
import { createHash, randomUUID } from 'node:crypto';
import { promises as fs } from 'node:fs';
import path from 'node:path';
import { simpleParser, type ParsedMail } from 'mailparser';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ConsentDetailSchema, SigningFormSchema, TemplateListSchema } from '#shared/schemas/consents.ts';
import { type RunningIdp, startIdp } from '../../fake-idp/server.ts';
import { createTestApp, type TestApp } from '../support/app.ts';
import { pdfText } from '../support/pdf.ts';
import { drawnSignature, emptySignature } from '../support/signature.ts';

let t: TestApp;
let idp: RunningIdp;
let head: string;
let lead: string;
let production: string;
let signature: string;

beforeAll(async () => {
  idp = await startIdp({ port: 0, quiet: true, clients: [{ clientId: 'plinth', clientSecret: 'plinth-dev-secret', redirectUris: ['http://127.0.0.1:3999/api/auth/callback'], postLogoutRedirectUris: ['http://127.0.0.1:3999/'] }] });
  t = await createTestApp({ OIDC_ISSUER: idp.issuer });
  head = await t.sessionFor('head@plinth.test');
  lead = await t.sessionFor('lead@plinth.test');
  production = (await t.db.db.selectFrom('productions').select('id').where('name', '=', 'The Lantern Keeper').executeTakeFirstOrThrow()).id;
  signature = await drawnSignature();
});
afterAll(async () => {
  await t?.close();
  await idp?.close();
});

async function performerId(legalName: string): Promise<string> {
  return (await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', legalName).executeTakeFirstOrThrow()).id;
}
async function templateId(kind: string): Promise<string> {
  // The seeded template of that kind (tests add others later).
  return (await t.db.db.selectFrom('consent_templates').select('id').where('kind', '=', kind as never).orderBy('created_at').orderBy('id').executeTakeFirstOrThrow()).id;
}
async function mails(): Promise<ParsedMail[]> {
  const files = (await fs.readdir(t.mail.dir)).filter((f) => f.endsWith('.eml')).sort();
  return Promise.all(files.map(async (f) => simpleParser(await fs.readFile(path.join(t.mail.dir, f)))));
}
async function lastMailTo(address: string): Promise<ParsedMail> {
  const all = (await mails()).filter((m) => (m.to && 'text' in m.to ? m.to.text : '').includes(address));
  expect(all.length).toBeGreaterThan(0);
  return all.at(-1)!;
}

async function linkRequest(legalName: string, kind: string): Promise<{ token: string; requestId: string; email: string }> {
  const pid = await performerId(legalName);
  const res = await request(t.app).post('/api/signing-requests').set('Cookie', head).send({ performerId: pid, templateId: await templateId(kind), productionId: production, mode: 'link' });
  expect(res.status).toBe(201);
  const email = res.body.sentTo as string;
  const mail = await lastMailTo(email);
  const token = /\/sign\/([A-Za-z0-9_-]{40,60})/.exec(mail.text ?? '')?.[1];
  expect(token).toBeTruthy();
  return { token: token!, requestId: res.body.id, email };
}

const PATCH_ANSWERS = { known_allergies: 'Reacted to a fragranced remover in 2024', skin_condition: false, medication: false, sun: false, photos_ok: true };

describe('consent templates', () => {
  it('seeds one original template of each kind', async () => {
    const res = await request(t.app).get('/api/consent-templates').set('Cookie', head);
    const list = TemplateListSchema.parse(res.body);
    expect(list.items.map((x) => x.kind).sort()).toEqual(['application', 'cast_storage', 'health_data', 'life_casting', 'patch_testing']);
    const life = list.items.find((x) => x.kind === 'life_casting')!;
    // The life-casting form covers each safety point the department must raise.
    for (const phrase of [/nostrils/i, /stop signal/i, /claustrophobia/i, /brows/i, /contact lenses/i, /plaster.*(warm|heat)/is]) expect(life.body).toMatch(phrase);
    const storage = list.items.find((x) => x.kind === 'cast_storage')!;
    for (const phrase of [/own/i, /five years|how long/i, /return to you or destruction/i]) expect(storage.body).toMatch(phrase);
  });

  it('editing publishes a new version and refuses an edit made on a stale version', async () => {
    const created = await request(t.app).post('/api/consent-templates').set('Cookie', head).send({
      kind: 'application', title: 'Extra application form', body: 'A body that is long enough to be a consent text.', questions: [{ id: 'ok', type: 'yes_no', label: 'All fine?', medical: false, required: true }], validityDays: 30,
    });
    expect(created.status).toBe(201);
    expect(created.body.version).toBe(1);
    const edit = { kind: 'application', title: 'Extra application form (rev)', body: 'A revised body that is long enough to be a consent text.', questions: [], validityDays: 60 };
    const v2 = await request(t.app).put(`/api/consent-templates/${created.body.id}`).set('Cookie', head).send({ ...edit, version: 1 });
    expect(v2.status).toBe(200);
    expect(v2.body.version).toBe(2);
    const stale = await request(t.app).put(`/api/consent-templates/${created.body.id}`).set('Cookie', lead).send({ ...edit, title: 'Lost edit', version: 1 });
    expect(stale.status).toBe(409);
    const versions = await request(t.app).get(`/api/consent-templates/${created.body.id}/versions`).set('Cookie', head);
    expect(versions.body.items.map((v: { version: number }) => v.version)).toEqual([2, 1]);
  });

  it('refuses a questionnaire with duplicate ids or a choice without options', async () => {
    const res = await request(t.app).post('/api/consent-templates').set('Cookie', head).send({
      kind: 'application', title: 'Bad', body: 'A body that is long enough to be a consent text.', validityDays: null,
      questions: [{ id: 'a', type: 'choice', label: 'Pick', medical: false, required: true, options: ['one'] }, { id: 'a', type: 'yes_no', label: 'Again', medical: false, required: false }],
    });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.details.fields)).toEqual(expect.arrayContaining(['questions.0.options', 'questions']));
  });
});

describe('signing through a one-time link', () => {
  it('signs, freezes the text, stores a PDF whose hashes check out, and e-mails the performer a copy', async () => {
    const { token, email } = await linkRequest('Halvard Imre Solberg', 'patch_testing');
    const form = SigningFormSchema.parse((await request(t.app).get(`/api/signing/${token}`)).body);
    expect(form.performerName).toBe('Halvard Imre Solberg');
    expect(form.template.kind).toBe('patch_testing');

    const res = await request(t.app)
      .post(`/api/signing/${token}`)
      .set('User-Agent', 'PlinthTest/1.0 (tablet)')
      .send({ templateVersionId: form.template.versionId, idempotencyKey: randomUUID(), signerName: 'Halvard Imre Solberg', agreed: true, answers: PATCH_ANSWERS, signaturePng: signature });
    expect(res.status).toBe(201);
    expect(res.body.duplicate).toBe(false);
    expect(res.body.emailedTo).toBe(email);
    const consent = await t.db.db.selectFrom('consents').selectAll().where('id', '=', res.body.consentId).executeTakeFirstOrThrow();
    expect(consent.template_version_id).toBe(form.template.versionId);
    expect(consent.signing_method).toBe('link');
    expect(consent.user_agent).toBe('PlinthTest/1.0 (tablet)');
    expect(consent.ip).toMatch(/127\.0\.0\.1/);
    // Server time, not the client's: within a few seconds of now.
    expect(Math.abs(new Date(consent.signed_at).getTime() - Date.now())).toBeLessThan(10_000);
    // Validity from the template: 365 days.
    expect(Math.round((consent.expires_at!.getTime() - new Date(consent.signed_at).getTime()) / 86_400_000)).toBe(365);

    const answers = await t.db.db.selectFrom('consent_answers').selectAll().where('consent_id', '=', consent.id).execute();
    // Health answers are sealed at rest: no plain text in the row, the answer once opened with the key.
    const allergy = answers.find((a) => a.question_id === 'known_allergies')!;
    expect(allergy.medical).toBe(true);
    expect(JSON.stringify(allergy.answer)).not.toContain(PATCH_ANSWERS.known_allergies);
    expect(openJson(allergy.answer)).toBe(PATCH_ANSWERS.known_allergies);
    expect(answers.find((a) => a.question_id === 'photos_ok')).toMatchObject({ medical: false, answer: true });

    // The stored PDF: its SHA-256 (computed here with node:crypto) is the one on record.
    const pdfRow = await t.db.db.selectFrom('files').selectAll().where('id', '=', consent.pdf_file_id).executeTakeFirstOrThrow();
    const onDisk = await t.storedBytes(pdfRow.storage_path);
    // It carries health answers, so the bytes on disk are sealed; opened, they are the PDF on record.
    expect(onDisk.subarray(0, 5).toString()).not.toBe('%PDF-');
    const pdf = openBytes(onDisk);
    expect(createHash('sha256').update(pdf).digest('hex')).toBe(consent.pdf_sha256);
    // Read back with pdf.js, an independent PDF reader: text, answers and the footer hash are in it.
    const parsed = await pdfText(pdf);
    const flat = parsed.text.replace(/\s+/g, ' ');
    expect(flat).toContain('Consent to skin patch testing');
    expect(flat).toContain('not a medical diagnosis');
    expect(flat).toContain(PATCH_ANSWERS.known_allergies);
    expect(flat).toContain('Printed name: Halvard Imre Solberg');
    const signedAt = new Date(consent.signed_at);
    expect(flat).toContain(signedAt.toISOString());
    // The same moment in words on the studio's clock; Intl.DateTimeFormat (an independent formatter) gives each part.
    const part = (o: Intl.DateTimeFormatOptions) => new Intl.DateTimeFormat('en-GB', { timeZone: t.config.timeZone, ...o }).format(signedAt);
    expect(flat).toContain(`Signed: ${part({ weekday: 'long' })} ${part({ day: 'numeric' })} ${part({ month: 'long' })} ${part({ year: 'numeric' })} at ${part({ hour: '2-digit', minute: '2-digit', hourCycle: 'h23' })}`);
    expect(parsed.text.replace(/\s+/g, '')).toContain(consent.content_sha256);
    expect(consent.content_sha256).toMatch(/^[0-9a-f]{64}$/);

    // The copy e-mailed to the performer carries the same PDF.
    const mail = await lastMailTo(email);
    expect(mail.subject).toBe('Your signed consent: Consent to skin patch testing (The Lantern Keeper)');
    const att = mail.attachments.find((a) => a.contentType === 'application/pdf')!;
    expect(att.filename).toBe(`consent-${consent.id}.pdf`);
    expect(createHash('sha256').update(att.content).digest('hex')).toBe(consent.pdf_sha256);

    // One-time: the link no longer opens the form or accepts a second signing.
    expect((await request(t.app).get(`/api/signing/${token}`)).status).toBe(409);
    const again = await request(t.app).post(`/api/signing/${token}`).send({ templateVersionId: form.template.versionId, idempotencyKey: randomUUID(), signerName: 'Halvard Imre Solberg', agreed: true, answers: PATCH_ANSWERS, signaturePng: signature });
    expect(again.status).toBe(409);
  });

  it('a double tap or a retry with the same key makes one consent, not two', async () => {
    const { token } = await linkRequest('Oswin Parfitt-Reyes', 'life_casting');
    const form = SigningFormSchema.parse((await request(t.app).get(`/api/signing/${token}`)).body);
    const body = { templateVersionId: form.template.versionId, idempotencyKey: randomUUID(), signerName: 'Oswin Parfitt-Reyes', agreed: true, answers: { area: 'Face', stop_signal: 'Tap the chair twice', claustrophobia: false, breathing: false, contact_lenses: true }, signaturePng: signature };
    const [a, b] = await Promise.all([request(t.app).post(`/api/signing/${token}`).send(body), request(t.app).post(`/api/signing/${token}`).send(body)]);
    expect([a.status, b.status]).toEqual([201, 201]);
    expect(a.body.consentId).toBe(b.body.consentId);
    expect([a.body.duplicate, b.body.duplicate].sort()).toEqual([false, true]);
    const retry = await request(t.app).post(`/api/signing/${token}`).send(body);
    expect(retry.status).toBe(201);
    expect(retry.body).toMatchObject({ consentId: a.body.consentId, duplicate: true });
    const count = await t.db.db.selectFrom('consents').select((eb) => eb.fn.countAll<string>().as('n')).where('idempotency_key', '=', body.idempotencyKey).executeTakeFirstOrThrow();
    expect(Number(count.n)).toBe(1);
  });

  it('a template edited while the performer is signing: they sign the version they saw', async () => {
    const { token } = await linkRequest('Corentin Malik Ashdown', 'application');
    const form = SigningFormSchema.parse((await request(t.app).get(`/api/signing/${token}`)).body);
    const tid = await templateId('application');
    const current = (await request(t.app).get(`/api/consent-templates/${tid}`).set('Cookie', head)).body;
    const edited = await request(t.app).put(`/api/consent-templates/${tid}`).set('Cookie', head).send({ kind: 'application', title: current.title, body: `${current.body}\n\nA new paragraph added later.`, questions: current.questions, validityDays: current.validityDays, version: current.version });
    expect(edited.status).toBe(200);
    const res = await request(t.app).post(`/api/signing/${token}`).send({ templateVersionId: form.template.versionId, idempotencyKey: randomUUID(), signerName: 'Cory Ashdown', agreed: true, answers: { wear_hours: 'Up to 4 hours' }, signaturePng: signature });
    expect(res.status).toBe(201);
    const consent = await t.db.db.selectFrom('consents').select('template_version_id').where('id', '=', res.body.consentId).executeTakeFirstOrThrow();
    expect(consent.template_version_id).toBe(form.template.versionId);
    expect(consent.template_version_id).not.toBe(edited.body.versionId);
  });

  it('names every problem and saves nothing: empty signature, unticked agreement, missing answers, no name', async () => {
    const { token, requestId } = await linkRequest('Tamsin Achebe-Lowry', 'patch_testing');
    const form = SigningFormSchema.parse((await request(t.app).get(`/api/signing/${token}`)).body);
    const base = { templateVersionId: form.template.versionId, idempotencyKey: randomUUID(), signerName: 'Tamsin Achebe-Lowry', agreed: true, answers: PATCH_ANSWERS, signaturePng: signature };
    const before = await t.db.db.selectFrom('consents').select((eb) => eb.fn.countAll<string>().as('n')).executeTakeFirstOrThrow();
    const files = await t.db.db.selectFrom('files').select((eb) => eb.fn.countAll<string>().as('n')).executeTakeFirstOrThrow();

    const empty = await request(t.app).post(`/api/signing/${token}`).send({ ...base, signaturePng: await emptySignature() });
    expect(empty.status).toBe(400);
    expect(empty.body.error.details.fields.signaturePng[0]).toMatch(/empty/);
    const unticked = await request(t.app).post(`/api/signing/${token}`).send({ ...base, agreed: false });
    expect(unticked.status).toBe(400);
    expect(unticked.body.error.details.fields.agreed).toBeDefined();
    const missing = await request(t.app).post(`/api/signing/${token}`).send({ ...base, answers: { known_allergies: '' } });
    expect(missing.status).toBe(400);
    expect(Object.keys(missing.body.error.details.fields).sort()).toEqual(['answers.medication', 'answers.photos_ok', 'answers.skin_condition', 'answers.sun']);
    const extra = await request(t.app).post(`/api/signing/${token}`).send({ ...base, answers: { ...PATCH_ANSWERS, smuggled: 'x' } });
    expect(extra.status).toBe(400);
    const noName = await request(t.app).post(`/api/signing/${token}`).send({ ...base, signerName: '' });
    expect(noName.status).toBe(400);
    expect(noName.body.error.details.fields.signerName).toBeDefined();
    const notPng = await request(t.app).post(`/api/signing/${token}`).send({ ...base, signaturePng: 'data:image/png;base64,aGVsbG8=' });
    expect(notPng.status).toBe(400);

    const after = await t.db.db.selectFrom('consents').select((eb) => eb.fn.countAll<string>().as('n')).executeTakeFirstOrThrow();
    const filesAfter = await t.db.db.selectFrom('files').select((eb) => eb.fn.countAll<string>().as('n')).executeTakeFirstOrThrow();
    expect(after.n).toBe(before.n);
    expect(filesAfter.n).toBe(files.n);
    const req = await t.db.db.selectFrom('signing_requests').select('status').where('id', '=', requestId).executeTakeFirstOrThrow();
    expect(req.status).toBe('open');
  });

  it('an expired link, a cancelled one and a made-up one each get a clear answer', async () => {
    const { token, requestId } = await linkRequest('Beatrix Nwachukwu', 'life_casting');
    await t.db.db.updateTable('signing_requests').set({ expires_at: new Date(Date.now() - 1000) }).where('id', '=', requestId).execute();
    const expired = await request(t.app).get(`/api/signing/${token}`);
    expect(expired.status).toBe(409);
    expect(expired.body.error.message).toMatch(/expired/);
    expect(expired.body.error.details.reason).toBe('expired');
    const second = await linkRequest('Beatrix Nwachukwu', 'life_casting');
    expect((await request(t.app).post(`/api/signing-requests/${second.requestId}/cancel`).set('Cookie', head)).status).toBe(200);
    const cancelled = await request(t.app).get(`/api/signing/${second.token}`);
    expect(cancelled.status).toBe(404);
    expect(cancelled.body.error.details.reason).toBe('cancelled');
    expect((await request(t.app).get(`/api/signing/${'x'.repeat(43)}`)).status).toBe(404);
    expect((await request(t.app).get('/api/signing/short')).status).toBe(400);
  });

  it('refuses a link for a performer with no e-mail address', async () => {
    const pid = await performerId('Halvard Imre Solberg');
    await t.db.db.updateTable('performers').set({ email: null }).where('id', '=', pid).execute();
    try {
      const res = await request(t.app).post('/api/signing-requests').set('Cookie', head).send({ performerId: pid, templateId: await templateId('application'), productionId: production, mode: 'link' });
      expect(res.status).toBe(400);
      expect(res.body.error.details.fields.mode[0]).toMatch(/no e-mail/);
    } finally {
      await t.db.db.updateTable('performers').set({ email: 'h.solberg@example.test' }).where('id', '=', pid).execute();
    }
  });
});

describe('signing on the tablet', () => {
  it('locks the session to one form, then to a hand-back screen that needs the staff member to sign in again', async () => {
    const cookie = await t.sessionFor('head@plinth.test');
    const pid = await performerId('Tamsin Achebe-Lowry');
    const created = await request(t.app).post('/api/signing-requests').set('Cookie', cookie).send({ performerId: pid, templateId: await templateId('health_data'), productionId: production, mode: 'tablet' });
    expect(created.status).toBe(201);
    const handOver = await request(t.app).post(`/api/signing-requests/${created.body.id}/hand-over`).set('Cookie', cookie);
    expect(handOver.status).toBe(200);
    // The browser goes through the identity provider's sign-out before the form.
    const out = new URL(handOver.body.redirectTo);
    expect(out.origin).toBe(idp.issuer);
    expect(out.searchParams.get('post_logout_redirect_uri')).toBe('http://127.0.0.1:3999/');

    // While lent, the session reaches no staff data at all.
    for (const p of ['/api/session', `/api/consents?performerId=${pid}`, '/api/consent-templates', `/api/bookings?productionId=${production}`]) {
      const r = await request(t.app).get(p).set('Cookie', cookie);
      expect(r.status, p).toBe(401);
      expect(r.body.error.details.tablet).toBe('signing');
    }
    const tablet = await request(t.app).get('/api/tablet').set('Cookie', cookie);
    expect(tablet.body.phase).toBe('signing');
    const form = SigningFormSchema.parse(tablet.body.form);
    const submit = await request(t.app).post('/api/tablet/submit').set('Cookie', cookie).send({ templateVersionId: form.template.versionId, idempotencyKey: tablet.body.idempotencyKey, signerName: 'Tamsin Achebe-Lowry', agreed: true, answers: { share_with_medic: true }, signaturePng: signature });
    expect(submit.status).toBe(201);
    const consent = await t.db.db.selectFrom('consents').select(['signing_method', 'staff_user_id']).where('id', '=', submit.body.consentId).executeTakeFirstOrThrow();
    expect(consent.signing_method).toBe('tablet');
    expect(consent.staff_user_id).toBe(await t.userId('head@plinth.test'));

    const after = await request(t.app).get('/api/tablet').set('Cookie', cookie);
    expect(after.body).toEqual({ phase: 'handback', form: null, idempotencyKey: null });
    expect((await request(t.app).get('/api/session').set('Cookie', cookie)).body.error.details.tablet).toBe('handback');
    // Leaving needs credentials: the identity provider is told to ask for them again.
    const login = await request(t.app).get('/api/auth/login').set('Cookie', cookie);
    expect(login.status).toBe(302);
    const url = new URL(login.headers.location as string);
    expect(url.searchParams.get('prompt')).toBe('login');
    expect(url.searchParams.get('max_age')).toBe('0');
    // An ordinary sign-in does not force it.
    const plain = new URL((await request(t.app).get('/api/auth/login')).headers.location as string);
    expect(plain.searchParams.get('prompt')).toBeNull();
  });

  it('a tablet request cannot be opened through a link, nor a link request handed over', async () => {
    const { requestId } = await linkRequest('Corentin Malik Ashdown', 'health_data');
    const res = await request(t.app).post(`/api/signing-requests/${requestId}/hand-over`).set('Cookie', await t.sessionFor('head@plinth.test'));
    expect(res.status).toBe(400);
  });
});

describe('health answers stay with the designated lead and the performer', () => {
  const MEDICAL = 'Sticking plasters make my skin itch';
  async function junoPatchConsent(): Promise<string> {
    const pid = await performerId('Juno Castellane');
    return (await t.db.db.selectFrom('consents').select('id').where('performer_id', '=', pid).where('kind', '=', 'patch_testing').executeTakeFirstOrThrow()).id;
  }

  it('the lead sees them and the read is written to the audit log', async () => {
    const id = await junoPatchConsent();
    const res = await request(t.app).get(`/api/consents/${id}`).set('Cookie', lead);
    expect(res.status).toBe(200);
    const detail = ConsentDetailSchema.parse(res.body);
    expect(detail.answers.find((a) => a.questionId === 'known_allergies')?.answer).toBe(MEDICAL);
    expect(detail.medicalWithheld).toBe(false);
    const audit = await t.db.db.selectFrom('audit_log').selectAll().where('action', '=', 'medical.read').where('entity_id', '=', id).execute();
    expect(audit.length).toBeGreaterThanOrEqual(1);
    expect(audit.at(-1)!.actor_user_id).toBe(await t.userId('lead@plinth.test'));
    expect((await request(t.app).get(`/api/consents/${id}/pdf`).set('Cookie', lead)).status).toBe(200);
  });

  it('the performer sees their own', async () => {
    const id = await junoPatchConsent();
    const res = await request(t.app).get(`/api/consents/${id}`).set('Cookie', await t.sessionFor('performer@plinth.test'));
    expect(res.status).toBe(200);
    expect(JSON.stringify(res.body)).toContain(MEDICAL);
  });

  for (const email of ['head@plinth.test', 'artist@plinth.test', 'archivist@plinth.test', 'artist2@plinth.test']) {
    it(`${email} gets the consent without them, and not the PDF`, async () => {
      const id = await junoPatchConsent();
      const cookie = await t.sessionFor(email);
      const res = await request(t.app).get(`/api/consents/${id}`).set('Cookie', cookie);
      if (res.status === 200) {
        expect(JSON.stringify(res.body)).not.toContain(MEDICAL);
        expect(res.body.medicalWithheld).toBe(true);
        expect(res.body.answers.every((a: { medical: boolean }) => !a.medical)).toBe(true);
        expect(res.body.canDownloadPdf).toBe(false);
      } else {
        expect(res.status).toBe(403);
      }
      expect((await request(t.app).get(`/api/consents/${id}/pdf`).set('Cookie', cookie)).status).toBe(403);
    });
  }
});

describe('withdrawal', () => {
  it('the performer withdraws their own consent in one request after seeing the consequences', async () => {
    const me = await t.sessionFor('performer@plinth.test');
    const pid = await performerId('Juno Castellane');
    const c = await t.db.db.selectFrom('consents').select(['id', 'version']).where('performer_id', '=', pid).where('kind', '=', 'cast_storage').executeTakeFirstOrThrow();
    const detail = ConsentDetailSchema.parse((await request(t.app).get(`/api/consents/${c.id}`).set('Cookie', me)).body);
    expect(detail.canWithdraw).toBe(true);
    expect(detail.consequences[0]).toMatch(/return to you or destruction/);
    const res = await request(t.app).post(`/api/consents/${c.id}/withdraw`).set('Cookie', me).send({ version: c.version, reason: 'Changed my mind' });
    expect(res.status).toBe(200);
    expect(res.body.state).toBe('withdrawn');
    const row = await t.db.db.selectFrom('consents').select(['withdrawn_via', 'withdrawal_reason']).where('id', '=', c.id).executeTakeFirstOrThrow();
    expect(row.withdrawn_via).toBe('performer');
    expect(row.withdrawal_reason).not.toContain('Changed my mind');
    expect(openJson(row.withdrawal_reason)).toBe('Changed my mind');
    expect((await lastMailTo('performer@plinth.test')).subject).toMatch(/withdrawn/);
    const again = await request(t.app).post(`/api/consents/${c.id}/withdraw`).set('Cookie', me).send({ version: c.version + 1 });
    expect(again.status).toBe(409);
  });

  it('the lead may withdraw on the performer\'s behalf; the head and artists may not', async () => {
    const pid = await performerId('Corentin Malik Ashdown');
    const c = await t.db.db.selectFrom('consents').select(['id', 'version']).where('performer_id', '=', pid).where('kind', '=', 'health_data').where('withdrawn_at', 'is', null).executeTakeFirstOrThrow();
    for (const email of ['head@plinth.test', 'artist@plinth.test', 'archivist@plinth.test', 'performer@plinth.test']) {
      const r = await request(t.app).post(`/api/consents/${c.id}/withdraw`).set('Cookie', await t.sessionFor(email)).send({ version: c.version });
      expect(r.status, email).toBe(403);
    }
    const ok = await request(t.app).post(`/api/consents/${c.id}/withdraw`).set('Cookie', lead).send({ version: c.version });
    expect(ok.status).toBe(200);
    expect((await t.db.db.selectFrom('consents').select('withdrawn_via').where('id', '=', c.id).executeTakeFirstOrThrow()).withdrawn_via).toBe('lead');
  });

  it('a performer without a sign-in asks for a link by e-mail and withdraws through it', async () => {
    const unknown = await request(t.app).post('/api/withdrawal-links').send({ email: 'nobody@example.test' });
    const known = await request(t.app).post('/api/withdrawal-links').send({ email: 'Bea.N@example.test' });
    expect(unknown.status).toBe(202);
    expect(known.status).toBe(202);
    // The same answer either way, so the form tells no one who is on record.
    expect(known.body).toEqual(unknown.body);
    // The link is made and mailed after the reply has gone.
    await afterResponseSettled();
    const mail = await lastMailTo('bea.n@example.test');
    const token = /\/withdraw\/([A-Za-z0-9_-]{40,60})/.exec(mail.text ?? '')![1]!;
    const view = await request(t.app).get(`/api/withdrawal-links/${token}`);
    expect(view.status).toBe(200);
    expect(view.body.performerName).toBe('Bea Nwachukwu');
    const active = view.body.consents.find((c: { state: string; kind: string }) => c.state === 'active' && c.kind === 'cast_storage');
    const res = await request(t.app).post(`/api/withdrawal-links/${token}/withdraw`).send({ consentId: active.id });
    expect(res.status).toBe(200);
    expect((await t.db.db.selectFrom('consents').select('withdrawn_via').where('id', '=', active.id).executeTakeFirstOrThrow()).withdrawn_via).toBe('link');
    // The performer, not "nobody", is recorded as the one who withdrew.
    const audit = await t.db.db.selectFrom('audit_log').select(['actor_performer_id', 'details']).where('action', '=', 'consent.withdraw').where('entity_id', '=', active.id).executeTakeFirstOrThrow();
    expect(audit.actor_performer_id).toBe(await performerId('Beatrix Nwachukwu'));
    // Another performer's consent cannot be reached through this link.
    const other = await t.db.db.selectFrom('consents').select('id').where('performer_id', '=', await performerId('Juno Castellane')).executeTakeFirstOrThrow();
    expect((await request(t.app).post(`/api/withdrawal-links/${token}/withdraw`).send({ consentId: other.id })).status).toBe(404);
  });
});

describe('verifying a PDF', () => {
  it('recognises an unaltered consent and rejects a one-byte change', async () => {
    const c = await t.db.db.selectFrom('consents').innerJoin('files', 'files.id', 'consents.pdf_file_id').select(['consents.id', 'files.storage_path']).executeTakeFirstOrThrow();
    const pdf = openBytes(await t.storedBytes(c.storage_path));
    const ok = await request(t.app).post('/api/consents/verify').set('Cookie', head).attach('file', pdf, 'consent.pdf');
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ match: true, consent: { id: c.id } });
    const altered = Buffer.from(pdf);
    altered[Math.floor(altered.length / 2)] = altered[Math.floor(altered.length / 2)]! ^ 0xff;
    const bad = await request(t.app).post('/api/consents/verify').set('Cookie', head).attach('file', altered, 'consent.pdf');
    expect(bad.body.match).toBe(false);
    expect(bad.body.sha256).toBe(createHash('sha256').update(altered).digest('hex'));
    expect((await request(t.app).post('/api/consents/verify').set('Cookie', await t.sessionFor('performer@plinth.test')).attach('file', pdf, 'c.pdf')).status).toBe(403);
  });
});

describe('bookings and the head\'s home', () => {
  it('flags a session whose consent is missing, and clears the flag once signed', async () => {
    const pid = await performerId('Oswin Parfitt-Reyes');
    const when = new Date(Date.now() + 10 * 86_400_000).toISOString();
    const b = await request(t.app).post('/api/bookings').set('Cookie', head).send({ performerId: pid, productionId: production, purpose: 'application', startsAt: when, location: 'Room 3' });
    expect(b.status).toBe(201);
    // Oswin's application consent expired long ago.
    expect(b.body.consentMissing).toBe(true);
    const home = await request(t.app).get('/api/home').set('Cookie', head);
    const task = home.body.tasks.find((x: { id: string }) => x.id === 'bookings-missing-consent');
    const upcoming = (await request(t.app).get(`/api/bookings?productionId=${production}`).set('Cookie', head)).body.items as { consentMissing: boolean; startsAt: string }[];
    // Every upcoming session waiting for consent is counted, however far ahead, until it is signed.
    expect(task.count).toBe(upcoming.filter((x) => x.consentMissing).length);
    expect(task.count).toBeGreaterThanOrEqual(1);
    expect(task.items.map((i: { label: string }) => i.label)).toContain('Oz Parfitt');
    const expiring = home.body.tasks.find((x: { id: string }) => x.id === 'consents-expiring');
    // Tamsin's patch-test consent (signed 355 days ago, valid 365) expires within 30 days.
    expect(expiring.count).toBeGreaterThanOrEqual(1);

    const { token } = await linkRequest('Oswin Parfitt-Reyes', 'application');
    const form = SigningFormSchema.parse((await request(t.app).get(`/api/signing/${token}`)).body);
    const signed = await request(t.app).post(`/api/signing/${token}`).send({ templateVersionId: form.template.versionId, idempotencyKey: randomUUID(), signerName: 'Oswin Parfitt-Reyes', agreed: true, answers: { wear_hours: 'Up to 8 hours' }, signaturePng: signature });
    expect(signed.status, JSON.stringify(signed.body)).toBe(201);
    const list = await request(t.app).get(`/api/bookings?productionId=${production}&performerId=${pid}`).set('Cookie', head);
    expect(list.body.items.find((x: { id: string }) => x.id === b.body.id).consentMissing).toBe(false);
  });

  it('only the head or lead books; artists get 403', async () => {
    const pid = await performerId('Juno Castellane');
    const res = await request(t.app).post('/api/bookings').set('Cookie', await t.sessionFor('artist@plinth.test')).send({ performerId: pid, productionId: production, purpose: 'application', startsAt: new Date(Date.now() + 86_400_000).toISOString() });
    expect(res.status).toBe(403);
  });
});
