import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { TEST_SITES } from '#shared/domain/test-sites.ts';
import { TEST_TIMELINE_PAGE_SIZE } from '#shared/schemas/patch-test-log.ts';
import { EMAILS, makeConsent, makePerformer, makeProduction } from '../../fixtures/performers.ts';
import { HOUR, patchTestWorld, type PatchTestWorld } from './setup.ts';

/** A performer's tests on their record: newest first, a page at a time, counted in the productions the reader may see. */
let w: PatchTestWorld;
let performer: string;
let lanternTests: { id: string; startsAt: string }[];
let otherTests: string[];
// Two over a page, each on its own site, leaving the two sites behind the ears for the other production.
const LANTERN_TESTS = TEST_TIMELINE_PAGE_SIZE + 2;

beforeAll(async () => {
  w = await patchTestWorld();
  // Another production, headed by a user who has no role on The Lantern Keeper.
  const other = await makeProduction(w.t, 'Timeline Other Production', [{ email: EMAILS.artist2, role: 'head' }]);
  performer = await makePerformer(w.t, 'Timeline Test Performer', [{ productionId: w.lantern }, { productionId: other }]);
  await makeConsent(w.t, performer, 'patch_testing');
  const pier = await w.lot('PR-2602');
  const otherHead = await w.t.sessionFor(EMAILS.artist2);
  lanternTests = [];
  // Booked out of time order, each on its own site, so the order asked for is not the order written.
  const order = Array.from({ length: LANTERN_TESTS }, (_, i) => (i * 7) % LANTERN_TESTS);
  for (const i of order) {
    const startsAt = new Date(Date.now() + HOUR + i * 60_000).toISOString();
    const res = await w.book({ performerId: performer, startsAt, products: [{ productId: pier.productId, lotId: pier.id, site: TEST_SITES[i]! }] });
    expect(res.status).toBe(201);
    lanternTests.push({ id: res.body.id, startsAt });
  }
  otherTests = [];
  for (const [i, site] of ['Behind the left ear', 'Behind the right ear'].entries()) {
    const res = await w
      .api()
      .post('/api/patch-tests')
      .set('Cookie', otherHead)
      .send({ performerId: performer, productionId: other, protocolId: 'occluded-48h', startsAt: new Date(Date.now() + 2 * HOUR + i * 60_000).toISOString(), location: 'Other trailer', products: [{ productId: pier.productId, lotId: pier.id, site }] });
    expect(res.status).toBe(201);
    otherTests.push(res.body.id);
  }
});
afterAll(async () => {
  await w?.t.close();
});

const timeline = (testsPage?: number) => w.api().get(`/api/performers/${performer}/patch-tests${testsPage === undefined ? '' : `?testsPage=${testsPage}`}`).set('Cookie', w.as.head);

describe("a performer's test timeline", () => {
  it('gives the newest tests first, a page at a time, with the total of the productions the head may see', async () => {
    const newestFirst = lanternTests.toSorted((a, b) => b.startsAt.localeCompare(a.startsAt)).map((t) => t.id);
    const first = await timeline();
    expect(first.status).toBe(200);
    expect(first.body.tests).toMatchObject({ total: LANTERN_TESTS, page: 1, pageSize: TEST_TIMELINE_PAGE_SIZE });
    expect(first.body.tests.items.map((t: { id: string }) => t.id)).toEqual(newestFirst.slice(0, TEST_TIMELINE_PAGE_SIZE));
    const second = await timeline(2);
    expect(second.body.tests).toMatchObject({ total: LANTERN_TESTS, page: 2 });
    expect(second.body.tests.items.map((t: { id: string }) => t.id)).toEqual(newestFirst.slice(TEST_TIMELINE_PAGE_SIZE));
    // The other production's tests are neither listed nor counted for this head.
    const listed = [...first.body.tests.items, ...second.body.tests.items].map((t: { id: string }) => t.id);
    for (const id of otherTests) expect(listed).not.toContain(id);
    // The rest of the answer does not move with the page.
    expect(second.body.clearances).toEqual(first.body.clearances);
  });

  it('counts and lists both productions for the performer themself', async () => {
    const user = await w.t.db.db.insertInto('users').values({ email: 'timeline.performer@plinth.test', display_name: 'Timeline Test Performer' }).returning('id').executeTakeFirstOrThrow();
    await w.t.db.db.updateTable('performers').set({ user_id: user.id }).where('id', '=', performer).execute();
    const self = await w.t.sessionFor('timeline.performer@plinth.test');
    const res = await w.api().get(`/api/performers/${performer}/patch-tests?testsPage=2`).set('Cookie', self);
    expect(res.status).toBe(200);
    expect(res.body.tests.total).toBe(LANTERN_TESTS + otherTests.length);
    expect(res.body.tests.items).toHaveLength(LANTERN_TESTS + otherTests.length - TEST_TIMELINE_PAGE_SIZE);
  });

  it('answers a page past the end with no tests and the total, and refuses a page that is not one', async () => {
    const past = await timeline(9);
    expect(past.status).toBe(200);
    expect(past.body.tests).toMatchObject({ items: [], total: LANTERN_TESTS, page: 9 });
    const zero = await timeline(0);
    expect(zero.status).toBe(400);
    expect(zero.body.error.details.fields.testsPage).toEqual(['Pages start at 1']);
    const half = await w.api().get(`/api/performers/${performer}/patch-tests?testsPage=1.5`).set('Cookie', w.as.head);
    expect(half.body.error.details.fields.testsPage).toEqual(['Give a whole page number']);
  });
});
