// Clearances where staff act on them, on a portrait tablet: the performer page's one-line clearance
// summary and its Untested note, and the patch-test booking form's warning when the performer has no
// patch-testing consent. The demo database is shared by every browser test file; these tests only read:
// Oswin Parfitt-Reyes's clearances (his demo test reacted) and, on the booking form, Juno (who has a
// patch-testing consent) and Cory Ashdown (who never gets one in any test). Nothing is booked or sent.
import type { Browser, Locator, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../fake-idp/accounts.ts';
import { expectAccessible, launchBrowser, signInThroughIdp, TABLET_PORTRAIT, withTabletPage } from '../support/browser.ts';

const appUrl = inject('appUrl');
let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const withPage = (run: (page: Page) => Promise<void>) => withTabletPage(browser, TABLET_PORTRAIT, run);

async function noSidewaysScroll(page: Page, label: string) {
  const width = await page.evaluate(() => document.documentElement.scrollWidth);
  expect(width, `${label} scrolls sideways`).toBeLessThanOrEqual(TABLET_PORTRAIT.width);
}

/** Chooses the option whose words match, once the list has it. */
async function choose(select: Locator, words: RegExp) {
  const find = async () => {
    const options = await select.locator('option').evaluateAll((os) => os.map((o) => ({ value: (o as HTMLOptionElement).value, text: o.textContent ?? '' })));
    return options.find((o) => words.test(o.text));
  };
  await expect.poll(find, { message: `an option ${words}` }).toBeDefined();
  await select.selectOption((await find())!.value);
}

describe('the performer page sums up clearances (head, portrait tablet)', () => {
  it('counts each state as the table below lists it, and says every product not listed is Untested', async () => {
    await withPage(async (page) => {
      await signInThroughIdp(page, appUrl, 'head@plinth.test', DEMO_PASSWORD);
      await page.getByRole('heading', { level: 1, name: /Today/ }).waitFor();
      await page.goto(`${appUrl}/performers?q=Oswin`);
      await page.getByRole('link', { name: /Oswin Parfitt-Reyes/ }).first().click();
      const summary = page.getByTestId('clearance-summary');
      await summary.waitFor();

      // The counts on the line are the tables' own rows, state by state: the table proper and the
      // products sharing an ingredient with a reaction (the demo's fit on one page).
      const table = page.getByTestId('patch-tests-section').getByRole('table', { name: 'Clearance per product' });
      await table.waitFor();
      const shared = page.getByTestId('shared-cautions').getByRole('table', { name: 'Products sharing an ingredient with a product that reacted' });
      await shared.waitFor();
      const rows = [...(await table.locator('tbody tr').allTextContents()), ...(await shared.locator('tbody tr').allTextContents())];
      expect(rows.length).toBeGreaterThan(0);
      const listed = (label: string) => rows.filter((r) => r.includes(label)).length;
      const shown = async (state: string) => {
        const text = (await summary.getByTestId(`clearance-summary-${state}`).textContent())!;
        const m = /^(Do not use|Caution|Pending|Cleared): (\d+)$/.exec(text.trim());
        expect(m, `the ${state} chip reads "${text}"`).not.toBeNull();
        return { label: m![1]!, count: Number(m![2]) };
      };
      const counts: Record<string, number> = {};
      for (const state of ['do_not_use', 'caution', 'pending', 'cleared']) {
        const { label, count } = await shown(state);
        expect(count, label).toBe(listed(label));
        counts[state] = count;
      }
      // His demo test reacted (Do not use) and a sealer shares its ingredient (Caution).
      expect(counts.do_not_use).toBeGreaterThanOrEqual(1);
      expect(counts.caution).toBeGreaterThanOrEqual(1);
      expect(await summary.getByTestId('clearance-summary-untested').textContent()).toBe('Any other product: Untested');
      // States only: no grade reaches the head's line.
      expect(await summary.textContent()).not.toMatch(/\+|positive|doubtful/i);

      // The line sits with the consents line, above the sections.
      const top = async (testId: string) => (await page.getByTestId(testId).boundingBox())!.y;
      expect(await top('consent-summary')).toBeLessThan(await top('clearance-summary'));
      expect(await top('clearance-summary')).toBeLessThan(await top('consents-section'));

      // A product missing from the table is Untested, in so many words.
      const note = page.getByTestId('patch-tests-section').getByTestId('untested-note');
      const words = (await note.textContent())!;
      expect(words).toContain('Any product not listed here is');
      expect(words).toContain('Untested');
      expect(words).toContain('must be treated as untested');
      await noSidewaysScroll(page, 'performer page');
      await expectAccessible(page, 'performer page with the clearance summary');
    });
  });
});

describe('booking a patch test without a patch-testing consent (head, portrait tablet)', () => {
  it('warns as soon as the performer is chosen and offers the form on the tablet or by link', async () => {
    await withPage(async (page) => {
      await signInThroughIdp(page, appUrl, 'head@plinth.test', DEMO_PASSWORD);
      await page.getByRole('heading', { level: 1, name: /Today · Department head/ }).waitFor();
      await page.goto(`${appUrl}/patch-tests/new`);
      await page.getByRole('heading', { level: 1, name: 'Book a patch test' }).waitFor();
      const form = page.getByTestId('book-test-form');

      // Juno has a patch-testing consent on The Lantern Keeper: the server's answer brings no warning.
      const junoAnswer = page.waitForResponse((r) => r.url().includes('/api/bookings/consent-check') && r.url().includes('purpose=patch_test'));
      await choose(form.getByLabel('Performer'), /Juno/);
      expect(await (await junoAnswer).json()).toMatchObject({ kind: 'patch_testing', missing: false });
      expect(await form.getByTestId('book-test-consent-gate').count()).toBe(0);

      // Cory has none: the warning comes before any time is typed, with the form to send.
      await choose(form.getByLabel('Performer'), /Cory Ashdown/);
      const gate = form.getByTestId('book-test-consent-gate');
      await gate.waitFor();
      const text = (await gate.textContent())!;
      expect(text).toContain('Cory Ashdown has no active patch-testing consent for The Lantern Keeper.');
      expect(text).toContain('it is saved as waiting for consent');
      const send = gate.getByTestId('send-form-now');
      await send.getByRole('button', { name: 'Sign on this tablet now' }).waitFor();
      await send.getByRole('button', { name: 'Send a link by e-mail' }).waitFor();
      expect(await send.textContent()).toMatch(/Send the form now: “.+”/);

      // With a time typed, the warning speaks of the test's start.
      await form.getByLabel('Date and time').fill(
        await page.evaluate(() => {
          const d = new Date(Date.now() + 26 * 3_600_000);
          d.setMinutes(d.getMinutes() - d.getTimezoneOffset());
          return d.toISOString().slice(0, 16);
        }),
      );
      await gate.getByText(/for The Lantern Keeper when the test starts\./).waitFor();
      // The test can still be booked.
      expect(await form.getByRole('button', { name: 'Book the test' }).isEnabled()).toBe(true);
      await noSidewaysScroll(page, 'booking form with its warning');
      await expectAccessible(page, 'booking a patch test without consent');
    });
  });
});
