// Signing on the department's tablet: the lock, the hand-back and what a lent session may reach.
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { SigningFormSchema } from '#shared/schemas/consents.ts';
import { idp, linkRequest, performerId, production, signature, t, templateId, useConsentApp } from './setup.ts';

useConsentApp({ idp: true });

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
