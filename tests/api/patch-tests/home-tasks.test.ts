import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Who } from '../../fixtures/performers.ts';
import { HOUR, patchTestWorld, type PatchTestWorld } from './setup.ts';

/**
 * What each role's home gets from the patch-test lists. The demo tests on The Lantern Keeper: Juno's
 * department use test applied 26 hours ago (its 24-hour window open), Tamsin's occluded test applied
 * 74 hours ago and removed at 48 (D2 overdue, D4 open), Halvard's test booked in three days without a
 * patch-testing consent. Another production here gets a lead of its own and one test under reading.
 */
let w: PatchTestWorld;
let saltglass = '';
let saltglassTest = '';
let otherLead = '';
const OTHER_PERFORMER = 'Wrenna Loftus-Achterveld';
const SECRETS = ['Redness', 'blisters', 'Faint pink', '++', '?+', 'positive', 'doubtful', 'negative', 'irritant', 'Sticking plasters', 'allerg'];

interface Task {
  id: string;
  title: string;
  detail: string;
  count: number;
  href: string | null;
  items?: { label: string; at: string | null }[];
}

async function homeOf(cookie: string, seat?: { productionId: string; role: string }): Promise<{ role: string; tasks: Task[]; raw: string }> {
  if (seat) expect((await w.api().put('/api/session/current').set('Cookie', cookie).send(seat)).status).toBe(200);
  const res = await w.api().get('/api/home').set('Cookie', cookie);
  expect(res.status).toBe(200);
  return { role: res.body.role, tasks: res.body.tasks, raw: res.text };
}
const task = (tasks: Task[], id: string) => tasks.find((t) => t.id === id);
const testIdOf = (href: string | null) => href?.match(/^\/patch-tests\/([0-9a-f-]{36})$/)?.[1] ?? null;

async function productionOfTest(id: string): Promise<string> {
  return (await w.t.db.db.selectFrom('patch_tests').select('production_id').where('booking_id', '=', id).executeTakeFirstOrThrow()).production_id;
}

beforeAll(async () => {
  w = await patchTestWorld();
  const db = w.t.db.db;
  saltglass = (await db.selectFrom('productions').select('id').where('name', '=', 'Saltglass Mile').executeTakeFirstOrThrow()).id;
  const lead = await db.insertInto('users').values({ email: 'other.lead@plinth.test', display_name: 'Other Lead' }).returning('id').executeTakeFirstOrThrow();
  await db.insertInto('memberships').values({ user_id: lead.id, production_id: saltglass, role: 'artist' }).execute();
  await db.insertInto('lead_appointments').values({ production_id: saltglass, user_id: lead.id, starts_at: new Date(Date.now() - 48 * HOUR) }).execute();
  otherLead = await w.t.sessionFor('other.lead@plinth.test');

  // A department use test on the other production, applied 26 hours ago, as the demo's own are written.
  const performer = await db.insertInto('performers').values({ legal_name: OTHER_PERFORMER }).returning('id').executeTakeFirstOrThrow();
  await db.insertInto('engagements').values({ performer_id: performer.id, production_id: saltglass }).execute();
  const version = await db.selectFrom('protocol_versions').select('id').where('protocol_id', '=', 'department-use').orderBy('version', 'desc').executeTakeFirstOrThrow();
  const applied = new Date(Date.now() - 26 * HOUR);
  const booking = await db
    .insertInto('bookings')
    .values({ performer_id: performer.id, production_id: saltglass, purpose: 'patch_test', starts_at: applied, location: 'Trailer 4', status: 'done' })
    .returning('id')
    .executeTakeFirstOrThrow();
  await db
    .insertInto('patch_tests')
    .values({ booking_id: booking.id, performer_id: performer.id, production_id: saltglass, protocol_version_id: version.id, status: 'applied', applied_at: applied, applied_by: lead.id, created_by: lead.id })
    .execute();
  const lot = await w.lot('MS-2604');
  const formulation = await db.selectFrom('product_lots').select('formulation_id').where('id', '=', lot.id).executeTakeFirstOrThrow();
  await db.insertInto('patch_test_products').values({ test_id: booking.id, position: 0, product_id: lot.productId, lot_id: lot.id, formulation_id: formulation.formulation_id, site: 'Left inner forearm 1' }).execute();
  saltglassTest = booking.id;
});
afterAll(async () => {
  await w?.t.close();
});

describe('the lead’s reading lists on their home', () => {
  it('lists the readings due and overdue on their own production, each linking to one of its tests', async () => {
    const home = await homeOf(w.as.lead, { productionId: w.lantern, role: 'lead' });
    expect(home.role).toBe('lead');
    const due = task(home.tasks, 'readings-due-now')!;
    expect(due.count).toBe(2);
    expect(due.detail).toContain('Juno Castellane: 24 hours');
    expect(due.detail).toContain('Tamsin Achebe-Lowry: D4');
    const overdue = task(home.tasks, 'readings-overdue')!;
    expect(overdue.count).toBe(1);
    expect(overdue.detail).toContain('Tamsin Achebe-Lowry: D2');
    for (const t of [due, overdue]) expect(await productionOfTest(testIdOf(t.href)!)).toBe(w.lantern);
    // The other production's test is not the Lantern lead's to read.
    expect(home.raw).not.toContain(OTHER_PERFORMER);
    expect(home.raw).not.toContain(saltglassTest);
  });

  it('another production’s lead sees their own test and none of The Lantern Keeper’s', async () => {
    const home = await homeOf(otherLead, { productionId: saltglass, role: 'lead' });
    expect(home.role).toBe('lead');
    const due = task(home.tasks, 'readings-due-now')!;
    expect(due.count).toBe(1);
    expect(due.detail).toBe(`${OTHER_PERFORMER}: 24 hours`);
    expect(testIdOf(due.href)).toBe(saltglassTest);
    expect(task(home.tasks, 'readings-overdue')).toMatchObject({ count: 0, href: null });
    for (const name of ['Juno Castellane', 'Tamsin Achebe-Lowry', 'Halvard Imre Solberg']) expect(home.raw).not.toContain(name);
  });
});

describe('the head’s patch-test lists', () => {
  it('lists the booked test waiting for a consent and the tests of the week, with the time for the client to word', async () => {
    const home = await homeOf(w.as.head, { productionId: w.lantern, role: 'head' });
    expect(home.role).toBe('head');
    const waiting = task(home.tasks, 'patch-tests-need-consent')!;
    expect(waiting.count).toBe(1);
    expect(waiting.items).toEqual([{ label: 'Halvard Imre Solberg', at: expect.stringMatching(/^\d{4}-\d{2}-\d{2}T/) }]);
    expect(await productionOfTest(testIdOf(waiting.href)!)).toBe(w.lantern);
    const booked = await w.t.db.db.selectFrom('bookings').select('starts_at').where('id', '=', testIdOf(waiting.href)!).executeTakeFirstOrThrow();
    expect(new Date(waiting.items![0]!.at!).getTime()).toBe(new Date(booked.starts_at).getTime());
    const week = task(home.tasks, 'patch-tests-this-week')!;
    expect(week.items?.map((i) => i.label)).toContain('Halvard Imre Solberg');
    // Words on screen are the client's: no date written into the sentence by the server.
    for (const t of [waiting, week]) expect(t.detail).not.toMatch(/\d{4}-\d{2}-\d{2}/);
    // Readings are the lead's list, not the head's.
    expect(home.tasks.map((t) => t.id).filter((id) => id.startsWith('readings-'))).toEqual([]);
  });
});

describe('what no home carries', () => {
  it('artists, the archivist and the performer get no patch-test lists', async () => {
    for (const who of ['artist', 'archivist', 'performer'] as const satisfies readonly Who[]) {
      const home = await homeOf(w.as[who]);
      const ids = home.tasks.map((t) => t.id);
      expect(ids.filter((id) => id.startsWith('readings-') || id.startsWith('patch-tests-')), who).toEqual([]);
    }
  });

  it('no home holds a grade, a reading note or an allergy answer, and reading one is no health-data read', async () => {
    const before = await w.t.db.db.selectFrom('audit_log').select((e) => e.fn.countAll<string>().as('n')).where('action', '=', 'medical.read').executeTakeFirstOrThrow();
    const homes = [
      await homeOf(w.as.head, { productionId: w.lantern, role: 'head' }),
      await homeOf(w.as.lead, { productionId: w.lantern, role: 'lead' }),
      await homeOf(w.as.artist),
      await homeOf(w.as.archivist),
      await homeOf(w.as.performer),
      await homeOf(otherLead, { productionId: saltglass, role: 'lead' }),
    ];
    for (const home of homes) for (const secret of SECRETS) expect(home.raw, `${home.role} home`).not.toContain(secret);
    const after = await w.t.db.db.selectFrom('audit_log').select((e) => e.fn.countAll<string>().as('n')).where('action', '=', 'medical.read').executeTakeFirstOrThrow();
    expect(Number(after.n)).toBe(Number(before.n));
  });
});
