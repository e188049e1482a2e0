// A signed consent: who reads its health answers, withdrawing it, and verifying its PDF.
import { createHash } from 'node:crypto';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { ConsentDetailSchema } from '#shared/schemas/consents.ts';
import { openBytes, openJson } from '../../../api/crypto/medical.ts';
import { afterResponseSettled } from '../../../api/http/after-response.ts';
import { head, lastMailTo, lead, performerId, t, useConsentApp } from './setup.ts';

useConsentApp();

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
