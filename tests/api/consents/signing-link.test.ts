// Signing through a one-time link: the consent, its PDF and mail, retries, and refusals.
import { createHash, randomUUID } from 'node:crypto';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { SigningFormSchema } from '#shared/schemas/consents.ts';
import { openBytes, openJson } from '../../../api/crypto/medical.ts';
import { pdfText } from '../../support/pdf.ts';
import { emptySignature } from '../../support/signature.ts';
import { PATCH_ANSWERS, head, lastMailTo, linkRequest, performerId, production, signature, t, templateId, useConsentApp } from './setup.ts';

useConsentApp();

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
