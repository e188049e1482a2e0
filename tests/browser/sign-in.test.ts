import { readdir } from 'node:fs/promises';
import type { Browser } from 'playwright-core';
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

const ACCOUNTS: { email: string; heading: RegExp; context: RegExp | null; nav: string[] }[] = [
  { email: 'admin@plinth.test', heading: /Today · Studio administrator/, context: null, nav: ['Home', 'Users', 'Productions', 'Outbox', 'Audit log'] },
  { email: 'head@plinth.test', heading: /Today · Department head/, context: /The Lantern Keeper/, nav: ['Home'] },
  { email: 'lead@plinth.test', heading: /Today · Designated lead/, context: /The Lantern Keeper/, nav: ['Home', 'Audit log'] },
  { email: 'artist@plinth.test', heading: /Today · Artist/, context: /The Lantern Keeper/, nav: ['Home'] },
  { email: 'archivist@plinth.test', heading: /Today · Archivist/, context: /The Lantern Keeper|Saltglass Mile/, nav: ['Home'] },
  // A performer's own view has no staff words: no production · role line, no "Acting as".
  { email: 'performer@plinth.test', heading: /Hello, Juno/, context: null, nav: ['Home', 'My record'] },
];

describe('signing in through the identity provider at a tablet viewport', () => {
  for (const account of ACCOUNTS) {
    it(`${account.email} signs in and lands on their home, which passes an accessibility check`, async () => {
      const context = await tabletContext(browser, TABLET_LANDSCAPE);
      const page = await context.newPage();
      try {
        await page.goto(`${appUrl}/`);
        await page.waitForURL(/\/signin/);
        await expectAccessible(page, 'sign-in landing');
        await page.getByRole('link', { name: 'Sign in' }).click();
        await page.getByLabel('Email').waitFor();
        await expectAccessible(page, 'identity provider sign-in');
        await page.getByLabel('Email').fill(account.email);
        await page.getByLabel('Password').fill(DEMO_PASSWORD);
        await page.getByRole('button', { name: 'Sign in' }).click();
        const heading = page.getByRole('heading', { level: 1, name: account.heading });
        await heading.waitFor();
        if (account.context) expect(await page.getByTestId('acting-context').textContent()).toMatch(account.context);
        else if (account.email === 'performer@plinth.test') {
          expect(await page.getByTestId('acting-context').count()).toBe(0);
          await page.getByTestId('account-control').getByRole('button').click();
          await page.getByRole('button', { name: 'Sign out' }).waitFor();
          expect(await page.getByText('Acting as').count()).toBe(0);
        }
        const nav = page.getByRole('navigation', { name: 'Main' });
        for (const item of account.nav) await expect(nav.getByRole('link', { name: item, exact: true }).isVisible()).resolves.toBe(true);
        await expectAccessible(page, `${account.email} home`);
      } finally {
        await context.close();
      }
    });
  }

  it('a person the identity provider knows but Plinth has given no role lands on "No access yet"', async () => {
    const context = await tabletContext(browser, TABLET_PORTRAIT);
    const page = await context.newPage();
    try {
      await signInThroughIdp(page, appUrl, 'newcomer@plinth.test', DEMO_PASSWORD);
      await page.getByRole('heading', { name: 'No access yet' }).waitFor();
      expect(await page.getByTestId('no-access-email').textContent()).toContain('newcomer@plinth.test');
      await expectAccessible(page, 'no access');
    } finally {
      await context.close();
    }
  });

  it('a wrong password keeps the person at the identity provider with a message', async () => {
    const context = await tabletContext(browser);
    const page = await context.newPage();
    try {
      await page.goto(`${appUrl}/signin`);
      await page.getByRole('link', { name: 'Sign in' }).click();
      await page.getByLabel('Email').fill('head@plinth.test');
      await page.getByLabel('Password').fill('not-the-password');
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.getByRole('alert').waitFor();
      expect(await page.getByRole('alert').textContent()).toContain('Email or password is not right.');
      expect(page.url().startsWith(appUrl)).toBe(false);
    } finally {
      await context.close();
    }
  });
});

describe('the shell', () => {
  it('switches production and role from the one header control (portrait tablet)', async () => {
    const context = await tabletContext(browser, TABLET_PORTRAIT);
    const page = await context.newPage();
    try {
      await signInThroughIdp(page, appUrl, 'head@plinth.test', DEMO_PASSWORD);
      await page.getByRole('heading', { level: 1, name: /Today · Department head/ }).waitFor();
      // One control, no repeated "production · role" label beside the wordmark.
      expect(await page.getByTestId('acting-context').count()).toBe(1);
      const control = page.getByTestId('account-control').getByRole('button', { name: /Marta Oyelaran/ });
      const box = await control.boundingBox();
      expect(box!.height).toBeGreaterThanOrEqual(44);
      await control.click();
      await expectAccessible(page, 'account control open');
      await page.getByRole('group', { name: 'Acting as' }).getByRole('radio', { name: 'Saltglass Mile — Artist' }).click();
      await page.getByRole('heading', { level: 1, name: /Today · Artist/ }).waitFor();
      expect(await page.getByTestId('acting-context').textContent()).toMatch(/Saltglass Mile/);
      await expectAccessible(page, 'home after switching');
      // Back again: the next sign-in lands on the seat last chosen, and other tests expect the head's.
      await control.click();
      await page.getByRole('group', { name: 'Acting as' }).getByRole('radio', { name: 'The Lantern Keeper — Department head' }).click();
      await page.getByRole('heading', { level: 1, name: /Today · Department head/ }).waitFor();
    } finally {
      await context.close();
    }
  });

  it('signs out of Plinth and of the identity provider: the next sign-in asks for the password again', async () => {
    const context = await tabletContext(browser);
    const page = await context.newPage();
    try {
      await signInThroughIdp(page, appUrl, 'artist@plinth.test', DEMO_PASSWORD);
      await page.getByRole('heading', { level: 1, name: /Today/ }).waitFor();
      await page.getByTestId('account-control').getByRole('button', { name: /Rafe Lindqvist/ }).click();
      await page.getByRole('button', { name: 'Sign out' }).click();
      await page.waitForURL(/\/signin/);
      await page.getByRole('link', { name: 'Sign in' }).waitFor();
      await page.getByRole('link', { name: 'Sign in' }).click();
      await page.getByLabel('Password').waitFor();
    } finally {
      await context.close();
    }
  });

  it('the admin gives a role and the notice e-mail appears in the Outbox', async () => {
    const context = await tabletContext(browser);
    const page = await context.newPage();
    try {
      await signInThroughIdp(page, appUrl, 'admin@plinth.test', DEMO_PASSWORD);
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Productions' }).click();
      await page.getByRole('link', { name: 'Saltglass Mile' }).click();
      await page.getByLabel('Person').selectOption({ label: 'Juno Castellane (performer@plinth.test)' }).catch(async () => {
        // Option labels may be the name alone.
        await page.getByLabel('Person').selectOption({ label: 'Juno Castellane' });
      });
      await page.getByLabel('Role').selectOption({ label: 'Performer' });
      await page.getByRole('button', { name: 'Add to team' }).click();
      await page.getByTestId('team-table').getByText('Juno Castellane').waitFor();
      await expectAccessible(page, 'production detail');
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Outbox' }).click();
      await page.getByText('Plinth: you are now Performer on Saltglass Mile').first().waitFor();
      await expectAccessible(page, 'outbox');
      await page.getByRole('button', { name: 'Read “Plinth: you are now Performer on Saltglass Mile”' }).first().click();
      await page.getByTestId('outbox-message').getByText('You now have the role "Performer" on Saltglass Mile').waitFor();
      await expectAccessible(page, 'outbox message');
      const files = (await readdir(inject('mailDir'))).filter((f) => f.endsWith('.eml'));
      expect(files.length).toBeGreaterThanOrEqual(1);
    } finally {
      await context.close();
    }
  });
});
