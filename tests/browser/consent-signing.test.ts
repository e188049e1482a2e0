import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../fake-idp/accounts.ts';
import { expectAccessible, launchBrowser, signInThroughIdp, TABLET_LANDSCAPE, TABLET_PORTRAIT, tabletContext } from '../support/browser.ts';

// The demo database is shared by every browser test file. These tests use records no other test
// touches: Halvard Imre Solberg (no consents at the start) for signing, and Juno Castellane's
// life-casting consent for withdrawing (her application consent stays: the artist's check test logs an
// application for her, and the files share one database in whatever order they run).
const appUrl = inject('appUrl');
let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

/** As the department head: find Halvard through the search box and open his page. */
async function openHalvard(page: Page): Promise<void> {
  await signInThroughIdp(page, appUrl, 'head@plinth.test', DEMO_PASSWORD);
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Performers', exact: true }).click();
  await page.getByTestId('performers-table').waitFor();
  await page.getByLabel('Search by name').fill('halvard');
  await page.waitForURL(/[?&]q=halvard/);
  // The old page of results stays on screen (marked busy) until the search answers.
  await expect.poll(() => page.getByTestId('performer-link').count(), { timeout: 10_000 }).toBe(1);
  const link = page.getByTestId('performers-table').getByRole('link', { name: /Halvard Imre Solberg/ });
  await link.click();
  await page.getByRole('heading', { level: 1, name: 'Halvard Imre Solberg' }).waitFor();
}

/** "Ask to sign…" → choose the form → "Sign here on this tablet": the tablet now shows only that form. */
async function lendTabletFor(page: Page, formTitle: string): Promise<void> {
  await page.getByRole('button', { name: 'Ask to sign…' }).click();
  const dialog = page.getByRole('dialog', { name: /Ask .* to sign/ });
  await dialog.getByRole('checkbox', { name: new RegExp(formTitle) }).check();
  await dialog.getByRole('button', { name: 'Sign here on this tablet' }).click();
  await page.waitForURL((url) => url.pathname === '/tablet');
  await page.getByRole('heading', { level: 1, name: formTitle }).waitFor();
}

/** A signature drawn the way a finger does it: press, a curving path of moves, lift. */
async function drawSignature(page: Page): Promise<void> {
  const canvas = page.getByTestId('signature-canvas');
  await canvas.scrollIntoViewIfNeeded();
  const box = await canvas.boundingBox();
  if (!box) throw new Error('the signature canvas has no box');
  const y0 = box.y + box.height * 0.6;
  await page.mouse.move(box.x + box.width * 0.1, y0);
  await page.mouse.down();
  for (let i = 1; i <= 40; i++) {
    const t = i / 40;
    await page.mouse.move(box.x + box.width * (0.1 + 0.75 * t), y0 - Math.sin(t * Math.PI * 3) * box.height * 0.25);
  }
  await page.mouse.up();
  // A second stroke, like crossing a letter.
  await page.mouse.move(box.x + box.width * 0.3, box.y + box.height * 0.3);
  await page.mouse.down();
  for (let i = 1; i <= 10; i++) await page.mouse.move(box.x + box.width * (0.3 + 0.03 * i), box.y + box.height * 0.3 + i);
  await page.mouse.up();
}

async function bodyText(page: Page): Promise<string> {
  return page.evaluate(() => document.body.innerText);
}

describe('signing a consent on the department’s tablet', () => {
  it('the head lends the tablet; the performer signs with a finger; the hand-back screen shows nothing and needs a password to leave (portrait)', async () => {
    const context = await tabletContext(browser, TABLET_PORTRAIT);
    const page = await context.newPage();
    try {
      await openHalvard(page);
      await lendTabletFor(page, 'Consent to skin patch testing');

      // The exact text, no shell, no staff navigation.
      expect(await page.getByTestId('signing-text').textContent()).toContain('This is a screening test for the department');
      expect(await page.getByRole('navigation', { name: 'Main' }).count()).toBe(0);
      expect(await page.getByTestId('signing-performer').textContent()).toBe('Halvard Imre Solberg');
      expect(await page.getByTestId('caution').textContent()).toContain('it is not a medical diagnosis');
      const agree = page.getByRole('checkbox', { name: 'I have read this and I agree' });
      expect(await agree.isChecked()).toBe(false);
      await expectAccessible(page, 'tablet signing form (portrait)');

      // The questionnaire: big yes/no radios and a short text.
      const allergy = 'Nickel in cheap earrings';
      await page.getByTestId('question-known_allergies').getByRole('textbox').fill(allergy);
      await page.getByTestId('question-skin_condition').getByRole('radio', { name: 'No', exact: true }).check();
      await page.getByTestId('question-medication').getByRole('radio', { name: 'No', exact: true }).check();
      await page.getByTestId('question-sun').getByRole('radio', { name: 'No', exact: true }).check();
      await page.getByTestId('question-photos_ok').getByRole('radio', { name: 'Yes', exact: true }).check();
      await page.getByLabel('Your full name').fill('Halvard Imre Solberg');
      await agree.check();

      // No signature yet: the error sits by the signature box, and nothing is sent.
      await page.getByRole('button', { name: 'Sign and submit' }).click();
      await page.getByTestId('signature-error').waitFor();
      expect(await page.getByTestId('signature-error').textContent()).toContain('Sign in the box');
      expect(page.url()).toBe(`${appUrl}/tablet`);

      await drawSignature(page);
      await page.getByText('Your signature is in the box.').waitFor({ state: 'attached' });
      expect(await page.getByTestId('signature-error').count()).toBe(0);
      await page.getByRole('button', { name: 'Sign and submit' }).click();

      // Hand-back: thanks, and nothing of what was entered.
      await page.getByTestId('handback').waitFor();
      expect(await page.getByRole('heading', { level: 1 }).textContent()).toBe('Thank you.');
      const shown = await bodyText(page);
      expect(shown).toContain('Please hand the tablet back to the department.');
      for (const secret of [allergy, 'Halvard', 'Solberg', 'patch testing', 'Consent to skin']) expect(shown).not.toContain(secret);
      expect(await page.locator('input, textarea, select, canvas').count()).toBe(0);
      await expectAccessible(page, 'hand-back screen');

      // Back does not bring the form (or any staff page) back.
      await page.goBack();
      await page.getByTestId('handback').waitFor();
      expect(await bodyText(page)).not.toContain(allergy);
      expect(await page.getByTestId('signing-form').count()).toBe(0);

      // Nor does typing a staff address: it ends on the tablet's screen, never on the performer list.
      await page.goto(`${appUrl}/performers`);
      await page.getByTestId('handback').or(page.getByRole('link', { name: 'Sign in' })).first().waitFor();
      expect(['/tablet', '/signin']).toContain(new URL(page.url()).pathname);
      expect(await page.getByTestId('performers-table').count()).toBe(0);
      expect(await bodyText(page)).not.toContain('Halvard');

      // The one way out: the identity provider asks for the password again.
      await page.getByRole('button', { name: 'Staff: sign in again' }).click();
      await page.getByLabel('Password').waitFor();
      expect(await page.getByLabel('Email').isVisible()).toBe(true);
      expect(await page.getByLabel('Password').isVisible()).toBe(true);
      expect(page.url().startsWith(appUrl)).toBe(false);
    } finally {
      await context.close();
    }
  });

  it('shows the form’s own messages and its caution, and the performer can decline to sign (landscape)', async () => {
    const context = await tabletContext(browser, TABLET_LANDSCAPE);
    const page = await context.newPage();
    try {
      await openHalvard(page);
      await lendTabletFor(page, 'Consent to a life cast');
      expect(await page.getByTestId('caution').textContent()).toContain('Never cover the nostrils or airway.');
      const canvas = await page.getByTestId('signature-canvas').boundingBox();
      expect(canvas?.height).toBeGreaterThanOrEqual(200);
      await expectAccessible(page, 'tablet signing form (landscape)');

      // A sense of progress through the questions.
      expect(await page.getByTestId('answer-progress').textContent()).toMatch(/0 of \d+ questions answered/);

      // Nothing answered: each required question, the name, the agreement and the signature say so.
      await page.getByRole('button', { name: 'Sign and submit' }).click();
      await page.getByTestId('question-area').getByText('Choose one of the options').waitFor();
      expect(await page.getByTestId('question-stop_signal').textContent()).toContain('This answer is required');
      expect(await page.getByTestId('question-breathing').textContent()).toContain('Answer yes or no');
      // Beside the field and again in the summary at the top.
      expect(await page.getByText('Print your full name').count()).toBe(2);
      expect(await page.getByText(/Tick the box to agree/).count()).toBe(2);
      expect(await page.getByTestId('signature-error').count()).toBe(1);

      // Focus is on the first missing answer in the form's order, not on the signature pad.
      const questionOrder = await page.locator('[data-testid^="question-"]').evaluateAll((els) => els.map((e) => e.getAttribute('data-testid')));
      const focusedIn = await page.evaluate(() => document.activeElement?.closest('[data-testid^="question-"]')?.getAttribute('data-testid') ?? document.activeElement?.tagName);
      expect(focusedIn).toBe(questionOrder[0]);
      // The summary lists what is missing in that same order, the signature last.
      const summary = (await page.getByTestId('missing-summary').getByRole('listitem').allTextContents()).map((t) => t.split(':')[0]);
      expect(summary.at(-1)).toBe('Signature');
      expect(summary.slice(-3)).toEqual(['Your full name', 'Agreement', 'Signature']);
      await expectAccessible(page, 'tablet signing form with errors');

      await page.getByRole('button', { name: 'I don’t want to sign now' }).click();
      await page.getByRole('dialog', { name: 'Not signing now?' }).getByRole('button', { name: 'Yes, hand the tablet back' }).click();
      await page.getByTestId('handback').waitFor();
      expect(await bodyText(page)).not.toContain('life cast');
    } finally {
      await context.close();
    }
  });
});

describe('withdrawing a consent as the performer', () => {
  it('Juno opens “My record” and withdraws her life-casting consent in two taps', async () => {
    const context = await tabletContext(browser, TABLET_PORTRAIT);
    const page = await context.newPage();
    try {
      await signInThroughIdp(page, appUrl, 'performer@plinth.test', DEMO_PASSWORD);
      const nav = page.getByRole('navigation', { name: 'Main' });
      await nav.getByRole('link', { name: 'My record' }).click();
      expect(await nav.getByRole('link', { name: 'Performers', exact: true }).count()).toBe(0);
      await page.getByRole('heading', { level: 1, name: 'Juno Castellane' }).waitFor();
      await page.locator('[data-testid="consent-link"][data-kind="life_casting"]').click();
      await page.getByRole('heading', { level: 1, name: 'Consent to a life cast' }).waitFor();
      expect(await page.getByTestId('consent-record').getByTestId('consent-state').textContent()).toContain('Active');
      await expectAccessible(page, 'consent page');

      let taps = 0;
      await page.getByRole('button', { name: 'Withdraw this consent' }).click();
      taps++;
      const dialog = page.getByRole('dialog', { name: 'Withdraw this consent?' });
      expect(await dialog.getByTestId('withdraw-consequences').textContent()).toContain('No new life cast can be taken of you');
      await expectAccessible(page, 'withdraw dialog');
      await dialog.getByRole('button', { name: 'Withdraw consent' }).click();
      taps++;

      await page.getByTestId('consent-record').getByTestId('consent-state').getByText('Withdrawn').waitFor();
      expect(taps).toBe(2);
      expect(await page.getByRole('button', { name: 'Withdraw this consent' }).count()).toBe(0);
      expect(await page.getByRole('dialog').count()).toBe(0);
    } finally {
      await context.close();
    }
  });
});
