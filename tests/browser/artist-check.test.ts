// The artist's check on a landscape tablet (1024×768, touch): from a kit plus a product one by one, a
// Caution asked of the lead, the lead's answer arriving on the artist's screen without a reload, and
// the application logged. Then the performer's card scanned with the tablet camera opens the check.
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../fake-idp/accounts.ts';
import { qrPng } from '../../api/files/qr.ts';
import { expectAccessible, launchBrowser, signInThroughIdp, TABLET_LANDSCAPE, tabletContext } from '../support/browser.ts';
import { type FakeCamera, fakeCameraFromImage } from '../support/fake-camera.ts';

const appUrl = inject('appUrl');
let browser: Browser;

beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

function nav(page: Page) {
  return page.getByRole('navigation', { name: 'Main' });
}

async function expectTouchTargets(page: Page, scope: string) {
  for (const control of await page.getByTestId(scope).locator('button, select, input[type="radio"] >> xpath=..').all()) {
    const box = await control.boundingBox();
    if (!box) continue;
    expect(box.height, `${scope}: ${await control.evaluate((el) => el.outerHTML.slice(0, 80))}`).toBeGreaterThanOrEqual(44);
  }
}

describe('the check on a landscape tablet', () => {
  it('an artist checks from a kit, asks the lead about a Caution, sees the answer arrive, and logs the application', async () => {
    const artistContext = await tabletContext(browser, TABLET_LANDSCAPE);
    const leadContext = await tabletContext(browser, TABLET_LANDSCAPE);
    const page = await artistContext.newPage();
    const lead = await leadContext.newPage();
    try {
      await signInThroughIdp(page, appUrl, 'artist@plinth.test', DEMO_PASSWORD);
      await page.getByRole('heading', { level: 1, name: /Today · Artist/ }).waitFor();
      await page.getByTestId('home-applications').waitFor();
      await nav(page).getByRole('link', { name: 'Check', exact: true }).click();
      await page.getByRole('heading', { level: 1, name: 'Check before an application' }).waitFor();
      const cautions = page.getByRole('complementary', { name: 'Before you apply' });
      for (const words of ['not a medical diagnosis', 'burning, itching or swelling', 'ventilation', 'local regulations']) expect(await cautions.textContent()).toContain(words);

      await page.getByLabel('Search by name').fill('Juno');
      await page.getByRole('button', { name: 'Juno Castellane' }).click();
      await expect.poll(() => page.getByTestId('checked-performer').textContent()).toBe('Juno Castellane');
      await page.getByRole('radio', { name: /Day 12 — scar appliance/ }).check();
      await page.getByLabel('Filter products').fill('Flotsam');
      await page.getByRole('checkbox', { name: 'Flotsam prosthetic adhesive' }).check();
      await expectAccessible(page, 'check form');
      await expectTouchTargets(page, 'check-products');
      await page.getByRole('button', { name: 'Run the check' }).click();

      const verdict = page.getByTestId('verdict');
      await verdict.waitFor();
      expect(await verdict.textContent()).toMatch(/^Stop: 1 product holds this up: Flotsam prosthetic adhesive \(Caution\)/);
      const items = page.getByTestId('check-item');
      await expect.poll(() => items.count()).toBe(5);
      expect(await items.filter({ hasText: 'Harbour Bond silicone adhesive' }).textContent()).toContain('Cleared');
      await expectAccessible(page, 'check result');
      await page.getByRole('button', { name: 'Ask the lead about Flotsam prosthetic adhesive' }).click();
      await page.getByText(/Asked the lead at .*; waiting for an answer/).waitFor();

      // The lead, on their own tablet, answers from their home.
      await signInThroughIdp(lead, appUrl, 'lead@plinth.test', DEMO_PASSWORD);
      await lead.getByTestId('home-requests').getByRole('link', { name: /Juno Castellane: Flotsam prosthetic adhesive/ }).first().click();
      await lead.getByRole('heading', { level: 1, name: /Flotsam prosthetic adhesive for Juno Castellane/ }).waitFor();
      await expectAccessible(lead, 'lead request');
      await lead.getByLabel('Note for the health record').fill('A thin layer along the jaw only; remove at any itching');
      await lead.getByRole('button', { name: 'Approve' }).click();
      await lead.getByText(/^Approved by Dr\. Tomasz Brill/).waitFor();

      // The artist's screen picks the answer up by itself.
      await page.getByText(/^Approved by Dr\. Tomasz Brill/).waitFor({ timeout: 20_000 });
      await expect.poll(() => verdict.textContent()).toBe('Go: every product is cleared or approved by the designated lead.');
      expect(await page.content()).not.toContain('A thin layer along the jaw');

      const form = page.getByRole('form', { name: 'Log the application' });
      await form.getByLabel('Appliance or description').fill('Scar appliance along the left jaw');
      await form.getByRole('checkbox', { name: 'Used Pier silicone adhesive remover' }).uncheck();
      await expectAccessible(page, 'log form');
      await form.getByRole('button', { name: 'Log the application' }).click();
      await page.getByRole('heading', { level: 1, name: 'Application for Juno Castellane' }).waitFor();
      const products = page.getByTestId('application-products');
      for (const name of ['Harbour Bond silicone adhesive', 'Flotsam prosthetic adhesive', 'Dune barrier cream']) expect(await products.textContent()).toContain(name);
      expect(await page.getByTestId('application-check').textContent()).toContain('approved by the lead');
      await expectAccessible(page, 'application page');
    } finally {
      await artistContext.close();
      await leadContext.close();
    }
  });
});

describe('the performer’s card scanned on the check screen', () => {
  let camera: FakeCamera | undefined;
  let cameraBrowser: Browser | undefined;
  afterAll(async () => {
    await cameraBrowser?.close();
    await camera?.dispose();
  });

  it('the tablet camera reads the card’s QR code and the check opens with that performer', async () => {
    // Find Juno's record as the artist would, to print the code her card carries.
    const context = await tabletContext(browser, TABLET_LANDSCAPE);
    const page = await context.newPage();
    let performerId = '';
    try {
      await signInThroughIdp(page, appUrl, 'artist@plinth.test', DEMO_PASSWORD);
      await nav(page).getByRole('link', { name: 'Performers' }).click();
      await page.getByRole('heading', { level: 1, name: /Performers/ }).waitFor();
      await page.getByRole('link', { name: /^Juno Castellane/ }).first().click();
      await expect.poll(() => new URL(page.url()).pathname).toMatch(/^\/performers\/[0-9a-f-]{36}$/);
      performerId = new URL(page.url()).pathname.split('/').at(-1)!;
      await page.getByTestId('performer-card').waitFor();
    } finally {
      await context.close();
    }

    camera = await fakeCameraFromImage(await qrPng(`${appUrl}/check?performerId=${performerId}`));
    cameraBrowser = await launchBrowser(camera.deviceArgs);
    const scanning = await tabletContext(cameraBrowser, TABLET_LANDSCAPE);
    await scanning.grantPermissions(['camera']);
    const tablet = await scanning.newPage();
    try {
      await signInThroughIdp(tablet, appUrl, 'artist@plinth.test', DEMO_PASSWORD);
      await nav(tablet).getByRole('link', { name: 'Check', exact: true }).click();
      await tablet.getByRole('button', { name: 'Scan the performer’s card' }).click();
      await expect.poll(() => tablet.getByTestId('checked-performer').textContent(), { timeout: 20_000 }).toBe('Juno Castellane');
      expect(new URL(tablet.url()).searchParams.get('performerId')).toBe(performerId);
      await expectAccessible(tablet, 'check after scanning');
    } finally {
      await scanning.close();
    }
  });
});
