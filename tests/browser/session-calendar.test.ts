import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../fake-idp/accounts.ts';
import { expectAccessible, launchBrowser, signInThroughIdp, TABLET_PORTRAIT, tabletContext } from '../support/browser.ts';

// The demo database is shared by every browser test file. This one books a life cast for Bea
// Nwachukwu next week (no other test books for her): her life-casting consent was withdrawn.
const appUrl = inject('appUrl');
let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

describe('sessions as a calendar', () => {
  it('the head books from the week view; the gate speaks at once; the session shows with its artist and lost consent, its state in reach in portrait', async () => {
    const context = await tabletContext(browser, TABLET_PORTRAIT);
    const page = await context.newPage();
    try {
      await signInThroughIdp(page, appUrl, 'head@plinth.test', DEMO_PASSWORD);
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Sessions' }).click();
      const calendar = page.getByTestId('session-calendar');
      await calendar.getByTestId('calendar-day').first().waitFor();
      expect(await calendar.getByTestId('calendar-day').count()).toBe(7);
      await expectAccessible(page, 'sessions calendar, week');

      await calendar.getByRole('button', { name: 'Next week' }).click();
      const monday = calendar.getByTestId('calendar-day').first();
      const dayName = (await monday.getByRole('heading', { level: 4 }).textContent())!;
      expect(dayName).toMatch(/^Monday /);
      await monday.getByRole('button', { name: /Book on this day.*Monday/ }).click();

      const dialog = page.getByRole('dialog', { name: /Book a session on Monday/ });
      await dialog.getByLabel('Performer').selectOption({ label: 'Bea Nwachukwu' });
      const form = dialog.getByTestId('booking-form');
      await form.getByLabel('Purpose').selectOption({ label: 'Life cast' });
      // The day chosen on the calendar is already filled in; the end follows on the same day.
      const starts = await form.getByLabel('Starts').inputValue();
      expect(starts).toMatch(/T09:00$/);
      await form.getByLabel('Ends').fill(starts.replace('T09:00', 'T11:30'));
      await form.getByLabel('Place').fill('Casting workshop');
      await form.getByLabel('Artist').selectOption({ label: 'Rafe Lindqvist' });
      // Before anything is saved, the form says the consent will not be in force.
      await form.getByTestId('booking-gate').waitFor();
      expect(await form.getByTestId('caution').textContent()).toContain('Never cover the nostrils or airway.');
      await expectAccessible(page, 'booking from the calendar');
      await form.getByRole('button', { name: 'Book the session' }).click();
      const done = dialog.getByTestId('booking-done');
      await done.getByText('It is waiting for consent.').waitFor();
      await done.getByRole('button', { name: 'Sign on this tablet now' }).waitFor();
      await done.getByRole('button', { name: 'Send a link by e-mail' }).waitFor();
      await page.keyboard.press('Escape');

      const card = calendar.getByTestId('calendar-session').filter({ hasText: 'Bea Nwachukwu' });
      await card.waitFor();
      const text = (await card.textContent())!;
      expect(text).toContain('09:00 – 11:30');
      expect(text).toContain('Artist: Rafe Lindqvist');
      expect(text).toContain('Casting workshop');
      // Her life-casting consent was withdrawn: the card says so, not merely "waiting".
      await card.getByText('Consent withdrawn').waitFor();
      const gate = await card.getByTestId('consent-missing').boundingBox();
      expect(gate!.x + gate!.width).toBeLessThanOrEqual(768);

      await calendar.getByRole('button', { name: 'Day', exact: true }).click();
      await expect.poll(() => calendar.getByTestId('calendar-day').count(), { timeout: 10_000 }).toBe(1);
      await expectAccessible(page, 'sessions calendar, day');
    } finally {
      await context.close();
    }
  });

  it('words its days in the browser’s own locale (a German tablet here), not a fixed one', async () => {
    const context = await tabletContext(browser, TABLET_PORTRAIT, { locale: 'de-DE' });
    const page = await context.newPage();
    try {
      await signInThroughIdp(page, appUrl, 'head@plinth.test', DEMO_PASSWORD);
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Sessions' }).click();
      const calendar = page.getByTestId('session-calendar');
      await calendar.getByTestId('calendar-day').first().waitFor();
      // CLDR's German patterns: "Montag, 7. Dezember" for a day, "7. Dezember 2026" in the week's title.
      const days = await calendar.getByTestId('calendar-day').getByRole('heading', { level: 4 }).allTextContents();
      expect(days[0]).toMatch(/^Montag, \d{1,2}\. \p{L}+$/u);
      expect(days.at(-1)).toMatch(/^Sonntag, \d{1,2}\. \p{L}+$/u);
      expect(await calendar.getByTestId('calendar-title').textContent()).toMatch(/^\d{1,2}\. \p{L}+ \d{4} – \d{1,2}\. \p{L}+ \d{4}$/u);
    } finally {
      await context.close();
    }
  });
});
