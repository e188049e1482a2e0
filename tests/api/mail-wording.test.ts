// Every mail Plinth sends names its production and department head and writes its moments in words on the
// studio's clock. Each kind is sent here through the API, caught by the real SMTP catcher, and read back.
// (Identity mails: performer-identity.test.ts; reminders: patch-tests/reminders and archive-jobs; the
// lead's questions and incidents: applications/.)
import { randomUUID } from 'node:crypto';
import ICAL from 'ical.js';
import type { ParsedMail } from 'mailparser';
import { describe, expect, it } from 'vitest';
import { SigningFormSchema } from '#shared/schemas/consents.ts';
import { afterResponseSettled } from '../../api/http/after-response.ts';
import { expectWordedMail } from '../support/mail-wording.ts';
import { api, as, lantern, mails, mailsTo, performerId, submission, t, templateId, useConsentWorkApp } from './consent-work/setup.ts';

useConsentWorkApp();

const DAY = 86_400_000;
const bySubject = async (address: string, subject: RegExp): Promise<ParsedMail[]> => (await mailsTo(address)).filter((m) => subject.test(m.subject ?? ''));

describe('every mail names the production, the department head and a date in words', () => {
  it('role notices and lead appointment and ending', async () => {
    const rafe = await t.userId('artist@plinth.test');
    const newcomer = await t.db.db.insertInto('users').values({ email: 'wren.okafor@plinth.test', display_name: 'Wren Okafor' }).returning('id').executeTakeFirstOrThrow();
    await api().post(`/api/productions/${lantern}/memberships`).set('Cookie', as.admin).send({ userId: newcomer.id, role: 'archivist' }).expect(201);
    const [role] = await bySubject('wren.okafor@plinth.test', /you are now Archivist on The Lantern Keeper/);
    expect(role!.text).toContain('You now have the role "Archivist" on The Lantern Keeper');
    expectWordedMail(role!.text);

    const version = (await api().get(`/api/productions/${lantern}`).set('Cookie', as.admin)).body.version as number;
    const appointed = await api().post(`/api/productions/${lantern}/lead`).set('Cookie', as.admin).send({ userId: rafe, version });
    expect(appointed.status).toBe(201);
    const [lead] = await bySubject('artist@plinth.test', /you are now Designated lead on The Lantern Keeper/);
    expectWordedMail(lead!.text);
    await api().delete(`/api/productions/${lantern}/lead`).query({ version: appointed.body.version }).set('Cookie', as.admin).expect(200);
    const toHead = await bySubject('head@plinth.test', /the designated lead on The Lantern Keeper changed/);
    expect(toHead).toHaveLength(2);
    expect(toHead.map((m) => m.text).join('\n')).toMatch(/Rafe Lindqvist is now the designated lead[\s\S]*Rafe Lindqvist is no longer the designated lead/);
    for (const m of toHead) expectWordedMail(m.text);
  });

  it('a signing request by link, the signed copy, and a bundle', async () => {
    const hal = await performerId('Halvard Imre Solberg');
    await api().post('/api/signing-requests').set('Cookie', as.head).send({ performerId: hal, templateId: await templateId('application'), productionId: lantern, mode: 'link' }).expect(201);
    const [ask] = await bySubject('h.solberg@example.test', /^Please read and sign:/);
    expectWordedMail(ask!.text);
    const token = /\/sign\/([A-Za-z0-9_-]{40,60})/.exec(ask!.text ?? '')![1]!;
    const form = SigningFormSchema.parse((await api().get(`/api/signing/${token}`)).body);
    await api().post(`/api/signing/${token}`).send(submission(form, randomUUID(), 'Halvard Imre Solberg')).expect(201);
    const [copy] = await bySubject('h.solberg@example.test', /^Your signed consent/);
    // The copy says the day it was signed; the one attachment is the PDF.
    expectWordedMail(copy!.text, undefined, undefined, { dateOnly: true });
    expect(copy!.attachments).toHaveLength(1);

    await api().post('/api/signing-bundles').set('Cookie', as.head).send({ performerId: hal, productionId: lantern, mode: 'link', templateIds: [await templateId('life_casting'), await templateId('health_data')] }).expect(201);
    const [bundle] = await bySubject('h.solberg@example.test', /^Please read and sign 2 forms/);
    expectWordedMail(bundle!.text);
  });

  it('a withdrawal: the performer’s confirmation, the head’s and the lead’s notices, and a withdrawal link', async () => {
    const oz = await performerId('Oswin Parfitt-Reyes');
    const consent = await t.db.db.selectFrom('consents').select(['id', 'version']).where('performer_id', '=', oz).where('kind', '=', 'patch_testing').executeTakeFirstOrThrow();
    await api().post(`/api/consents/${consent.id}/withdraw`).set('Cookie', as.lead).send({ version: consent.version, reason: 'Itching after the last test' }).expect(200);
    const sent = [...(await bySubject('oz.parfitt@example.test', /withdrawn/)), ...(await bySubject('head@plinth.test', /^Consent withdrawn/)), ...(await bySubject('lead@plinth.test', /^Consent withdrawn/))];
    expect(sent).toHaveLength(3);
    for (const m of sent) {
      expectWordedMail(m.text);
      expect(m.text).not.toContain('Itching');
    }

    expect((await api().post('/api/withdrawal-links').send({ email: 'Bea.N@example.test' })).status).toBe(202);
    await afterResponseSettled();
    const [link] = await bySubject('bea.n@example.test', /link to withdraw/);
    expectWordedMail(link!.text);
  });

  it('a session invitation, whose calendar entry ends when the session was booked to end', async () => {
    const juno = await performerId('Juno Castellane');
    const startsAt = new Date(Date.now() + 3 * DAY);
    startsAt.setUTCHours(10, 0, 0, 0);
    // Booked for 3 h 20 min: not the usual length of an application (common practice, no published source).
    const endsAt = new Date(startsAt.getTime() + 200 * 60_000);
    const booked = await api().post('/api/bookings').set('Cookie', as.head).send({ performerId: juno, productionId: lantern, purpose: 'application', startsAt: startsAt.toISOString(), endsAt: endsAt.toISOString(), location: 'Make-up room 2' });
    expect(booked.status).toBe(201);
    const sent = (await mails()).filter((m) => m.subject?.startsWith('Invitation:'));
    expect(sent).toHaveLength(2);
    for (const m of sent) {
      expectWordedMail(m.text);
      // Read back with ical.js, an independent iCalendar parser (RFC 5545 §3.8.2.2 DTEND).
      const ev = new ICAL.Component(ICAL.parse(m.attachments.find((a) => a.contentType.startsWith('text/calendar'))!.content.toString('utf8'))).getFirstSubcomponent('vevent')!;
      expect((ev.getFirstPropertyValue('dtend') as ICAL.Time).toJSDate().getTime()).toBe(endsAt.getTime());
    }
  });
});
