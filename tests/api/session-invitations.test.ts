// Calendar invitations for sessions, read back with ical.js (an independent iCalendar parser) and checked
// against the properties RFC 5546 requires of a REQUEST (§3.2.2) and a CANCEL (§3.2.5).
import { promises as fs } from 'node:fs';
import path from 'node:path';
import ICAL from 'ical.js';
import { simpleParser, type ParsedMail } from 'mailparser';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ErrorBodySchema } from '#shared/errors.ts';
import { createTestApp, type TestApp } from '../support/app.ts';

let t: TestApp;
let head: string;
let production: string;
let juno: string;

beforeAll(async () => {
  t = await createTestApp();
  head = await t.sessionFor('head@plinth.test');
  production = (await t.db.db.selectFrom('productions').select('id').where('name', '=', 'The Lantern Keeper').executeTakeFirstOrThrow()).id;
  juno = (await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', 'Juno Castellane').executeTakeFirstOrThrow()).id;
});
afterAll(async () => {
  await t?.close();
});

async function mailsSince(before: ReadonlySet<string>): Promise<ParsedMail[]> {
  const files = (await fs.readdir(t.mail.dir)).filter((f) => f.endsWith('.eml') && !before.has(f)).sort();
  return Promise.all(files.map(async (f) => simpleParser(await fs.readFile(path.join(t.mail.dir, f)))));
}
async function mailFiles(): Promise<Set<string>> {
  return new Set((await fs.readdir(t.mail.dir)).filter((f) => f.endsWith('.eml')));
}
function toOf(m: ParsedMail): string {
  return m.to && 'text' in m.to ? m.to.text : '';
}
/** The text/calendar part nodemailer sent, as an ical.js component. */
function calendarOf(m: ParsedMail): ICAL.Component {
  const part = m.attachments.find((a) => a.contentType.startsWith('text/calendar'));
  expect(part, `a text/calendar part in "${m.subject}"`).toBeTruthy();
  return new ICAL.Component(ICAL.parse(part!.content.toString('utf8')));
}

/** RFC 5546 §3.2.2 (REQUEST) and §3.2.5 (CANCEL): properties that MUST be present exactly once, and ATTENDEE at least once. */
function expectItip(cal: ICAL.Component, method: 'REQUEST' | 'CANCEL'): ICAL.Component {
  expect(cal.getFirstPropertyValue('method')).toBe(method);
  expect(cal.getFirstPropertyValue('version')).toBe('2.0');
  expect(cal.getFirstPropertyValue('prodid')).toBeTruthy();
  const events = cal.getAllSubcomponents('vevent');
  expect(events).toHaveLength(1);
  const ev = events[0]!;
  const once = method === 'REQUEST' ? ['dtstamp', 'dtstart', 'organizer', 'summary', 'uid'] : ['dtstamp', 'organizer', 'uid', 'sequence'];
  for (const name of once) expect(ev.getAllProperties(name), name).toHaveLength(1);
  expect(ev.getAllProperties('attendee').length).toBeGreaterThanOrEqual(1);
  // DTEND and DURATION may not both appear (RFC 5545 §3.6.1).
  expect(ev.getAllProperties('dtend').length + ev.getAllProperties('duration').length).toBeLessThanOrEqual(1);
  return ev;
}

describe('session invitations', () => {
  let bookingId: string;
  let uid: string;
  const startsAt = new Date(Date.now() + 5 * 86_400_000);
  startsAt.setUTCHours(9, 30, 0, 0);

  it('sends the performer and the designated lead a REQUEST with no health detail in it', async () => {
    const before = await mailFiles();
    const res = await request(t.app).post('/api/bookings').set('Cookie', head).send({ performerId: juno, productionId: production, purpose: 'patch_test', startsAt: startsAt.toISOString(), location: 'Make-up room 2' });
    expect(res.status).toBe(201);
    expect(res.body.sequence).toBe(0);
    bookingId = res.body.id;
    const sent = await mailsSince(before);
    expect(sent.map(toOf).sort()).toEqual(['lead@plinth.test', 'performer@plinth.test']);
    for (const m of sent) {
      const ev = expectItip(calendarOf(m), 'REQUEST');
      uid = ev.getFirstPropertyValue('uid') as string;
      expect(uid).toBe(`session-${bookingId}@plinth`);
      expect(Number(ev.getFirstPropertyValue('sequence') ?? 0)).toBe(0);
      const start = ev.getFirstPropertyValue('dtstart') as ICAL.Time;
      expect(start.toJSDate().getTime()).toBe(startsAt.getTime());
      expect(ev.getFirstPropertyValue('location')).toBe('Make-up room 2');
      const attendees = ev.getAllProperties('attendee').map((p) => String(p.getFirstValue()).toLowerCase());
      expect(attendees.sort()).toEqual(['mailto:lead@plinth.test', 'mailto:performer@plinth.test']);
      // The words a shared calendar shows name the kind of session and the production, never a result, a grade or an allergy.
      const words = [ev.getFirstPropertyValue('summary'), ev.getFirstPropertyValue('description'), ev.getFirstPropertyValue('location')].join(' ');
      expect(words).toContain('The Lantern Keeper');
      expect(words).not.toMatch(/allerg|react|positive|negative|grade|\+\+|eczema|asthma|latex/i);
      // Mail prints the date in words.
      expect(m.text).toMatch(/When: (Monday|Tuesday|Wednesday|Thursday|Friday|Saturday|Sunday), \d{1,2} (January|February|March|April|May|June|July|August|September|October|November|December) \d{4}/);
    }
  });

  it('sends an update with the same UID and SEQUENCE + 1 when the session moves', async () => {
    const before = await mailFiles();
    const later = new Date(startsAt.getTime() + 86_400_000);
    const res = await request(t.app).post(`/api/bookings/${bookingId}/reschedule`).set('Cookie', head).send({ startsAt: later.toISOString(), sequence: 0 });
    expect(res.status).toBe(200);
    expect(res.body.sequence).toBe(1);
    expect(res.body.location).toBe('Make-up room 2');
    const sent = await mailsSince(before);
    expect(sent).toHaveLength(2);
    for (const m of sent) {
      const ev = expectItip(calendarOf(m), 'REQUEST');
      expect(ev.getFirstPropertyValue('uid')).toBe(uid);
      expect(Number(ev.getFirstPropertyValue('sequence'))).toBe(1);
      expect((ev.getFirstPropertyValue('dtstart') as ICAL.Time).toJSDate().getTime()).toBe(later.getTime());
      expect(m.subject).toMatch(/^Moved: /);
    }
  });

  it('refuses a move based on a stale sequence (409) and leaves the session where it is', async () => {
    const before = await mailFiles();
    const res = await request(t.app).post(`/api/bookings/${bookingId}/reschedule`).set('Cookie', head).send({ startsAt: new Date(Date.now() + 20 * 86_400_000).toISOString(), sequence: 0 });
    expect(res.status).toBe(409);
    expect(ErrorBodySchema.parse(res.body).error.code).toBe('conflict');
    const row = await t.db.db.selectFrom('bookings').select(['starts_at', 'invitation_sequence']).where('id', '=', bookingId).executeTakeFirstOrThrow();
    expect(row.invitation_sequence).toBe(1);
    expect(new Date(row.starts_at).getTime()).toBe(startsAt.getTime() + 86_400_000);
    expect(await mailsSince(before)).toHaveLength(0);
  });

  it('refuses a move into the past and a move by someone who may not book', async () => {
    const past = await request(t.app).post(`/api/bookings/${bookingId}/reschedule`).set('Cookie', head).send({ startsAt: new Date(Date.now() - 86_400_000).toISOString(), sequence: 1 });
    expect(past.status).toBe(400);
    expect(ErrorBodySchema.parse(past.body).error.details?.fields?.startsAt).toBeTruthy();
    const artist = await request(t.app).post(`/api/bookings/${bookingId}/reschedule`).set('Cookie', await t.sessionFor('artist@plinth.test')).send({ startsAt: new Date(Date.now() + 9 * 86_400_000).toISOString(), sequence: 1 });
    expect(artist.status).toBe(403);
  });

  it('sends METHOD:CANCEL with the same UID and the next SEQUENCE when the session is cancelled', async () => {
    const before = await mailFiles();
    const res = await request(t.app).post(`/api/bookings/${bookingId}/cancel`).set('Cookie', head).send({});
    expect(res.status).toBe(200);
    const sent = await mailsSince(before);
    expect(sent).toHaveLength(2);
    for (const m of sent) {
      const ev = expectItip(calendarOf(m), 'CANCEL');
      expect(ev.getFirstPropertyValue('uid')).toBe(uid);
      expect(Number(ev.getFirstPropertyValue('sequence'))).toBe(2);
      expect(ev.getFirstPropertyValue('status')).toBe('CANCELLED');
    }
    const again = await request(t.app).post(`/api/bookings/${bookingId}/reschedule`).set('Cookie', head).send({ startsAt: new Date(Date.now() + 9 * 86_400_000).toISOString(), sequence: 2 });
    expect(again.status).toBe(409);
  });

  it('invites only a confirmed address: an unconfirmed performer gets nothing, the lead still does', async () => {
    const oz = (await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', 'Oswin Parfitt-Reyes').executeTakeFirstOrThrow()).id;
    await t.db.db.updateTable('performers').set({ email_confirmed_at: null }).where('id', '=', oz).execute();
    const before = await mailFiles();
    const res = await request(t.app).post('/api/bookings').set('Cookie', head).send({ performerId: oz, productionId: production, purpose: 'life_cast', startsAt: new Date(Date.now() + 12 * 86_400_000).toISOString() });
    expect(res.status).toBe(201);
    const sent = await mailsSince(before);
    expect(sent.map(toOf)).toEqual(['lead@plinth.test']);
    const ev = expectItip(calendarOf(sent[0]!), 'REQUEST');
    // A life cast holds the calendar for three hours when the session records no end of its own.
    const start = (ev.getFirstPropertyValue('dtstart') as ICAL.Time).toJSDate().getTime();
    const end = (ev.getFirstPropertyValue('dtend') as ICAL.Time).toJSDate().getTime();
    expect((end - start) / 60_000).toBe(180); // common practice, no published source
  });
});
