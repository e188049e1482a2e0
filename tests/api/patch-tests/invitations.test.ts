// A patch test is a session: booking, moving and cancelling it send the calendar messages every session sends,
// read back with ical.js (an independent iCalendar parser). RFC 5546 §3.2.2 (REQUEST) and §3.2.5 (CANCEL).
import { promises as fs } from 'node:fs';
import path from 'node:path';
import ICAL from 'ical.js';
import { simpleParser, type ParsedMail } from 'mailparser';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { expectWordedMail } from '../../support/mail-wording.ts';
import { HOUR, patchTestWorld, type PatchTestWorld } from './setup.ts';

let w: PatchTestWorld;
beforeAll(async () => {
  w = await patchTestWorld();
});
afterAll(async () => {
  await w?.t.close();
});

async function mailFiles(): Promise<Set<string>> {
  return new Set((await fs.readdir(w.t.mail.dir)).filter((f) => f.endsWith('.eml')));
}
async function calendarsSince(before: ReadonlySet<string>): Promise<{ to: string; cal: ICAL.Component; mail: ParsedMail }[]> {
  const files = (await fs.readdir(w.t.mail.dir)).filter((f) => f.endsWith('.eml') && !before.has(f)).sort();
  const mails = await Promise.all(files.map(async (f) => simpleParser(await fs.readFile(path.join(w.t.mail.dir, f)))));
  return mails
    .filter((m) => m.attachments.some((a) => a.contentType.startsWith('text/calendar')))
    .map((m) => ({
      to: m.to && 'text' in m.to ? m.to.text : '',
      mail: m,
      cal: new ICAL.Component(ICAL.parse(m.attachments.find((a) => a.contentType.startsWith('text/calendar'))!.content.toString('utf8'))),
    }));
}

describe('patch-test invitations', () => {
  it('sends a REQUEST on booking, the same UID with SEQUENCE 1 on a move, and CANCEL with SEQUENCE 2 on cancelling', async () => {
    const lot = await w.lot('QA-2602');
    let before = await mailFiles();
    const booked = await w.book({ startsAt: new Date(Date.now() + 30 * HOUR).toISOString(), products: [{ productId: lot.productId, lotId: lot.id, site: 'Left inner forearm 1' }] });
    expect(booked.status).toBe(201);
    const id = booked.body.id as string;
    let sent = await calendarsSince(before);
    expect(sent.map((s) => s.to).sort()).toEqual(['lead@plinth.test', 'performer@plinth.test']);
    for (const { cal } of sent) {
      expect(cal.getFirstPropertyValue('method')).toBe('REQUEST');
      const ev = cal.getFirstSubcomponent('vevent')!;
      expect(ev.getFirstPropertyValue('uid')).toBe(`session-${id}@plinth`);
      expect(Number(ev.getFirstPropertyValue('sequence') ?? 0)).toBe(0);
      // The product tested is not calendar business: no product, lot or site in what a calendar shows.
      const words = [ev.getFirstPropertyValue('summary'), ev.getFirstPropertyValue('description'), ev.getFirstPropertyValue('location')].join(' ');
      expect(words).not.toContain('QA-2602');
      expect(words).not.toMatch(/forearm/i);
    }

    before = await mailFiles();
    const moved = await w.api().post(`/api/patch-tests/${id}/reschedule`).set('Cookie', w.as.head).send({ startsAt: new Date(Date.now() + 50 * HOUR).toISOString(), location: 'Studio 4', version: booked.body.version });
    expect(moved.status).toBe(200);
    sent = await calendarsSince(before);
    expect(sent).toHaveLength(2);
    for (const { cal } of sent) {
      const ev = cal.getFirstSubcomponent('vevent')!;
      expect(cal.getFirstPropertyValue('method')).toBe('REQUEST');
      expect(ev.getFirstPropertyValue('uid')).toBe(`session-${id}@plinth`);
      expect(Number(ev.getFirstPropertyValue('sequence'))).toBe(1);
      expect(ev.getFirstPropertyValue('location')).toBe('Studio 4');
    }

    before = await mailFiles();
    const cancelled = await w.api().post(`/api/patch-tests/${id}/cancel`).set('Cookie', w.as.head).send({ version: moved.body.version });
    expect(cancelled.status).toBe(200);
    sent = await calendarsSince(before);
    expect(sent).toHaveLength(2);
    for (const { cal } of sent) {
      const ev = cal.getFirstSubcomponent('vevent')!;
      expect(cal.getFirstPropertyValue('method')).toBe('CANCEL');
      expect(ev.getFirstPropertyValue('uid')).toBe(`session-${id}@plinth`);
      expect(Number(ev.getFirstPropertyValue('sequence'))).toBe(2);
      expect(ev.getFirstPropertyValue('status')).toBe('CANCELLED');
    }
  });

  it('a patch test cannot be moved or cancelled through the plain sessions routes, so its record never drifts from its session', async () => {
    const lot = await w.lot('PR-2602');
    const booked = await w.book({ startsAt: new Date(Date.now() + 80 * HOUR).toISOString(), products: [{ productId: lot.productId, lotId: lot.id, site: 'Behind the right ear' }] });
    expect(booked.status).toBe(201);
    const id = booked.body.id as string;
    const move = await w.api().post(`/api/bookings/${id}/reschedule`).set('Cookie', w.as.head).send({ startsAt: new Date(Date.now() + 90 * HOUR).toISOString(), sequence: 0 });
    expect(move.status).toBe(409);
    const cancel = await w.api().post(`/api/bookings/${id}/cancel`).set('Cookie', w.as.head).send({});
    expect(cancel.status).toBe(409);
    const row = await w.t.db.db.selectFrom('bookings').select(['status', 'invitation_sequence']).where('id', '=', id).executeTakeFirstOrThrow();
    expect(row).toEqual({ status: 'booked', invitation_sequence: 0 });
  });

  it('DTEND is the end the session was booked with, and keeps the booked length when the test moves', async () => {
    const lot = await w.lot('QA-2602');
    const startsAt = new Date(Date.now() + 120 * HOUR);
    startsAt.setUTCSeconds(0, 0);
    // Booked for 50 minutes, not the usual 30 of an application session.
    const endsAt = new Date(startsAt.getTime() + 50 * 60_000);
    let before = await mailFiles();
    const booked = await w.book({ startsAt: startsAt.toISOString(), endsAt: endsAt.toISOString(), products: [{ productId: lot.productId, lotId: lot.id, site: 'Right inner forearm 3' }] });
    expect(booked.status).toBe(201);
    const id = booked.body.id as string;
    const row = await w.t.db.db.selectFrom('bookings').select('ends_at').where('id', '=', id).executeTakeFirstOrThrow();
    expect(new Date(row.ends_at!).getTime()).toBe(endsAt.getTime());
    const dtend = (cal: ICAL.Component) => (cal.getFirstSubcomponent('vevent')!.getFirstPropertyValue('dtend') as ICAL.Time).toJSDate().getTime();
    let sent = await calendarsSince(before);
    expect(sent).toHaveLength(2);
    for (const { cal, mail } of sent) {
      expect(dtend(cal)).toBe(endsAt.getTime());
      expectWordedMail(mail.text);
    }

    before = await mailFiles();
    const later = new Date(startsAt.getTime() + 24 * HOUR);
    const moved = await w.api().post(`/api/patch-tests/${id}/reschedule`).set('Cookie', w.as.head).send({ startsAt: later.toISOString(), location: 'Studio 4', version: booked.body.version });
    expect(moved.status).toBe(200);
    sent = await calendarsSince(before);
    expect(sent).toHaveLength(2);
    for (const { cal, mail } of sent) {
      expect(Number(cal.getFirstSubcomponent('vevent')!.getFirstPropertyValue('sequence'))).toBe(1);
      expect(dtend(cal)).toBe(later.getTime() + 50 * 60_000);
      expectWordedMail(mail.text);
    }

    before = await mailFiles();
    await w.api().post(`/api/patch-tests/${id}/cancel`).set('Cookie', w.as.head).send({ version: moved.body.version }).expect(200);
    sent = await calendarsSince(before);
    expect(sent.map(({ cal }) => cal.getFirstPropertyValue('method'))).toEqual(['CANCEL', 'CANCEL']);
    for (const { mail } of sent) expectWordedMail(mail.text);
  });

  it('refuses an end before the start', async () => {
    const lot = await w.lot('QA-2602');
    const startsAt = new Date(Date.now() + 200 * HOUR);
    const res = await w.book({ startsAt: startsAt.toISOString(), endsAt: new Date(startsAt.getTime() - 60_000).toISOString(), products: [{ productId: lot.productId, lotId: lot.id, site: 'Right inner forearm 4' }] });
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields.endsAt).toEqual(['The session must end after it starts']);
  });
});
