import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../fake-idp/accounts.ts';
import { expectAccessible, launchBrowser, signInThroughIdp, TABLET_PORTRAIT, tabletContext } from '../support/browser.ts';

// The demo database is shared by every browser test file. This one confirms the lead's look at
// Juno Castellane's health answers (no other test reads the lead's reviews).
const appUrl = inject('appUrl');
let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe("the designated lead's home", () => {
  it('lists health answers that need a look and withdrawals with their reasons; confirming clears one; the performer page gathers every answer (portrait)', async () => {
    const context = await tabletContext(browser, TABLET_PORTRAIT);
    const page = await context.newPage();
    try {
      await signInThroughIdp(page, appUrl, 'lead@plinth.test', DEMO_PASSWORD);
      await page.getByRole('heading', { level: 1, name: /Today · Designated lead/ }).waitFor();
      const worklist = page.getByTestId('health-worklist');
      const juno = worklist.getByTestId('health-worklist-performer').filter({ hasText: 'Juno Castellane' });
      await juno.waitFor();
      expect(await juno.textContent()).toContain('Use of your health information');
      expect(await worklist.getByRole('note').textContent()).toContain('every view is logged');
      const withdrawals = page.getByTestId('withdrawals-section');
      await withdrawals.getByText('No longer comfortable with face casting').waitFor();
      await expectAccessible(page, "lead's home");

      await juno.getByRole('button', { name: /I have looked at these/ }).click();
      await expect.poll(() => juno.count(), { timeout: 10_000 }).toBe(0);

      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Performers', exact: true }).click();
      await page.getByTestId('performers-table').getByRole('link', { name: /Juno Castellane/ }).click();
      const summary = page.getByTestId('health-summary');
      await summary.getByText('Sticking plasters make my skin itch').waitFor();
      expect(await summary.textContent()).toContain('Consent to skin patch testing');
      await expectAccessible(page, 'performer page with the health summary');
    } finally {
      await context.close();
    }
  });
});
