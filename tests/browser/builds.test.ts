// The appliance workshop on a tablet: the mix calculator's amounts follow the inputs as they are
// typed, the mold box calculator, and a build recorded, its pieces marked, against the shoot days.
import type { Browser, Locator, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../fake-idp/accounts.ts';
import { expectAccessible, launchBrowser, signInThroughIdp, TABLET_LANDSCAPE, TABLET_PORTRAIT, tabletContext } from '../support/browser.ts';

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

async function noSidewaysScroll(page: Page, label: string) {
  const [scroll, client] = await page.evaluate(() => [document.documentElement.scrollWidth, document.documentElement.clientWidth]);
  expect(scroll, `${label} scrolls sideways`).toBeLessThanOrEqual(client);
}

/** The weigh-out as read on screen, one "n. Ingredient amount" line per step. */
async function steps(page: Page): Promise<string[]> {
  const list = page.getByRole('list', { name: 'Weigh in this order' });
  if ((await list.count()) === 0) return [];
  return (await list.getByRole('listitem').allTextContents()).map((s) => s.replace(/\s+/g, ' ').trim());
}

/** Chooses the option whose words match, as a person reading the list would, once the list has it. */
async function choose(select: Locator, words: RegExp) {
  const find = async () => {
    const options = await select.locator('option').evaluateAll((os) => os.map((o) => ({ value: (o as HTMLOptionElement).value, text: o.textContent ?? '' })));
    return options.find((o) => words.test(o.text));
  };
  await expect.poll(find, { message: `an option ${words}` }).toBeDefined();
  await select.selectOption((await find())!.value);
}

/** Types into a field the way a person does: clear it, then type, so every keystroke is an input event. */
async function retype(field: Locator, value: string) {
  await field.fill('');
  await field.pressSequentially(value);
}

describe('the mix calculator on a portrait tablet', () => {
  it('works the weigh-out out as the inputs change, from a catalogue silicone’s figures, with the schema’s messages', async () => {
    const context = await tabletContext(browser, TABLET_PORTRAIT);
    const page = await context.newPage();
    try {
      await signInThroughIdp(page, appUrl, 'artist@plinth.test', DEMO_PASSWORD);
      await page.getByRole('heading', { level: 1, name: /Today · Artist/ }).waitFor();
      await nav(page).getByRole('link', { name: 'Calculators' }).click();
      await page.getByRole('heading', { level: 1, name: 'Mix calculator' }).waitFor();
      const cautions = page.getByRole('complementary', { name: 'Silicones, coatings and solvents' });
      for (const words of ['respirator', 'open flames', 'gloves', 'safety data sheet']) expect(await cautions.textContent()).toContain(words);

      // Everything in the cup, 100 g of a 1 : 1 material with nothing added: half each.
      await expect.poll(() => steps(page)).toEqual(['1. Part A 50.0 g', '2. Part B 50.0 g']);
      await expectAccessible(page, 'mix calculator');

      const form = page.getByTestId('mix-calculator');
      await form.getByLabel('Material', { exact: true }).selectOption({ label: 'Slipway platinum silicone base' });
      // The catalogue's figures stand in the fields, not to be typed over.
      await expect.poll(() => form.getByLabel('Maker’s maximum softener (%)').inputValue()).toBe('100');
      expect(await form.getByLabel('Part A (parts)').getAttribute('readonly')).not.toBeNull();

      await form.getByLabel('Size the batch by').selectOption({ label: 'The part A weighed' });
      await retype(form.getByLabel('Part A mass (g)'), '15');
      await retype(form.getByLabel('Softener (% of A + B)'), '100');
      // For a 1 : 1 material 15 g of part A pairs with 15 g of part B; softener at 100 % weighs as much as
      // A and B together: 30 g (common practice, no published source). Softener goes in before part B.
      await expect.poll(() => steps(page)).toEqual(['1. Part A 15.0 g', '2. Softener 30.0 g', '3. Part B 15.0 g']);

      // Over the maker's maximum: the shared schema's message under the field, and no amounts.
      await retype(form.getByLabel('Softener (% of A + B)'), '150');
      await form.getByText('At most 100 %, the maker\'s stated maximum').waitFor();
      await expect.poll(() => steps(page)).toEqual([]);
      await page.getByTestId('weigh-out-empty').waitFor();
      await expectAccessible(page, 'mix calculator with a refused softener');

      await retype(form.getByLabel('Softener (% of A + B)'), '50');
      await form.getByLabel('Pigment dosed').selectOption({ label: 'In drops' });
      await retype(form.getByLabel('Drops of pigment'), '10');
      // Ten drops of the default 0.03 g are 0.3 g; 50 % of A + B is 15 g.
      await expect.poll(() => steps(page)).toEqual(['1. Part A 15.0 g', '2. Softener 15.0 g', '3. Pigment 0.3 g (10 drops)', '4. Part B 15.0 g']);

      // A batch smaller than the scale can weigh.
      await retype(form.getByLabel('Part A mass (g)'), '0.05');
      await form.getByText('Less than the scale can weigh (0.1 g)').waitFor();

      // Figures typed in when the material is not in the catalogue: a ratio of zero is no ratio.
      await form.getByLabel('Material', { exact: true }).selectOption({ label: 'Not in the catalogue: type the figures in' });
      await retype(form.getByLabel('Part A mass (g)'), '20');
      await retype(form.getByLabel('Part A (parts)'), '0');
      await form.getByText('Part A of the ratio must be more than 0').waitFor();
      await retype(form.getByLabel('Part A (parts)'), '2');
      // 2 : 1 by weight: 20 g of A takes 10 g of B; 50 % softener of 30 g is 15 g.
      await expect.poll(() => steps(page)).toEqual(['1. Part A 20.0 g', '2. Softener 15.0 g', '3. Pigment 0.3 g (10 drops)', '4. Part B 10.0 g']);

      // The coating: 1 part to 8 of solvent is 9 parts, so 90 ml holds 10 ml and 80 ml (common practice, no published source).
      const volumes = page.getByRole('list', { name: 'Coating volumes' });
      await expect.poll(async () => (await volumes.textContent())?.replace(/\s+/g, ' ')).toContain('Cap material: 10.0 ml');
      expect(await volumes.textContent()).toContain('Solvent: 80.0 ml');
      await retype(form.getByLabel('Coating to mix (ml)'), '45');
      await expect.poll(async () => (await volumes.textContent())?.replace(/\s+/g, ' ')).toContain('Cap material: 5.0 ml');
      expect(await volumes.textContent()).toContain('Solvent: 40.0 ml');

      await noSidewaysScroll(page, 'mix calculator');
      await expectAccessible(page, 'mix calculator, worked');

      // The mold box: a footprint of zero is refused; 1 cm walls and 1 cm of cover by default (common practice, no published source).
      await page.getByRole('navigation', { name: 'Calculators' }).getByRole('link', { name: 'Mold box' }).click();
      await page.getByRole('heading', { level: 1, name: 'Mold box calculator' }).waitFor();
      const box = page.getByTestId('mold-box-calculator');
      await retype(box.getByLabel('Footprint length (mm)'), '0');
      await box.getByText('The footprint length must be more than 0').waitFor();
      await retype(box.getByLabel('Footprint length (mm)'), '100');
      await retype(box.getByLabel('Footprint width (mm)'), '60');
      await retype(box.getByLabel('Highest point (mm)', { exact: true }), '30');
      await box.getByLabel('Material', { exact: true }).selectOption({ label: 'Slipway platinum silicone base' });
      const result = page.getByTestId('mold-box-result');
      await expect.poll(async () => (await result.textContent())?.replace(/\s+/g, ' ')).toContain('120.0 mm × 80.0 mm');
      expect(await result.textContent()).toContain('40.0 mm');
      await noSidewaysScroll(page, 'mold box calculator');
      await expectAccessible(page, 'mold box calculator');
    } finally {
      await context.close();
    }
  });
});

describe('builds on a landscape tablet', () => {
  it('the head is warned of pieces running short, an artist records a run lot by lot and marks a piece spoiled', async () => {
    const context = await tabletContext(browser, TABLET_LANDSCAPE);
    const page = await context.newPage();
    try {
      await signInThroughIdp(page, appUrl, 'head@plinth.test', DEMO_PASSWORD);
      await page.getByRole('heading', { level: 1, name: /Today · Department head/ }).waitFor();
      const warning = page.getByRole('article', { name: 'Appliance pieces running short' });
      expect(await warning.getByTestId('task-count').textContent()).toBe('1');
      expect(await warning.textContent()).toContain('Juno Castellane’s face');
      await nav(page).getByRole('link', { name: 'Builds' }).click();
      await page.getByRole('heading', { level: 1, name: 'Appliance builds' }).waitFor();
      const outlooks = page.getByTestId('outlooks-table');
      await outlooks.getByRole('row').filter({ hasText: 'Juno Castellane' }).filter({ hasText: 'Face' }).getByText('Short by 8').waitFor();
      await noSidewaysScroll(page, 'builds');
      await expectAccessible(page, 'builds');
      await context.clearCookies();

      await signInThroughIdp(page, appUrl, 'artist@plinth.test', DEMO_PASSWORD);
      await page.getByRole('heading', { level: 1, name: /Today · Artist/ }).waitFor();
      await nav(page).getByRole('link', { name: 'Builds' }).click();
      await page.getByRole('link', { name: 'Record a build' }).click();
      const form = page.getByTestId('build-form');
      await choose(form.getByLabel('Mold', { exact: true }), /Tamsin Achebe-Lowry: face/);
      await form.getByLabel('Material 1: product').selectOption({ label: 'Slipway platinum silicone base' });
      await choose(form.getByLabel('Material 1: lot'), /SP-2611/);
      // Part B follows part A's material.
      await expect.poll(() => form.getByLabel('Material 2: product').inputValue()).not.toBe('');
      await choose(form.getByLabel('Material 2: lot'), /SP-2611/);
      await retype(form.getByLabel('Total mass (g)'), '80');
      await expect.poll(() => steps(page)).toEqual(['1. Part A 40.0 g', '2. Part B 40.0 g']);
      await retype(form.getByLabel('Part A weighed (g)'), '40.1');
      await retype(form.getByLabel('Pieces made'), '3');
      expect(await form.getByLabel('Demold after (minutes)').inputValue()).toBe('30');
      await expectAccessible(page, 'new build');
      await noSidewaysScroll(page, 'new build');
      await form.getByRole('button', { name: 'Record the build' }).click();

      await page.getByRole('heading', { level: 1, name: /Tamsin Achebe-Lowry: face pieces/ }).waitFor();
      expect((await page.getByTestId('tally').textContent())?.replace(/\s+/g, ' ')).toContain('3 made · 0 used · 0 spoiled · 3 on the shelf');
      expect(await page.getByTestId('materials-table').textContent()).toContain('SP-2611');
      await page.getByRole('button', { name: 'Spoiled (piece 2)' }).click();
      await expect.poll(async () => (await page.getByTestId('tally').textContent())?.replace(/\s+/g, ' ')).toContain('2 on the shelf');
      await page.getByTestId('pieces-table').getByRole('row', { name: /^2 Spoiled/ }).waitFor();
      await noSidewaysScroll(page, 'build');
      await expectAccessible(page, 'build');
    } finally {
      await context.close();
    }
  });
});
