import { createHash, randomUUID } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { SigningFormSchema } from '#shared/schemas/consents.ts';
import { pdfText } from '../../support/pdf.ts';
import { api, as, lantern, lastMailTo, performerId, submission, t, templateId, useConsentWorkApp } from './setup.ts';

useConsentWorkApp();

const ALLERGY = 'Reacted to a fragranced remover in 2024';

const pdfBody = (r: import('supertest').Test) =>
  r.buffer(true).parse((res, cb) => {
    const chunks: Buffer[] = [];
    res.on('data', (c: Buffer) => chunks.push(c));
    res.on('end', () => cb(null, Buffer.concat(chunks)));
  });

/** Halvard signs the patch-testing form through a link, with a health answer. */
async function signedWithHealthAnswer(): Promise<string> {
  const pid = await performerId('Halvard Imre Solberg');
  await api().post('/api/signing-requests').set('Cookie', as.head).send({ performerId: pid, templateId: await templateId('patch_testing'), productionId: lantern, mode: 'link' }).expect(201);
  const token = /\/sign\/([A-Za-z0-9_-]{40,60})/.exec((await lastMailTo('h.solberg@example.test')).text ?? '')![1]!;
  const form = SigningFormSchema.parse((await api().get(`/api/signing/${token}`)).body);
  const answers = { known_allergies: ALLERGY, skin_condition: false, medication: false, sun: false, photos_ok: true };
  const res = await api().post(`/api/signing/${token}`).send(submission(form, randomUUID(), 'Halvard Imre Solberg', answers));
  expect(res.status).toBe(201);
  return res.body.consentId as string;
}

describe('the staff copy of a consent', () => {
  it('has the same text, signer and content hash as the full copy, and no health answer (read back with pdf.js)', async () => {
    const id = await signedWithHealthAnswer();
    const row = await t.db.db.selectFrom('consents').select(['content_sha256']).where('id', '=', id).executeTakeFirstOrThrow();

    // The head may not have the full copy, but has the staff copy.
    expect((await api().get(`/api/consents/${id}/pdf`).set('Cookie', as.head)).status).toBe(403);
    const staff = await pdfBody(api().get(`/api/consents/${id}/staff-pdf`).set('Cookie', as.head));
    expect(staff.status).toBe(200);
    expect(staff.headers['content-type']).toContain('application/pdf');
    const staffText = (await pdfText(staff.body as Buffer)).text.replace(/\s+/g, ' ');
    // Kept from its first request, by its fingerprint.
    const kept = await t.db.db.selectFrom('consents').select('staff_pdf_sha256').where('id', '=', id).executeTakeFirstOrThrow();
    expect(kept.staff_pdf_sha256).toBe(createHash('sha256').update(staff.body as Buffer).digest('hex'));
    const full = await pdfBody(api().get(`/api/consents/${id}/pdf`).set('Cookie', as.lead));
    expect(full.status).toBe(200);
    const fullText = (await pdfText(full.body as Buffer)).text.replace(/\s+/g, ' ');

    // The check can fail: the full copy holds the answer.
    expect(fullText).toContain(ALLERGY);
    expect(staffText).not.toContain(ALLERGY);
    expect(staffText).toMatch(/health answers are withheld/i);
    for (const same of ['Halvard Imre Solberg', row.content_sha256, 'Printed name:']) {
      expect(fullText).toContain(same);
      expect(staffText).toContain(same);
    }
    // A question that is not a health detail keeps its answer in the staff copy.
    expect(staffText).toContain('Withheld from the staff copy');
  });

  it('verify recognises both files, and says which one it was given', async () => {
    const id = await signedWithHealthAnswer();
    const staff = (await pdfBody(api().get(`/api/consents/${id}/staff-pdf`).set('Cookie', as.head))).body as Buffer;
    const full = (await pdfBody(api().get(`/api/consents/${id}/pdf`).set('Cookie', as.lead))).body as Buffer;
    const a = await api().post('/api/consents/verify').set('Cookie', as.head).attach('file', staff, 'staff.pdf');
    expect(a.body).toMatchObject({ match: true, copy: 'staff', consent: { id } });
    const b = await api().post('/api/consents/verify').set('Cookie', as.head).attach('file', full, 'full.pdf');
    expect(b.body).toMatchObject({ match: true, copy: 'full', consent: { id } });
    const altered = Buffer.from(staff);
    altered[Math.floor(altered.length / 2)] = altered[Math.floor(altered.length / 2)]! ^ 0xff;
    expect((await api().post('/api/consents/verify').set('Cookie', as.head).attach('file', altered, 'x.pdf')).body.match).toBe(false);
  });

  it('is rendered on first request, then kept and recognised: the same bytes for everyone after', async () => {
    const juno = await performerId('Juno Castellane');
    const c = await t.db.db.selectFrom('consents').select(['id', 'staff_pdf_file_id']).where('performer_id', '=', juno).where('kind', '=', 'patch_testing').executeTakeFirstOrThrow();
    expect(c.staff_pdf_file_id).toBeNull();
    const first = await pdfBody(api().get(`/api/consents/${c.id}/staff-pdf`).set('Cookie', as.head));
    expect(first.status).toBe(200);
    expect((await pdfText(first.body as Buffer)).text).not.toContain('Sticking plasters make my skin itch');
    const second = await pdfBody(api().get(`/api/consents/${c.id}/staff-pdf`).set('Cookie', as.artist));
    expect(Buffer.compare(first.body as Buffer, second.body as Buffer)).toBe(0);
    expect((await api().post('/api/consents/verify').set('Cookie', as.head).attach('file', first.body as Buffer, 's.pdf')).body).toMatchObject({ match: true, copy: 'staff' });
  });

  it('is refused to someone who may not see the consent', async () => {
    const id = await signedWithHealthAnswer();
    expect((await api().get(`/api/consents/${id}/staff-pdf`).set('Cookie', as.norole)).status).toBe(403);
    expect((await api().get(`/api/consents/${randomUUID()}/staff-pdf`).set('Cookie', as.head)).status).toBe(404);
  });
});
