import { latestMail as caughtMail } from '../support/caught-mail.ts';
import type { Browser, Page } from 'playwright-core';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../fake-idp/accounts.ts';
import { expectAccessible, launchBrowser, signInThroughIdp, TABLET_LANDSCAPE, TABLET_PORTRAIT, tabletContext } from '../support/browser.ts';

// The demo database is shared by every browser test file, so each test here makes or picks its
// own records: new performers with names unique to this file, Beatrix for the e-mailed link,
// Corentin for the withdrawal link, Beatrix's cast-storage PDF for "Check a PDF".
const appUrl = inject('appUrl');
const mailDir = inject('mailDir');
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

async function openPerformer(page: Page, search: string, name: RegExp): Promise<void> {
  await nav(page).getByRole('link', { name: 'Performers', exact: true }).click();
  await page.getByTestId('performers-table').waitFor();
  await page.getByLabel('Search by name').fill(search);
  await expect.poll(() => page.getByTestId('performer-link').count(), { timeout: 10_000 }).toBe(1);
  await page.getByTestId('performers-table').getByRole('link', { name }).click();
  await page.getByTestId('performer-heading').waitFor();
}

/** The text of the newest caught e-mail to this address whose subject matches. */
function latestMail(to: string, subject: RegExp): Promise<string> {
  return caughtMail(mailDir, to, subject);
}

async function drawSignature(page: Page): Promise<void> {
  const canvas = page.getByTestId('signature-canvas');
  await canvas.scrollIntoViewIfNeeded();
  const box = (await canvas.boundingBox())!;
  await page.mouse.move(box.x + 40, box.y + box.height / 2);
  await page.mouse.down();
  for (let i = 1; i <= 30; i++) await page.mouse.move(box.x + 40 + i * 12, box.y + box.height / 2 + Math.sin(i / 3) * 40);
  await page.mouse.up();
}

describe('the performer registry', () => {
  it('home links open the expiring consents and the sessions missing a consent, flagged in words (landscape)', async () => {
    const context = await tabletContext(browser, TABLET_LANDSCAPE);
    const page = await context.newPage();
    try {
      await signInAsHead(page);
      await nav(page).getByRole('link', { name: 'Sessions' }).waitFor();
      await nav(page).getByRole('link', { name: 'Consent forms' }).waitFor();
      await nav(page).getByRole('link', { name: 'Check a PDF' }).waitFor();

      await page.getByRole('link', { name: 'Consents expiring within 30 days' }).click();
      await page.waitForURL(/\/performers\?consent=expiring/);
      await page.getByTestId('performers-table').getByRole('link', { name: /Tamsin Achebe-Lowry/ }).waitFor();
      expect(await page.getByTestId('performers-consent').inputValue()).toBe('expiring');
      expect(await page.getByTestId('performers-table').textContent()).toMatch(/expires within 30 days/);
      await expectAccessible(page, 'performers filtered by expiring');

      await nav(page).getByRole('link', { name: 'Home' }).click();
      await page.getByRole('link', { name: 'Sessions waiting for consent' }).click();
      await page.waitForURL(/\/bookings$/);
      const row = page.getByTestId('bookings-table').getByRole('row').filter({ hasText: 'Oz Parfitt' });
      await row.getByText('Waiting for consent').waitFor();
      expect(await row.textContent()).toContain('Life cast');
      await expectAccessible(page, 'sessions');

      // Moving the session: a new time and place; the calendars get an update (checked in the API tests).
      await row.getByRole('button', { name: /^Move the life cast of Oz Parfitt/ }).click();
      const dialog = page.getByTestId('move-session-dialog');
      const when = new Date(Date.now() + 20 * 86_400_000);
      const local = `${when.getFullYear()}-${String(when.getMonth() + 1).padStart(2, '0')}-${String(when.getDate()).padStart(2, '0')}T14:15`;
      await dialog.getByLabel('New date and time').fill(local);
      await dialog.getByLabel('Place').fill('Casting bay 4');
      await expectAccessible(page, 'move a session');
      await dialog.getByRole('button', { name: 'Move the session' }).click();
      await page.getByTestId('bookings-table').getByRole('row').filter({ hasText: 'Casting bay 4' }).getByText('Oz Parfitt').waitFor();
    } finally {
      await context.close();
    }
  });

  it('adds a performer (server field errors under the field), books a session with its caution, sets a portrait and edits (portrait)', async () => {
    const context = await tabletContext(browser, TABLET_PORTRAIT);
    const page = await context.newPage();
    try {
      await signInAsHead(page);
      await nav(page).getByRole('link', { name: 'Performers', exact: true }).click();
      await page.getByRole('link', { name: 'Add performer' }).click();
      await page.getByLabel('Legal name').fill('Wrenna Faulkbridge');
      await page.getByLabel('Pronouns').fill('she/her');
      // Beatrix already has this address: the server says so, under the E-mail field.
      await page.getByLabel('E-mail').fill('bea.n@example.test');
      await page.getByLabel('Character').fill('The Tide Clerk');
      await expectAccessible(page, 'add performer');
      await page.getByRole('button', { name: 'Add performer' }).click();
      await page.getByText('Another performer already has this e-mail address.').waitFor();
      expect(await page.getByLabel('E-mail').getAttribute('aria-invalid')).toBe('true');
      await page.getByLabel('E-mail').fill('wrenna.f@example.test');
      await page.getByRole('button', { name: 'Add performer' }).click();
      await page.getByRole('heading', { level: 1, name: 'Wrenna Faulkbridge' }).waitFor();
      await page.getByTestId('contact-section').getByText('wrenna.f@example.test').waitFor();
      expect(await page.getByTestId('engagements').textContent()).toContain('as The Tide Clerk');

      // Booking: the caution of the work chosen, then the session with its missing consent flagged.
      const booking = page.getByTestId('booking-form');
      await booking.getByLabel('Purpose').selectOption({ label: 'Patch test' });
      expect(await booking.getByTestId('caution').textContent()).toContain('it is not a medical diagnosis');
      await booking.getByLabel('Purpose').selectOption({ label: 'Life cast' });
      expect(await booking.getByTestId('caution').textContent()).toContain('Never cover the nostrils or airway.');
      const when = new Date(Date.now() + 7 * 86_400_000);
      const local = `${when.getFullYear()}-${String(when.getMonth() + 1).padStart(2, '0')}-${String(when.getDate()).padStart(2, '0')}T10:30`;
      await booking.getByLabel('Starts').fill(local);
      await booking.getByLabel('Place').fill('Casting workshop');
      // The gate says at once that the consent is missing, before anything is saved.
      await booking.getByTestId('booking-gate').waitFor();
      await booking.getByRole('button', { name: 'Book the session' }).click();
      // Saved as waiting for consent, with the form offered at once.
      await page.getByTestId('booking-done').getByRole('button', { name: 'Send a link by e-mail' }).waitFor();
      await page.getByTestId('sessions-section').getByTestId('bookings-table').getByText('Casting workshop').waitFor();
      await page.getByTestId('sessions-section').getByTestId('consent-missing').waitFor();

      // A portrait, with its upload progress, then removed again.
      const photo = await sharp({ create: { width: 600, height: 800, channels: 3, background: { r: 180, g: 120, b: 90 } } }).jpeg().toBuffer();
      await page.getByTestId('portrait-input').setInputFiles({ name: 'wrenna.jpg', mimeType: 'image/jpeg', buffer: photo });
      await page.getByRole('img', { name: 'Portrait of Wrenna Faulkbridge' }).waitFor();
      expect(await page.getByText('Plinth removes location and other hidden data from the photo.').count()).toBe(1);
      await expectAccessible(page, 'performer page');

      await page.getByRole('link', { name: 'Edit' }).click();
      await page.getByLabel('Pronouns').fill('they/them');
      await page.getByRole('button', { name: 'Save changes' }).click();
      await page.getByRole('heading', { level: 1, name: 'Wrenna Faulkbridge' }).waitFor();
      await page.getByText('Pronouns: they/them').waitFor();

      await page.getByRole('button', { name: 'Remove photo' }).click();
      await page.getByRole('dialog', { name: 'Remove the photo?' }).getByRole('button', { name: 'Remove photo' }).click();
      await page.getByRole('button', { name: 'Add a photo' }).waitFor();
    } finally {
      await context.close();
    }
  });

  it('imports performers from CSV: every bad row named by line, the import only once the file is clean', async () => {
    const context = await tabletContext(browser, TABLET_LANDSCAPE);
    const page = await context.newPage();
    try {
      await signInAsHead(page);
      await nav(page).getByRole('link', { name: 'Performers', exact: true }).click();
      await page.getByRole('link', { name: 'Import CSV' }).click();
      await page.getByTestId('csv-example').waitFor();
      expect(await page.getByTestId('csv-columns').textContent()).toContain('legal_name');

      const bad = ['legal_name,email,character_name', 'Ottoline Brack,ottoline.b@example.test,Net Mender', ',nobody@example.test,', 'Pell Saverin,not-an-address,'].join('\n');
      await page.getByLabel('CSV file').setInputFiles({ name: 'bad.csv', mimeType: 'text/csv', buffer: Buffer.from(bad) });
      await page.getByRole('button', { name: 'Check the file' }).click();
      const errors = page.getByTestId('import-errors');
      await errors.waitFor();
      expect(await errors.textContent()).toContain('Line 3');
      expect(await errors.textContent()).toContain('Line 4');
      expect(await errors.textContent()).toContain('Enter a valid email address');
      expect(await page.getByTestId('import-commit').isDisabled()).toBe(true);
      await expectAccessible(page, 'import preview with errors');

      const good = ['legal_name,preferred_name,email,character_name', 'Ottoline Brack,,ottoline.b@example.test,Net Mender', 'Pell Saverin,Pell,pell.s@example.test,'].join('\r\n');
      await page.getByLabel('CSV file').setInputFiles({ name: 'good.csv', mimeType: 'text/csv', buffer: Buffer.from(good) });
      await page.getByRole('button', { name: 'Check the file' }).click();
      await page.getByTestId('import-ready').waitFor();
      const commit = page.getByRole('button', { name: 'Import 2 performers' });
      expect(await commit.isEnabled()).toBe(true);
      await commit.click();
      await page.getByTestId('import-result').waitFor();
      expect(await page.getByTestId('import-result').textContent()).toContain('2 new performers added');

      await page.getByRole('link', { name: 'See the performers' }).click();
      await page.getByLabel('Search by name').fill('ottoline');
      await page.getByTestId('performers-table').getByRole('link', { name: /Ottoline Brack/ }).waitFor();
    } finally {
      await context.close();
    }
  });
});

describe('links a performer opens without signing in', () => {
  it('the head e-mails a signing link; the performer signs on their own device; the link then no longer works', async () => {
    const staff = await tabletContext(browser, TABLET_LANDSCAPE);
    const page = await staff.newPage();
    let link: string;
    try {
      await signInAsHead(page);
      await openPerformer(page, 'beatrix', /Bea Nwachukwu/);
      await page.getByRole('button', { name: 'Ask to sign…' }).click();
      const dialog = page.getByRole('dialog', { name: /Ask .* to sign/ });
      await dialog.getByRole('checkbox', { name: /Use of your health information/ }).check();
      await dialog.getByRole('button', { name: 'Send a link by e-mail' }).click();
      await dialog.getByText('A one-time link is on its way to').waitFor();
      await dialog.getByRole('button', { name: 'Done' }).click();
      await page.getByTestId('signing-requests-table').getByText('Use of your health information').waitFor();
      const text = await latestMail('bea.n@example.test', /Please read and sign: Use of your health information/);
      link = /https?:\/\/\S+\/sign\/[A-Za-z0-9_-]+/.exec(text)![0];
    } finally {
      await staff.close();
    }

    const own = await tabletContext(browser, TABLET_PORTRAIT);
    const phone = await own.newPage();
    try {
      await phone.goto(link);
      await phone.getByRole('heading', { level: 1, name: 'Use of your health information' }).waitFor();
      await expectAccessible(phone, 'signing link');
      await phone.getByTestId('question-share_with_medic').getByRole('radio', { name: 'Yes', exact: true }).check();
      await phone.getByLabel('Your full name').fill('Beatrix Nwachukwu');
      await phone.getByRole('checkbox', { name: 'I have read this and I agree' }).check();
      await drawSignature(phone);
      await phone.getByRole('button', { name: 'Sign and submit' }).click();
      await phone.getByTestId('signed-confirmation').waitFor();
      expect(await phone.getByTestId('signed-confirmation').textContent()).toContain('A copy is on its way to bea.n@example.test');
      await expectAccessible(phone, 'signed confirmation');
      await phone.reload();
      await phone.getByRole('heading', { level: 1, name: 'This form is already signed' }).waitFor();
    } finally {
      await own.close();
    }
  });

  it('a performer asks for a withdrawal link by e-mail and withdraws a consent through it', async () => {
    const context = await tabletContext(browser, TABLET_PORTRAIT);
    const page = await context.newPage();
    try {
      await page.goto(`${appUrl}/withdraw`);
      await expectAccessible(page, 'withdraw request');
      await page.getByLabel('Your e-mail address').fill('cory.ashdown@example.test');
      await page.getByRole('button', { name: 'Send me a link' }).click();
      await page.getByTestId('withdraw-link-sent').waitFor();
      const text = await latestMail('cory.ashdown@example.test', /Your link to withdraw consents/);
      const link = /https?:\/\/\S+\/withdraw\/[A-Za-z0-9_-]+/.exec(text)![0];

      await page.goto(link);
      const row = page.getByTestId('link-consents-table').getByRole('row').filter({ hasText: 'Use of your health information' }).first();
      await row.waitFor();
      await expectAccessible(page, 'withdrawal link');
      await row.getByRole('button', { name: /Withdraw/ }).click();
      const dialog = page.getByRole('dialog', { name: 'Withdraw this consent?' });
      expect(await dialog.getByTestId('withdraw-consequences').textContent()).toContain('Plinth stops using the health details');
      await dialog.getByRole('button', { name: 'Withdraw consent' }).click();
      await row.getByText('Withdrawn').waitFor();
    } finally {
      await context.close();
    }
  });
});

describe('consent forms and checking a PDF', () => {
  it('writes a new consent form with a live preview and a question, publishes version 2, archives it', async () => {
    const context = await tabletContext(browser, TABLET_LANDSCAPE);
    const page = await context.newPage();
    try {
      await signInAsHead(page);
      await nav(page).getByRole('link', { name: 'Consent forms' }).click();
      await page.getByTestId('templates-table').getByRole('link', { name: 'Consent to skin patch testing' }).waitFor();
      await expectAccessible(page, 'consent forms');
      await page.getByRole('link', { name: 'New consent form' }).click();
      await page.getByLabel('Kind').selectOption({ label: 'Application' });
      await page.getByLabel('Title').fill('Consent to a bald cap (browser test)');
      await page.getByLabel('Consent text').fill('## What happens\n\nA bald cap is glued over your hair and blended at the edges.');
      await page.getByTestId('template-preview').getByRole('heading', { name: 'What happens' }).waitFor();
      await page.getByRole('button', { name: 'Add a question' }).click();
      const q = page.getByTestId('question-editor').first();
      await q.getByLabel('Question text').fill('How short is your hair?');
      await q.getByLabel('Question text').blur();
      expect(await q.getByLabel('Id').inputValue()).toBe('how_short_is_your_hair');
      await q.getByLabel('Answer').selectOption({ label: 'Choice of options' });
      await q.getByLabel('Options').fill('Shaved');
      await page.getByRole('button', { name: 'Create the form' }).click();
      await q.getByText('A choice needs at least two options').waitFor();
      await q.getByLabel('Options').fill('Shaved\nShort\nLong');
      await expectAccessible(page, 'consent form editor');
      await page.getByRole('button', { name: 'Create the form' }).click();
      await page.getByTestId('template-versions').getByText('v1').waitFor();

      await page.getByLabel('Title').fill('Consent to a bald cap (browser test, revised)');
      await page.getByRole('button', { name: 'Publish version 2' }).click();
      await page.getByText('Published version 2.').waitFor();
      await page.getByTestId('template-versions').getByText('v2').waitFor();

      await page.getByRole('button', { name: 'Archive this form' }).click();
      await page.getByRole('dialog', { name: 'Archive this form?' }).getByRole('button', { name: 'Archive' }).click();
      await page.getByRole('button', { name: 'Restore this form' }).waitFor();
    } finally {
      await context.close();
    }
  });

  it('"Check a PDF" recognises a PDF Plinth issued, and refuses the same file altered', async () => {
    const context = await tabletContext(browser, TABLET_PORTRAIT);
    const page = await context.newPage();
    try {
      await signInAsHead(page);
      // Beatrix's cast-storage consent holds no health answers, so the head may download its PDF.
      const list = await (await page.request.get(`${appUrl}/api/performers?q=beatrix`)).json();
      const detail = await (await page.request.get(`${appUrl}/api/performers/${list.items[0].id}`)).json();
      const consent = detail.consents.find((c: { kind: string }) => c.kind === 'cast_storage');
      const pdf = await (await page.request.get(`${appUrl}/api/consents/${consent.id}/pdf`)).body();

      await nav(page).getByRole('link', { name: 'Check a PDF' }).click();
      await expectAccessible(page, 'check a PDF');
      await page.getByLabel('Consent PDF').setInputFiles({ name: 'consent.pdf', mimeType: 'application/pdf', buffer: pdf });
      await page.getByRole('button', { name: 'Check this PDF' }).click();
      await page.getByTestId('verify-result').getByText('This is an unaltered consent Plinth issued:').waitFor();
      expect(await page.getByTestId('verify-result').textContent()).toContain('Bea Nwachukwu, Storage of your life casts and use of your likeness v1');

      await page.getByLabel('Consent PDF').setInputFiles({ name: 'altered.pdf', mimeType: 'application/pdf', buffer: Buffer.concat([pdf, Buffer.from('\n%altered')]) });
      await page.getByRole('button', { name: 'Check this PDF' }).click();
      await page.getByTestId('verify-result').getByText('Plinth did not issue this exact file').waitFor();
      expect((await page.getByTestId('verify-sha256').textContent())?.length).toBe(64);
    } finally {
      await context.close();
    }
  });
});
