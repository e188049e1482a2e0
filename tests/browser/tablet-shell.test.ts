// The shell and the pages staff start from, on a tablet: homes that offer the next step, the
// performer's own home, the performer page's lead and index, and a header that follows the page.
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { createDb, type DbHandle } from '../../api/db/index.ts';
import { DEMO_PASSWORD } from '../../fake-idp/accounts.ts';
import { expectAccessible, launchBrowser, signInThroughIdp, TABLET_LANDSCAPE, TABLET_PORTRAIT, withTabletPage } from '../support/browser.ts';

const appUrl = inject('appUrl');
let browser: Browser;
let db: DbHandle;

beforeAll(async () => {
  db = createDb(inject('databaseUrl'), { max: 1 });
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await db?.close();
});

const withPage = (viewport: { width: number; height: number }, run: (page: Page) => Promise<void>) => withTabletPage(browser, viewport, run);

describe('homes offer the next step', () => {
  // The artist's panels (today's applications, checks waiting on the lead) hold whatever the shared demo's
  // day holds after other files ran, so this test sets their two lists itself; the rest of the page is real.
  async function artistPanels(page: Page, applications: unknown[]) {
    await page.route(/\/api\/applications\?/, (route) => route.fulfill({ json: { items: applications } }));
    await page.route(/\/api\/checks\/waiting\?/, (route) => route.fulfill({ json: { items: [] } }));
  }

  it('an artist with nothing to do today is offered where to start', async () => {
    await withPage(TABLET_PORTRAIT, async (page) => {
      await artistPanels(page, []);
      await signInThroughIdp(page, appUrl, 'artist@plinth.test', DEMO_PASSWORD);
      await page.getByRole('heading', { level: 1, name: /Today · Artist/ }).waitFor();
      const empty = page.getByTestId('empty-state').filter({ hasText: 'Nothing needs doing today.' });
      await empty.waitFor();
      const actions = empty.getByTestId('start-actions').getByRole('link');
      // The check comes first: nothing goes on the skin without one.
      expect(await actions.allTextContents()).toEqual(['Run a check', 'Find a performer']);
      for (const box of await Promise.all((await actions.all()).map((a) => a.boundingBox()))) expect(box!.height).toBeGreaterThanOrEqual(44);
      await expectAccessible(page, 'artist home, nothing to do');
      await actions.first().click();
      await page.getByRole('heading', { level: 1, name: 'Check before an application' }).waitFor();
      await page.goBack();
      await empty.getByTestId('start-actions').getByRole('link', { name: 'Find a performer' }).click();
      await page.getByRole('heading', { level: 1, name: /Performers/ }).waitFor();
    });
  });

  it('an artist whose day has an application on is not told that nothing needs doing', async () => {
    await withPage(TABLET_PORTRAIT, async (page) => {
      const on = { id: '00000000-0000-4000-8000-0000000000a1', performerId: '00000000-0000-4000-8000-0000000000b1', performerName: 'Juno Castellane', artistName: 'Rafe Lindqvist', appliedOn: '2026-12-02', description: 'Scar appliance', startedAt: new Date().toISOString(), endedAt: null, skinChecked: false };
      await artistPanels(page, [on]);
      await signInThroughIdp(page, appUrl, 'artist@plinth.test', DEMO_PASSWORD);
      await page.getByRole('heading', { level: 1, name: /Today · Artist/ }).waitFor();
      await page.getByTestId('home-applications').getByText('Juno Castellane: Scar appliance').waitFor();
      expect(await page.getByText('Nothing needs doing today.').count()).toBe(0);
      // The next steps stay on the page, the check first.
      expect((await page.getByTestId('start-actions').first().getByRole('link').allTextContents())[0]).toBe('Run a check');
    });
  });

  it('every staff seat’s home offers one or two next steps, whatever the day holds', async () => {
    // A sign-in starts on the seat last chosen, which other files may change: each seat's first step is read from the heading.
    const firstStep: Record<string, string> = {
      'Department head': 'Register a performer',
      'Designated lead': 'Performers',
      Artist: 'Run a check',
      Archivist: 'Find a cast',
      'Studio administrator': 'Give someone a role',
    };
    for (const email of ['head@plinth.test', 'lead@plinth.test', 'archivist@plinth.test', 'admin@plinth.test']) {
      await withPage(TABLET_PORTRAIT, async (page) => {
        await signInThroughIdp(page, appUrl, email, DEMO_PASSWORD);
        const heading = page.getByRole('heading', { level: 1, name: /^Today · / });
        await heading.waitFor();
        const seat = (await heading.textContent())!.replace(/^Today · /, '').trim();
        expect(Object.keys(firstStep), email).toContain(seat);
        const actions = page.getByTestId('start-actions').getByRole('link');
        await actions.first().waitFor();
        const labels = await actions.allTextContents();
        expect(labels.length, email).toBeGreaterThanOrEqual(1);
        expect(labels.length, email).toBeLessThanOrEqual(2);
        expect(labels[0], email).toBe(firstStep[seat]);
      });
    }
  });

  it('a performer’s home shows their next session and what waits for them to sign, in their own words', async () => {
    await withPage(TABLET_PORTRAIT, async (page) => {
      await signInThroughIdp(page, appUrl, 'performer@plinth.test', DEMO_PASSWORD);
      await page.getByRole('heading', { level: 1, name: 'Hello, Juno' }).waitFor();
      const next = page.locator('[data-task="my-next-session"]');
      await next.waitFor();
      // Juno has a session booked in the demo data; its time is worded by the browser (en-GB here).
      expect(await next.getByTestId('task-items').textContent()).toMatch(/\d{1,2} [A-Z][a-z]{2,8} \d{4}/);
      await page.locator('[data-task="my-forms-to-sign"]').waitFor();
      const text = await page.evaluate(() => document.body.innerText);
      for (const staffWord of ['Acting as', 'Performer ·', 'Designated lead', 'Department head']) expect(text).not.toContain(staffWord);
      await expectAccessible(page, 'performer home');
    });
  });
});

describe('the performer page leads with what staff act on', () => {
  it('name, character and production, the consent summary, the clearance table and an index of sections', async () => {
    await withPage(TABLET_PORTRAIT, async (page) => {
      await signInThroughIdp(page, appUrl, 'lead@plinth.test', DEMO_PASSWORD);
      await page.getByRole('heading', { level: 1, name: /Today/ }).waitFor();
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Performers', exact: true }).click();
      await page.getByTestId('performers-table').getByRole('link', { name: /Juno Castellane/ }).click();
      await page.getByRole('heading', { level: 1, name: 'Juno Castellane' }).waitFor();
      expect(await page.getByTestId('engagement-line').textContent()).toBe('The Keeper in The Lantern Keeper');
      const summary = page.getByTestId('consent-summary');
      expect(await summary.textContent()).toContain('Consents on The Lantern Keeper');
      expect(await summary.getByTestId('summary-in-force').textContent()).toMatch(/^In force: /);
      // The patch-test log fills the clearances section: the screening label and a clearance per product.
      const clearances = page.getByTestId('patch-tests-section');
      await clearances.getByTestId('clearance-table').waitFor();
      expect(await clearances.getByTestId('screening-label').textContent()).toContain('Screening, not diagnosis');

      // The summary sits above the sections, and the sections come in the order staff act on them.
      const top = async (testId: string) => (await page.getByTestId(testId).boundingBox())!.y;
      expect(await top('consent-summary')).toBeLessThan(await top('consents-section'));
      expect(await top('consents-section')).toBeLessThan(await top('sessions-section'));
      expect(await top('sessions-section')).toBeLessThan(await top('contact-section'));

      const index = page.getByRole('navigation', { name: 'On this page' });
      await index.getByRole('link', { name: 'Sessions' }).click();
      await page.waitForURL(/#sessions$/);
      expect((await page.getByTestId('sessions-section').boundingBox())!.y).toBeLessThan(TABLET_PORTRAIT.height / 2);
      await expectAccessible(page, 'performer page');
    });
  });
});

describe('the header names the production the page shows', () => {
  it('opening a cast of another of the archivist’s productions switches the seat to it', async () => {
    const cast = await db.db
      .selectFrom('casts as c')
      .innerJoin('productions as p', 'p.id', 'c.production_id')
      .select('c.id')
      .where('p.name', '=', 'The Lantern Keeper')
      .orderBy('c.id')
      .executeTakeFirstOrThrow();
    await withPage(TABLET_LANDSCAPE, async (page) => {
      await signInThroughIdp(page, appUrl, 'archivist@plinth.test', DEMO_PASSWORD);
      await page.getByRole('heading', { level: 1, name: /Today · Archivist/ }).waitFor();
      await page.getByTestId('account-control').getByRole('button', { name: /Nell Achterberg/ }).click();
      await page.getByRole('group', { name: 'Acting as' }).getByRole('radio', { name: 'Saltglass Mile — Archivist' }).click();
      await page.getByTestId('acting-context').getByText('Saltglass Mile · Archivist').waitFor();

      await page.goto(`${appUrl}/archive/casts/${cast.id}`);
      await page.getByTestId('acting-context').getByText('The Lantern Keeper · Archivist').waitFor();
      // The seat can switch before the cast itself has loaded; wait for the cast's line, not the loading note.
      const origin = page.locator('main').getByText(/ · from The Lantern Keeper · /);
      await origin.waitFor();
      expect(await origin.textContent()).toContain('from The Lantern Keeper');
    });
  });
});
