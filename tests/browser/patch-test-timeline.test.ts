// A long-tested performer's record on a portrait tablet: the patch-test timeline comes newest first, a
// page at a time. The performer is made for this file (engaged on the demo production, no e-mail, so
// nothing is sent), and every test booked here is cancelled at once, so no home or list elsewhere shows it.
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { createDb, type DbHandle } from '../../api/db/index.ts';
import { DEMO_PASSWORD } from '../../fake-idp/accounts.ts';
import { TEST_TIMELINE_PAGE_SIZE } from '../../shared/schemas/patch-test-log.ts';
import { expectAccessible, launchBrowser, signInThroughIdp, TABLET_PORTRAIT, withTabletPage } from '../support/browser.ts';

const appUrl = inject('appUrl');
let browser: Browser;
let db: DbHandle;
let performerId: string;

beforeAll(async () => {
  db = createDb(inject('databaseUrl'), { max: 1 });
  browser = await launchBrowser();
  const lantern = await db.db.selectFrom('productions').select('id').where('name', '=', 'The Lantern Keeper').executeTakeFirstOrThrow();
  const p = await db.db.insertInto('performers').values({ legal_name: 'Wrenna Goldhollow-Ite' }).returning('id').executeTakeFirstOrThrow();
  await db.db.insertInto('engagements').values({ performer_id: p.id, production_id: lantern.id, character_name: 'The Ferrywoman' }).execute();
  performerId = p.id;
});
afterAll(async () => {
  await browser?.close();
  await db?.close();
});

describe("a performer's patch-test timeline (head, portrait tablet)", () => {
  it('shows the newest tests a page at a time and pages on to the older ones', async () => {
    await withTabletPage(browser, TABLET_PORTRAIT, async (page) => {
      await signInThroughIdp(page, appUrl, 'head@plinth.test', DEMO_PASSWORD);
      await page.getByRole('heading', { level: 1, name: /Today/ }).waitFor();
      // Two more tests than a page, booked through the app and cancelled straight away (which frees the site).
      const lantern = (await db.db.selectFrom('productions').select('id').where('name', '=', 'The Lantern Keeper').executeTakeFirstOrThrow()).id;
      const lot = await db.db.selectFrom('product_lots').select(['id', 'product_id']).where('code', '=', 'PR-2602').executeTakeFirstOrThrow();
      const starts: string[] = [];
      for (let i = 0; i < TEST_TIMELINE_PAGE_SIZE + 2; i++) {
        const startsAt = new Date(Date.now() + (30 + i) * 86_400_000).toISOString();
        const booked = await page.request.post(`${appUrl}/api/patch-tests`, {
          headers: { origin: appUrl },
          data: { performerId, productionId: lantern, protocolId: 'occluded-48h', startsAt, location: `Timeline room ${i + 1}`, products: [{ productId: lot.product_id, lotId: lot.id, site: 'Left inner forearm 1' }] },
        });
        expect(booked.status(), await booked.text()).toBe(201);
        const body = (await booked.json()) as { id: string; version: number };
        const cancelled = await page.request.post(`${appUrl}/api/patch-tests/${body.id}/cancel`, { headers: { origin: appUrl }, data: { version: body.version } });
        expect(cancelled.status(), await cancelled.text()).toBe(200);
        starts.push(`Timeline room ${i + 1}`);
      }

      await page.goto(`${appUrl}/performers/${performerId}`);
      const timeline = page.getByTestId('patch-tests-section').getByRole('list', { name: 'Patch tests, newest first' });
      await timeline.waitFor();
      const places = async () => (await timeline.getByRole('listitem').allTextContents()).map((t) => /Timeline room \d+/.exec(t)?.[0]);
      // Newest first: the last booked (latest start) leads the first page.
      await expect.poll(places).toEqual(starts.toReversed().slice(0, TEST_TIMELINE_PAGE_SIZE));
      const pager = page.getByRole('navigation', { name: 'Pages of patch tests' });
      expect(await pager.textContent()).toContain(`1–${TEST_TIMELINE_PAGE_SIZE} of ${TEST_TIMELINE_PAGE_SIZE + 2} patch tests`);
      await expectAccessible(page, 'the patch-test timeline');
      await pager.getByRole('button', { name: /Next/ }).click();
      await expect.poll(places).toEqual(starts.toReversed().slice(TEST_TIMELINE_PAGE_SIZE));
      expect(await pager.textContent()).toContain('page 2 of 2');
      const [scroll, client] = await page.evaluate(() => [document.documentElement.scrollWidth, document.documentElement.clientWidth]);
      expect(scroll, 'the record scrolls sideways').toBeLessThanOrEqual(client);
      await pager.getByRole('button', { name: /Previous/ }).click();
      await expect.poll(places).toEqual(starts.toReversed().slice(0, TEST_TIMELINE_PAGE_SIZE));
    });
  });
});
