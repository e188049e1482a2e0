// The archivist's round on a tablet: find a cast by search, open it by scanning its label with
// the camera (Chromium's fake capture device playing the label's QR), and check it out.
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { labelUrl } from '#shared/domain/label-codes.ts';
import { createDb, type DbHandle } from '../../api/db/index.ts';
import { demoCastLabel } from '../fixtures/archive.ts';
import { qrPng } from '../../api/files/qr.ts';
import { DEMO_PASSWORD } from '../../fake-idp/accounts.ts';
import { expectAccessible, launchBrowser, signInThroughIdp, TABLET_LANDSCAPE, TABLET_PORTRAIT, tabletContext } from '../support/browser.ts';
import { type FakeCamera, fakeCameraFromImage } from '../support/fake-camera.ts';

const appUrl = inject('appUrl');
const CAST = 'tamsin-face-positive';
let camera: FakeCamera;
let browser: Browser;
let db: DbHandle;

beforeAll(async () => {
  db = createDb(inject('databaseUrl'), { max: 1 });
  camera = await fakeCameraFromImage(await qrPng(labelUrl(appUrl, demoCastLabel(CAST))));
  browser = await launchBrowser(camera.args);
});
afterAll(async () => {
  await browser?.close();
  await camera?.dispose();
  await db?.close();
});

function nav(page: Page) {
  return page.getByRole('navigation', { name: 'Main' });
}

async function noSidewaysScroll(page: Page, label: string) {
  const [scroll, client] = await page.evaluate(() => [document.documentElement.scrollWidth, document.documentElement.clientWidth]);
  expect(scroll, `${label} scrolls sideways`).toBeLessThanOrEqual(client);
}

describe('the archivist on a tablet', () => {
  it('finds a cast by search, opens it by scanning its label, and checks it out (portrait)', async () => {
    const context = await tabletContext(browser, TABLET_PORTRAIT);
    const page = await context.newPage();
    try {
      await signInThroughIdp(page, appUrl, 'archivist@plinth.test', DEMO_PASSWORD);
      await page.getByRole('heading', { level: 1, name: /Today · Archivist/ }).waitFor();
      const overdue = page.getByRole('article', { name: 'Overdue check-outs' });
      expect(await overdue.getByTestId('task-count').textContent()).toBe('1');
      await expectAccessible(page, 'archivist home');

      await nav(page).getByRole('link', { name: 'Archive' }).click();
      await page.getByRole('heading', { level: 1, name: 'Find a cast' }).waitFor();
      await page.getByLabel('Search', { exact: true }).fill('achebe face');
      const table = page.getByTestId('casts-table');
      await expect.poll(() => table.getByTestId('cast-link').count(), { timeout: 10_000 }).toBe(2);
      expect(await table.textContent()).toContain(demoCastLabel(CAST));
      expect(await table.locator('img').count()).toBe(2);
      await expectAccessible(page, 'find: search results');
      await noSidewaysScroll(page, 'find');

      await page.getByRole('button', { name: 'Scan a label' }).click();
      await page.getByRole('heading', { level: 1, name: 'Face positive' }).waitFor();
      expect(new URL(page.url()).pathname).toMatch(/^\/archive\/casts\/[0-9a-f-]{36}$/);
      expect(await page.getByTestId('cast-heading').locator('..').textContent()).toContain(demoCastLabel(CAST));
      expect(await page.getByTestId('cast-where').textContent()).toContain('GH/SOUTH/R1/1');
      expect(await page.getByRole('complementary', { name: 'Life casting safety' }).textContent()).toContain('release agent');
      await expectAccessible(page, 'cast page, in store');
      await noSidewaysScroll(page, 'cast page');

      await page.getByTestId('movement-actions').getByRole('button', { name: 'Check-out' }).click();
      const dialog = page.getByRole('dialog', { name: 'Check out this cast' });
      await dialog.getByLabel('Who is taking it').selectOption({ label: 'Rafe Lindqvist' });
      await dialog.getByLabel('Why').fill('Sculpting the young Keeper’s brow');
      await dialog.getByLabel('Due back').fill('2099-03-01');
      await dialog.getByLabel('Authorised by').fill('Marta Oyelaran');
      await expectAccessible(page, 'check-out form');
      await dialog.getByRole('button', { name: 'Record the check-out' }).click();
      await dialog.waitFor({ state: 'detached' });
      await page.getByTestId('cast-where').filter({ hasText: 'With Rafe Lindqvist' }).waitFor();
      expect(await page.getByTestId('where-section').textContent()).toContain('Checked out');
      const history = page.getByTestId('movement-history');
      expect(await history.getByRole('row').nth(1).textContent()).toMatch(/Check-out.*Sculpting the young Keeper’s brow.*With Rafe Lindqvist.*Moved by Nell Achterberg.*Authorised by Marta Oyelaran/);
      await expectAccessible(page, 'cast page, checked out');

      const stored = await db.db.selectFrom('casts').select(['status', 'current_holder']).where('label_code', '=', demoCastLabel(CAST)).executeTakeFirstOrThrow();
      expect(stored).toEqual({ status: 'checked_out', current_holder: 'Rafe Lindqvist' });
    } finally {
      await context.close();
    }
  });

  it('a refused move says why in the dialog, and the shelf page lists what is on it (landscape)', async () => {
    const context = await tabletContext(browser, TABLET_LANDSCAPE);
    const page = await context.newPage();
    try {
      await signInThroughIdp(page, appUrl, 'archivist@plinth.test', DEMO_PASSWORD);
      await page.getByRole('heading', { level: 1, name: /Today · Archivist/ }).waitFor();
      await nav(page).getByRole('link', { name: 'Archive' }).click();
      await page.getByLabel('Search', { exact: true }).fill('castellane hand mold');
      await expect.poll(() => page.getByTestId('cast-link').count(), { timeout: 10_000 }).toBe(1);
      await page.getByTestId('cast-link').click();
      await page.getByRole('heading', { level: 1, name: 'Hand mold' }).waitFor();
      await page.getByTestId('movement-actions').getByRole('button', { name: 'Destruction' }).click();
      const dialog = page.getByRole('dialog', { name: 'Record the destruction of this cast' });
      await dialog.getByLabel('Reason').fill('Tear across the palm');
      await dialog.getByLabel('Authorised by').fill('Marta Oyelaran');
      await dialog.getByRole('button', { name: 'Record the destruction' }).click();
      await dialog.getByText('A destruction needs a witness.').waitFor();
      expect(await dialog.getByLabel('Witness').getAttribute('aria-invalid')).toBe('true');
      await expectAccessible(page, 'destruction refused');
      await dialog.getByRole('button', { name: 'Cancel' }).click();

      await page.getByRole('link', { name: 'GH/NORTH/R2/1', exact: true }).click();
      await page.getByTestId('place-heading').waitFor();
      expect(await page.getByTestId('place-casts').textContent()).toContain(demoCastLabel('juno-hand-mold'));
      await expectAccessible(page, 'shelf page');
      await noSidewaysScroll(page, 'shelf page');
    } finally {
      await context.close();
    }
  });

  it('the store, the retention review and a new cast’s form pass an accessibility check (landscape)', async () => {
    const context = await tabletContext(browser, TABLET_LANDSCAPE);
    const page = await context.newPage();
    try {
      await signInThroughIdp(page, appUrl, 'archivist@plinth.test', DEMO_PASSWORD);
      await page.getByRole('heading', { level: 1, name: /Today · Archivist/ }).waitFor();
      await nav(page).getByRole('link', { name: 'Storage places' }).click();
      await page.getByTestId('places-table').waitFor();
      expect(await page.getByTestId('places-table').textContent()).toContain('GH/NORTH/R1/2/B1');
      await page.getByLabel('Label for GH/NORTH/R1/2/B1').check();
      await page.getByTestId('print-place-labels').filter({ hasText: 'Print labels for 1 place' }).waitFor();
      await expectAccessible(page, 'storage places');
      await noSidewaysScroll(page, 'storage places');

      await nav(page).getByRole('link', { name: 'Retention' }).click();
      const due = page.getByTestId('retention-due');
      await due.getByRole('link').first().waitFor();
      expect(await due.textContent()).toContain(demoCastLabel('halvard-teeth-positive'));
      await expectAccessible(page, 'retention');

      await nav(page).getByRole('link', { name: 'Archive' }).click();
      await page.getByRole('link', { name: 'Record a cast' }).click();
      await page.getByTestId('cast-form').waitFor();
      expect(await page.getByRole('complementary', { name: 'Life casting safety' }).textContent()).toContain('never enclose fingers, hands or limbs');
      await expectAccessible(page, 'record a cast');
      await noSidewaysScroll(page, 'record a cast');
    } finally {
      await context.close();
    }
  });

  it('the performer sees their own casts and where each is kept on their record', async () => {
    const context = await tabletContext(browser, TABLET_PORTRAIT);
    const page = await context.newPage();
    try {
      await signInThroughIdp(page, appUrl, 'performer@plinth.test', DEMO_PASSWORD);
      await nav(page).getByRole('link', { name: 'My record' }).click();
      const section = page.getByTestId('life-casts');
      await section.getByRole('list', { name: 'My casts' }).waitFor();
      expect(await section.getByRole('listitem').count()).toBe(5);
      const text = (await section.textContent()) ?? '';
      expect(text).toContain('Kept: Gullhaven Studio Store › North Store');
      expect(text).not.toContain('Sol Varga');
      expect(await nav(page).getByRole('link', { name: 'Archive' }).count()).toBe(0);
      await expectAccessible(page, 'performer’s own casts');
    } finally {
      await context.close();
    }
  });
});
