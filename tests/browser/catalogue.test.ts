import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../fake-idp/accounts.ts';
import { samplePdf } from '../fixtures/pdfs.ts';
import { expectAccessible, launchBrowser, signInThroughIdp, TABLET_LANDSCAPE, TABLET_PORTRAIT, tabletContext } from '../support/browser.ts';

// The demo database is shared by every browser test file: the product made here has a name of its own.
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

async function signInAsHead(page: Page): Promise<void> {
  await signInThroughIdp(page, appUrl, 'head@plinth.test', DEMO_PASSWORD);
  await page.getByRole('heading', { level: 1, name: /Today · Department head/ }).waitFor();
}

/** Nothing on the page scrolls sideways at this width, not even a table inside its box. */
async function expectNoSidewaysScroll(page: Page, label: string): Promise<void> {
  const [scrollWidth, innerWidth] = await page.evaluate(() => [document.documentElement.scrollWidth, window.innerWidth]);
  expect(scrollWidth, label).toBeLessThanOrEqual(innerWidth);
  const tables = await page.evaluate(() => [...document.querySelectorAll('table')].map((t) => t.parentElement!.scrollWidth - t.parentElement!.clientWidth));
  for (const overflow of tables) expect(overflow, `${label}: a table scrolls sideways`).toBeLessThanOrEqual(1);
}

describe('the catalogue', () => {
  it('a head adds a product by pasting its label, adds the unknown ingredient to the vocabulary, then a lot and its safety data sheet (portrait tablet)', async () => {
    const context = await tabletContext(browser, TABLET_PORTRAIT);
    const page = await context.newPage();
    try {
      await signInAsHead(page);
      await nav(page).getByRole('link', { name: 'Catalogue' }).click();
      await page.getByTestId('products-table').waitFor();
      await expect.poll(() => page.getByTestId('product-link').count()).toBe(22);
      await expectNoSidewaysScroll(page, 'catalogue, every product');
      // The demo catalogue flags its one expired lot in words.
      await page.getByLabel('Lots').selectOption({ label: 'Has expired lots' });
      await expect.poll(() => page.getByTestId('product-link').allTextContents()).toEqual(['Harbour Bond silicone adhesive']);
      expect(await page.getByTestId('expired-lots').textContent()).toContain('1 expired');
      await expectAccessible(page, 'catalogue');

      await page.getByRole('link', { name: 'Add product' }).click();
      const form = page.getByTestId('new-product-form');
      await form.getByLabel('Product name').fill('Lamplighter kelp remover');
      await form.getByLabel('Maker').fill('Pebblecombe Laboratories');
      await form.getByLabel('Category').selectOption({ label: 'Remover' });
      await form.getByLabel('Stays on the skin?').selectOption({ label: 'Rinse-off' });
      await form.getByLabel('Ingredients, as printed on the label').fill('Ingredients: Isopropyl Myristate, Laminaria Moonkelp Extract, Parfum (Fragrance), Limonene*. *Fragrance allergen');
      await form.getByRole('button', { name: 'Match to the vocabulary' }).click();
      const matches = page.getByTestId('label-matches');
      await matches.waitFor();
      await expect.poll(() => matches.getByTestId('label-match').count()).toBe(4);
      expect(await matches.getByTestId('unknown-ingredient').count()).toBe(1);
      expect(await matches.getByTestId('label-match').nth(1).textContent()).toContain('Not in the vocabulary');
      await expectAccessible(page, 'new product with matched label');
      await expectNoSidewaysScroll(page, 'new product');

      // The unknown name goes into the vocabulary from here, and the list matches again.
      await matches.getByRole('button', { name: 'Add Laminaria Moonkelp Extract to the vocabulary' }).click();
      const dialog = page.getByRole('dialog', { name: 'Add to the vocabulary' });
      expect(await dialog.getByLabel('INCI name').inputValue()).toBe('Laminaria Moonkelp Extract');
      await dialog.getByRole('button', { name: 'Add ingredient' }).click();
      // The shared schema asks for the group before anything is sent.
      await dialog.getByText('Choose an allergen group').waitFor();
      await dialog.getByLabel('Allergen group').selectOption({ label: 'Other' });
      await dialog.getByRole('button', { name: 'Add ingredient' }).click();
      await dialog.waitFor({ state: 'hidden' });
      await expect.poll(() => matches.getByTestId('unknown-ingredient').count()).toBe(0);

      await form.getByRole('button', { name: 'Add product' }).click();
      await page.getByRole('heading', { level: 1, name: 'Lamplighter kelp remover' }).waitFor();
      const list = page.getByTestId('ingredient-list');
      expect(await list.getByTestId('ingredient-row').allTextContents()).toEqual([
        expect.stringContaining('Isopropyl Myristate'),
        expect.stringContaining('Laminaria Moonkelp Extract'),
        expect.stringContaining('Parfum (Fragrance)'),
        expect.stringContaining('Limonene'),
      ]);
      expect(await list.getByTestId('ingredient-row').nth(2).textContent()).toContain('Fragrance');
      // A remover carries the solvent caution, in Plinth's words.
      expect(await page.getByRole('complementary', { name: 'Solvents and removers' }).textContent()).toContain('no open flames');

      const lotForm = page.getByTestId('add-lot-form');
      await lotForm.getByLabel('Lot code').fill('LK-2612');
      await lotForm.getByLabel('Last day of use').fill('2028-06-30');
      await lotForm.getByRole('button', { name: 'Add lot' }).click();
      const lots = page.getByTestId('lots-table');
      await lots.getByRole('row').filter({ hasText: 'LK-2612' }).getByText('In date').waitFor();
      // The same code again is refused under its field.
      await lotForm.getByLabel('Lot code').fill('lk-2612');
      await lotForm.getByLabel('Last day of use').fill('2028-07-31');
      await lotForm.getByRole('button', { name: 'Add lot' }).click();
      await lotForm.getByText('This product already has a lot with this code.').waitFor();

      await page.getByTestId('sds-input').setInputFiles({ name: 'lamplighter-sds.pdf', mimeType: 'application/pdf', buffer: await samplePdf('Safety data sheet: Lamplighter') });
      await page.getByTestId('sds-download').waitFor();
      expect(await page.getByTestId('sds-panel').textContent()).toContain('lamplighter-sds.pdf');
      expect(await page.getByTestId('sds-panel').getByTestId('solvent-caution').count()).toBe(1);
      await expectAccessible(page, 'product page');
      await expectNoSidewaysScroll(page, 'product page');
    } finally {
      await context.close();
    }
  });

  it('a head opens the occluded protocol and is told why a D2-only edit cannot be saved (landscape tablet)', async () => {
    const context = await tabletContext(browser, TABLET_LANDSCAPE);
    const page = await context.newPage();
    try {
      await signInAsHead(page);
      await nav(page).getByRole('link', { name: 'Protocols' }).click();
      await page.getByRole('link', { name: 'Occluded patch test, 48 hours' }).click();
      await page.getByTestId('protocol-form').waitFor();
      await expectAccessible(page, 'protocol editor');
      expect(await page.getByTestId('reading-row').count()).toBe(3);
      await page.getByRole('button', { name: 'Remove reading 3' }).click();
      await page.getByRole('button', { name: 'Remove reading 2' }).click();
      await page.getByRole('button', { name: 'Save as a new version' }).click();
      expect(await page.getByTestId('readings-error').textContent()).toBe('An occluded patch test needs at least two required readings');
      expect(await page.getByTestId('protocol-heading').textContent()).toBe('Occluded patch test, 48 hours');
      await expectAccessible(page, 'protocol editor with a refused edit');
    } finally {
      await context.close();
    }
  });
});
