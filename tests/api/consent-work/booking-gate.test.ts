import { describe, expect, it } from 'vitest';
import { BookingListSchema, BookingSchema, ConsentCheckSchema } from '#shared/schemas/bookings.ts';
import { api, as, lantern, performerId, t, useConsentWorkApp } from './setup.ts';

useConsentWorkApp();

const DAY = 86_400_000;
const inDays = (n: number, hour = 9) => {
  const d = new Date(Date.now() + n * DAY);
  d.setUTCHours(hour, 0, 0, 0);
  return d.toISOString();
};
const countBookings = async () => Number((await t.db.db.selectFrom('bookings').select((eb) => eb.fn.countAll<string>().as('n')).executeTakeFirstOrThrow()).n);

describe('the gate on booking', () => {
  it('says before saving whether the consent will be in force, by the same rule as the list', async () => {
    const oz = await performerId('Oswin Parfitt-Reyes');
    const juno = await performerId('Juno Castellane');
    const ask = async (pid: string, purpose: string) =>
      ConsentCheckSchema.parse((await api().get('/api/bookings/consent-check').query({ performerId: pid, productionId: lantern, purpose, startsAt: inDays(4) }).set('Cookie', as.head)).body);
    // Oz has no life-casting consent; Juno signed one (demo data).
    expect(await ask(oz, 'life_cast')).toEqual({ kind: 'life_casting', missing: true });
    expect(await ask(juno, 'life_cast')).toEqual({ kind: 'life_casting', missing: false });
    // Booked anyway, the session is saved and shown as waiting for consent, as the check said.
    const b = await api().post('/api/bookings').set('Cookie', as.head).send({ performerId: oz, productionId: lantern, purpose: 'life_cast', startsAt: inDays(4) });
    expect(b.status).toBe(201);
    expect(BookingSchema.parse(b.body).consentMissing).toBe(true);
    const home = await api().get('/api/home').set('Cookie', as.head);
    const waiting = home.body.tasks.find((x: { id: string }) => x.id === 'bookings-missing-consent');
    expect(waiting.title).toBe('Sessions waiting for consent');
    expect(waiting.items.map((i: { label: string }) => i.label)).toContain('Oz Parfitt');
    expect((await api().get('/api/bookings/consent-check').query({ performerId: oz, productionId: lantern, purpose: 'life_cast', startsAt: inDays(4) }).set('Cookie', as.artist)).status).toBe(403);
  });

  it('refuses a performer not engaged on the production, naming the field, and saves nothing', async () => {
    const stranger = await t.db.db.insertInto('performers').values({ legal_name: 'Ysolde Marrable' }).returning('id').executeTakeFirstOrThrow();
    const before = await countBookings();
    const res = await api().post('/api/bookings').set('Cookie', as.head).send({ performerId: stranger.id, productionId: lantern, purpose: 'application', startsAt: inDays(2) });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details.fields.performerId[0]).toMatch(/not engaged on this production/);
    expect(await countBookings()).toBe(before);
  });
});

describe('a session with its end, place and artist', () => {
  it('keeps the end and the assigned artist, and refuses an end before the start or an artist from elsewhere', async () => {
    const juno = await performerId('Juno Castellane');
    const artist = await t.userId('artist@plinth.test');
    const ok = await api().post('/api/bookings').set('Cookie', as.head).send({ performerId: juno, productionId: lantern, purpose: 'application', startsAt: inDays(3, 8), endsAt: inDays(3, 11), location: 'Make-up room 1', artistUserId: artist });
    expect(ok.status).toBe(201);
    expect(BookingSchema.parse(ok.body)).toMatchObject({ endsAt: inDays(3, 11), location: 'Make-up room 1', artist: { id: artist, name: 'Rafe Lindqvist' } });

    const before = await countBookings();
    const backwards = await api().post('/api/bookings').set('Cookie', as.head).send({ performerId: juno, productionId: lantern, purpose: 'application', startsAt: inDays(3, 11), endsAt: inDays(3, 8) });
    expect(backwards.status).toBe(400);
    expect(backwards.body.error.details.fields.endsAt[0]).toMatch(/end after it starts/);
    const admin = await t.userId('admin@plinth.test');
    const outsider = await api().post('/api/bookings').set('Cookie', as.head).send({ performerId: juno, productionId: lantern, purpose: 'application', startsAt: inDays(3, 8), artistUserId: admin });
    expect(outsider.status).toBe(400);
    expect(outsider.body.error.details.fields.artistUserId).toBeDefined();
    expect(await countBookings()).toBe(before);
  });

  it('a calendar window keeps past sessions; the plain list runs from now on', async () => {
    const juno = await performerId('Juno Castellane');
    const head = await t.userId('head@plinth.test');
    const past = new Date(Date.now() - 2 * DAY);
    const row = await t.db.db.insertInto('bookings').values({ performer_id: juno, production_id: lantern, purpose: 'application', starts_at: past, location: 'Make-up room 1', created_by: head, status: 'done' }).returning('id').executeTakeFirstOrThrow();
    const from = new Date(Date.now() - 7 * DAY).toISOString();
    const to = new Date(Date.now() + 7 * DAY).toISOString();
    const week = BookingListSchema.parse((await api().get('/api/bookings').query({ productionId: lantern, from, to }).set('Cookie', as.head)).body);
    expect(week.items.map((b) => b.id)).toContain(row.id);
    const upcoming = BookingListSchema.parse((await api().get('/api/bookings').query({ productionId: lantern }).set('Cookie', as.head)).body);
    expect(upcoming.items.map((b) => b.id)).not.toContain(row.id);
    expect(week.items.every((b) => b.startsAt >= from && b.startsAt < to)).toBe(true);
  });
});
