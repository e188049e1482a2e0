// Sessions booked against consent: the missing-consent flag and the head's home.
import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { SigningFormSchema } from '#shared/schemas/consents.ts';
import { head, linkRequest, performerId, production, signature, t, useConsentApp } from './setup.ts';

useConsentApp();

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
