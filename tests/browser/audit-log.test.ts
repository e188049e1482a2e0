import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../fake-idp/accounts.ts';
import { expectAccessible, launchBrowser, signInThroughIdp, TABLET_PORTRAIT, tabletContext } from '../support/browser.ts';

// The demo database is shared by every browser test file. This one only reads: the entries it
// filters are the health-data reads its own visits to two performer pages write.
const appUrl = inject('appUrl');
let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

async function openPerformer(page: Page, name: RegExp) {
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Performers', exact: true }).click();
  await page.getByTestId('performers-table').getByRole('link', { name }).click();
  await page.getByTestId('health-summary').waitFor();
}

/** The "Record" words of every row the table shows now. */
const rowTexts = (page: Page) => page.getByTestId('audit-table').locator('tbody tr').allTextContents();

describe('the audit log at 768 × 1024', () => {
  it('the designated lead opens it from the navigation and filters it by performer', async () => {
    const context = await tabletContext(browser, TABLET_PORTRAIT);
    const page = await context.newPage();
    try {
      await signInThroughIdp(page, appUrl, 'lead@plinth.test', DEMO_PASSWORD);
      await page.getByRole('heading', { level: 1, name: /Today · Designated lead/ }).waitFor();
      // Juno Castellane's health summary read: the newest entries are about her.
      await openPerformer(page, /Juno Castellane/);

      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Audit log', exact: true }).click();
      await page.getByRole('heading', { level: 1, name: 'Audit log' }).waitFor();
      expect(new URL(page.url()).pathname).toBe('/audit');
      await page.getByTestId('audit-table').getByText('of Juno Castellane').first().waitFor();
      const before = await rowTexts(page);
      // The unfiltered page holds entries about others too (or about no performer), for the filter to remove.
      expect(before.some((r) => !r.includes('Juno Castellane'))).toBe(true);
      // Words, never event codes.
      expect(before.some((r) => r.includes('Read health details'))).toBe(true);
      expect(before.join(' ')).not.toMatch(/medical\.read|consent\.sign|auth\.sign_in/);
      // The lead reads one production: no production picker.
      expect(await page.getByLabel('Production', { exact: true }).count()).toBe(0);
      await expectAccessible(page, "the lead's audit log");

      const performer = page.getByLabel('Performer', { exact: true });
      await performer.locator('option', { hasText: 'Juno Castellane' }).waitFor({ state: 'attached' });
      await performer.selectOption({ label: 'Juno Castellane' });
      await expect.poll(() => new URL(page.url()).searchParams.get('performer')).toMatch(/^[0-9a-f-]{36}$/);
      await expect
        .poll(async () => {
          const rows = await rowTexts(page);
          return rows.length > 0 && rows.every((r) => r.includes('of Juno Castellane'));
        })
        .toBe(true);
      await expectAccessible(page, "the lead's audit log, one performer");

      // An old link to the administrator's page lands on the log, its filters kept.
      await page.goto(`${appUrl}/admin/audit?action=medical.read`);
      await page.getByRole('heading', { level: 1, name: 'Audit log' }).waitFor();
      await expect.poll(() => `${new URL(page.url()).pathname}${new URL(page.url()).search}`).toBe('/audit?action=medical.read');
      expect(await page.getByLabel('What happened', { exact: true }).inputValue()).toBe('medical.read');
    } finally {
      await context.close();
    }
  });

  it('the administrator has it in the navigation too, with a production picker', async () => {
    const context = await tabletContext(browser, TABLET_PORTRAIT);
    const page = await context.newPage();
    try {
      await signInThroughIdp(page, appUrl, 'admin@plinth.test', DEMO_PASSWORD);
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Audit log', exact: true }).click();
      await page.getByRole('heading', { level: 1, name: 'Audit log' }).waitFor();
      const production = page.getByLabel('Production', { exact: true });
      await production.locator('option', { hasText: 'The Lantern Keeper' }).waitFor({ state: 'attached' });
      await production.selectOption({ label: 'The Lantern Keeper' });
      await expect.poll(() => new URL(page.url()).searchParams.get('production')).toMatch(/^[0-9a-f-]{36}$/);
      await expect
        .poll(async () => {
          const rows = await rowTexts(page);
          return rows.length > 0 && rows.every((r) => r.includes('on The Lantern Keeper'));
        })
        .toBe(true);
      await expectAccessible(page, "the administrator's audit log, one production");
    } finally {
      await context.close();
    }
  });
});
