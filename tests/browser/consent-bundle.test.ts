import { latestMail as caughtMail } from '../support/caught-mail.ts';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { createDb, type DbHandle } from '../../api/db/index.ts';
import { DEMO_PASSWORD } from '../../fake-idp/accounts.ts';
import { expectAccessible, launchBrowser, signInThroughIdp, TABLET_PORTRAIT, tabletContext } from '../support/browser.ts';

// The demo database is shared by every browser test file. These tests use records no other test
// touches: Tamsin Achebe-Lowry's life-casting, application and cast-storage forms (she starts with a
// patch-testing consent only), and Cory Ashdown's link bundle.
const appUrl = inject('appUrl');
const mailDir = inject('mailDir');
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

async function openPerformer(page: Page, search: string, name: RegExp): Promise<void> {
  await signInThroughIdp(page, appUrl, 'head@plinth.test', DEMO_PASSWORD);
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Performers', exact: true }).click();
  await page.getByTestId('performers-table').waitFor();
  await page.getByLabel('Search by name').fill(search);
  await expect.poll(() => page.getByTestId('performer-link').count(), { timeout: 10_000 }).toBe(1);
  await page.getByTestId('performers-table').getByRole('link', { name }).click();
  await page.getByRole('heading', { level: 1, name }).waitFor();
}

async function chooseForms(page: Page, titles: string[]) {
  await page.getByRole('button', { name: 'Ask to sign…' }).click();
  const dialog = page.getByRole('dialog', { name: /Ask .* to sign/ });
  for (const title of titles) await dialog.getByRole('checkbox', { name: new RegExp(title) }).check();
  await expectAccessible(page, 'choosing several forms');
  return dialog;
}

/** A signature drawn the way a finger does it: press, a curving path of moves, lift. */
async function drawSignature(page: Page): Promise<void> {
  const canvas = page.getByTestId('signature-canvas');
  await canvas.scrollIntoViewIfNeeded();
  const box = (await canvas.boundingBox())!;
  const y0 = box.y + box.height * 0.6;
  await page.mouse.move(box.x + box.width * 0.1, y0);
  await page.mouse.down();
  for (let i = 1; i <= 30; i++) {
    const t = i / 30;
    await page.mouse.move(box.x + box.width * (0.1 + 0.75 * t), y0 - Math.sin(t * Math.PI * 3) * box.height * 0.25);
  }
  await page.mouse.up();
}

async function pick(page: Page, question: string, option: string) {
  await page.getByTestId(`question-${question}`).getByRole('radio', { name: option, exact: true }).check();
}

async function agreeAndSign(page: Page, name: string) {
  await page.getByLabel('Your full name').fill(name);
  await page.getByRole('checkbox', { name: 'I have read this and I agree' }).check();
  await drawSignature(page);
  await page.getByText('Your signature is in the box.').waitFor({ state: 'attached' });
  await page.getByRole('button', { name: 'Sign and submit' }).click();
}

function latestMail(to: string, subject: RegExp): Promise<string> {
  return caughtMail(mailDir, to, subject);
}

describe('an onboarding bundle', () => {
  it('the head picks three forms; the performer signs them one after another in one hand-over, with one hand-back at the end (portrait, touch)', async () => {
    const context = await tabletContext(browser, TABLET_PORTRAIT);
    const page = await context.newPage();
    try {
      await openPerformer(page, 'tamsin', /Tamsin Achebe-Lowry/);
      const dialog = await chooseForms(page, ['Consent to a life cast', 'Consent to prosthetic and make-up application', 'Storage of your life casts']);
      await dialog.getByRole('button', { name: 'Sign here on this tablet' }).click();
      await page.waitForURL((url) => url.pathname === '/tablet');

      // Form 1 of 3: the life cast.
      await page.getByRole('heading', { level: 1, name: 'Consent to a life cast' }).waitFor();
      expect(await page.getByTestId('signing-progress').textContent()).toBe('Form 1 of 3');
      expect(await page.getByRole('navigation', { name: 'Main' }).count()).toBe(0);
      expect(await page.getByTestId('caution').textContent()).toContain('Never cover the nostrils or airway.');
      await expectAccessible(page, 'first form of a bundle');
      await pick(page, 'area', 'Face');
      await page.getByTestId('question-stop_signal').getByRole('textbox').fill('Raise the right hand');
      await pick(page, 'claustrophobia', 'No');
      await pick(page, 'breathing', 'No');
      await pick(page, 'contact_lenses', 'Yes');
      await agreeAndSign(page, 'Tamsin Achebe-Lowry');

      // Form 2 of 3 follows on the same tablet, with nothing of the first left on screen.
      await page.getByRole('heading', { level: 1, name: 'Consent to prosthetic and make-up application' }).waitFor();
      expect(await page.getByTestId('signing-progress').textContent()).toBe('Form 2 of 3');
      expect(await page.getByLabel('Your full name').inputValue()).toBe('');
      await pick(page, 'wear_hours', 'Up to 8 hours');
      await agreeAndSign(page, 'Tamsin Achebe-Lowry');

      // Form 3 of 3.
      await page.getByRole('heading', { level: 1, name: /Storage of your life casts/ }).waitFor();
      expect(await page.getByTestId('signing-progress').textContent()).toBe('Form 3 of 3');
      await pick(page, 'end_choice', 'Ask me at the time');
      await pick(page, 'portfolio_photos', 'No');
      await agreeAndSign(page, 'Tamsin Achebe-Lowry');

      // One hand-back at the end, showing nothing of what was entered.
      await page.getByTestId('handback').waitFor();
      const shown = await page.evaluate(() => document.body.innerText);
      for (const secret of ['Tamsin', 'Raise the right hand', 'life cast']) expect(shown).not.toContain(secret);
      await expectAccessible(page, 'hand-back after a bundle');

      const tamsin = await db.db.selectFrom('performers').select('id').where('legal_name', '=', 'Tamsin Achebe-Lowry').executeTakeFirstOrThrow();
      const kinds = await db.db.selectFrom('consents').select('kind').where('performer_id', '=', tamsin.id).where('signing_method', '=', 'tablet').where('signed_at', '>', new Date(Date.now() - 600_000)).execute();
      expect(kinds.map((k) => k.kind).sort()).toEqual(['application', 'cast_storage', 'life_casting']);
    } finally {
      await context.close();
    }
  });

  it('sent as one link: one e-mail, one walk through the forms on the performer’s own device; skipping one keeps the other (portrait, touch)', async () => {
    const staff = await tabletContext(browser, TABLET_PORTRAIT);
    const page = await staff.newPage();
    try {
      await openPerformer(page, 'cory', /Cory Ashdown/);
      const dialog = await chooseForms(page, ['Consent to prosthetic and make-up application', 'Storage of your life casts']);
      await dialog.getByRole('button', { name: 'Send a link by e-mail' }).click();
      await dialog.getByText(/One link for all 2 forms is on its way to/).waitFor();
    } finally {
      await staff.close();
    }
    const text = await latestMail('cory.ashdown@example.test', /Please read and sign 2 forms/);
    expect(text).toContain('The Lantern Keeper');
    const link = /(http\S+\/sign\/bundle\/[A-Za-z0-9_-]{40,60})/.exec(text)![1]!;

    const own = await tabletContext(browser, TABLET_PORTRAIT);
    const phone = await own.newPage();
    try {
      await phone.goto(link.replace(/^https?:\/\/[^/]+/, appUrl));
      await phone.getByRole('heading', { level: 1, name: 'Consent to prosthetic and make-up application' }).waitFor();
      expect(await phone.getByTestId('signing-progress').textContent()).toBe('Form 1 of 2');
      await expectAccessible(phone, 'first form of a link bundle');
      await pick(phone, 'wear_hours', 'Up to 4 hours');
      await agreeAndSign(phone, 'Corentin Malik Ashdown');
      await phone.getByRole('heading', { level: 1, name: /Storage of your life casts/ }).waitFor();
      expect(await phone.getByTestId('signing-progress').textContent()).toBe('Form 2 of 2');
      await phone.getByRole('button', { name: 'I don’t want to sign this one' }).click();
      await phone.getByRole('dialog', { name: 'Not signing this form?' }).getByRole('button', { name: 'Yes, finish' }).click();
      const done = phone.getByTestId('bundle-done');
      await done.waitFor();
      expect(await done.textContent()).toMatch(/Consent to prosthetic and make-up application.*Signed/s);
      expect(await done.textContent()).toMatch(/Storage of your life casts.*Not signed/s);
      await expectAccessible(phone, 'end of a link bundle');
    } finally {
      await own.close();
    }
  });
});
