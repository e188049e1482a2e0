import { mkdir } from 'node:fs/promises';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { DEMO_PASSWORD } from '../../fake-idp/accounts.ts';
import { expectAccessible, launchBrowser, signInThroughIdp, TABLET_LANDSCAPE, TABLET_PORTRAIT, tabletContext } from '../support/browser.ts';

const appUrl = inject('appUrl');
// Screenshots for a person to look over; tests/.artifacts/ is git-ignored.
const SHOTS = path.resolve(import.meta.dirname, '../.artifacts/tablet-layout');
const VIEWPORTS = [
  { name: 'portrait', size: TABLET_PORTRAIT },
  { name: 'landscape', size: TABLET_LANDSCAPE },
] as const;

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
  await mkdir(SHOTS, { recursive: true });
});
afterAll(async () => {
  await browser?.close();
});

const UUID = /[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}/gi;

/** One page per kind: /performers/<id> stands for every performer's page. */
function pattern(pathname: string): string {
  return pathname.replace(UUID, ':id').replace(/\/archive\/labels\/[^/]+/, '/archive/labels/:code');
}

/** Pages a role reaches by its links; not the server's downloads, nor the public one-time-link pages. */
function followable(href: string): string | null {
  const url = new URL(href, appUrl);
  if (url.origin !== appUrl) return null;
  if (/^\/(api|signin|no-access|tablet|sign\/|withdraw|confirm-email|join)/.test(url.pathname)) return null;
  return url.pathname;
}

interface Overflow {
  page: number;
  viewport: number;
  tables: string[];
  badges: string[];
}

/** Sideways scroll of the page, any table wider than its box, any state badge cut by the screen's edge. */
function measure(page: Page): Promise<Overflow> {
  return page.evaluate(() => {
    const tables: string[] = [];
    for (const table of document.querySelectorAll('table')) {
      const box = table.parentElement!;
      const name = table.querySelector('caption')?.textContent?.trim() || table.getAttribute('data-testid') || 'a table';
      if (table.getBoundingClientRect().width > box.clientWidth + 1 || box.scrollWidth > box.clientWidth + 1) tables.push(name);
    }
    const badges: string[] = [];
    for (const badge of document.querySelectorAll('[data-tone]')) {
      const r = badge.getBoundingClientRect();
      if (r.width > 0 && (r.right > window.innerWidth + 1 || r.left < -1)) badges.push(badge.textContent ?? '');
    }
    return { page: document.documentElement.scrollWidth, viewport: window.innerWidth, tables, badges };
  });
}

async function settle(page: Page) {
  await page.waitForLoadState('networkidle');
  await page.locator('h1').first().waitFor();
  await page.waitForFunction(() => !document.querySelector('[aria-busy="true"]') && !/Loading/.test(document.querySelector('main')?.textContent ?? ''));
}

const ROLES = [
  { email: 'admin@plinth.test', slug: 'admin' },
  { email: 'head@plinth.test', slug: 'head' },
  { email: 'lead@plinth.test', slug: 'lead' },
  { email: 'artist@plinth.test', slug: 'artist' },
  { email: 'archivist@plinth.test', slug: 'archivist' },
  { email: 'performer@plinth.test', slug: 'performer' },
];

describe('every page a demo role reaches fits a tablet, upright and sideways', () => {
  for (const role of ROLES) {
    it(`${role.slug}: no sideways scroll, no table wider than its box, no badge cut off`, { timeout: 600_000 }, async () => {
      const context = await tabletContext(browser, TABLET_PORTRAIT);
      const page = await context.newPage();
      const problems: string[] = [];
      try {
        await signInThroughIdp(page, appUrl, role.email, DEMO_PASSWORD);
        await settle(page);
        // The main navigation, then every page one link further from each of those.
        const seen = new Set<string>();
        const queue: { path: string; depth: number }[] = [{ path: '/', depth: 0 }];
        for (const href of await page.getByRole('navigation', { name: 'Main' }).getByRole('link').evaluateAll((links) => links.map((a) => (a as HTMLAnchorElement).href))) {
          const p = followable(href);
          if (p) queue.push({ path: p, depth: 1 });
        }
        while (queue.length > 0) {
          const { path: at, depth } = queue.shift()!;
          const kind = pattern(at);
          if (seen.has(kind)) continue;
          seen.add(kind);
          await page.setViewportSize(TABLET_PORTRAIT);
          await page.goto(`${appUrl}${at}`);
          await settle(page);
          for (const viewport of VIEWPORTS) {
            await page.setViewportSize(viewport.size);
            // Two frames: the tables' resize observers have decided between table and cards.
            await page.evaluate(() => new Promise((done) => requestAnimationFrame(() => requestAnimationFrame(done))));
            const m = await measure(page);
            const where = `${kind} at ${viewport.size.width}×${viewport.size.height}`;
            if (m.page > m.viewport) problems.push(`${where}: the page is ${m.page} px wide in a ${m.viewport} px screen`);
            for (const t of m.tables) problems.push(`${where}: "${t}" is wider than its box`);
            for (const b of m.badges) problems.push(`${where}: the badge "${b}" is cut off`);
            const file = `${role.slug}-${viewport.name}-${kind.replace(/[/:]+/g, '_').replace(/^_|_$/g, '') || 'home'}.png`;
            await page.screenshot({ path: path.join(SHOTS, file), fullPage: true });
          }
          await expectAccessible(page, `${role.slug} ${kind}`);
          if (depth < 2) {
            const hrefs = await page.locator('main a[href]').evaluateAll((links) => links.map((a) => (a as HTMLAnchorElement).href));
            for (const href of hrefs) {
              const p = followable(href);
              if (p && !seen.has(pattern(p))) queue.push({ path: p, depth: depth + 1 });
            }
          }
        }
        expect(seen.size).toBeGreaterThan(1);
        expect(problems).toEqual([]);
      } finally {
        await context.close();
      }
    });
  }
});
