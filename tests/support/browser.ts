import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { type Browser, type BrowserContext, chromium, type Page } from 'playwright-core';
import { expect } from 'vitest';

const CHROMIUM = '/usr/bin/chromium';
const require = createRequire(import.meta.url);
const AXE_SOURCE = readFileSync(require.resolve('axe-core/axe.min.js'), 'utf8');

export const TABLET_LANDSCAPE = { width: 1024, height: 768 };
export const TABLET_PORTRAIT = { width: 768, height: 1024 };

/**
 * Debian's Chromium, never a downloaded browser; flags keep it off the network and quiet.
 * `extraArgs` add switches for one test file, such as a fake camera (tests/support/fake-camera.ts).
 */
export function launchBrowser(extraArgs: readonly string[] = []): Promise<Browser> {
  return chromium.launch({
    executablePath: CHROMIUM,
    headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--disable-dev-shm-usage', ...extraArgs],
  });
}

/** A tablet's browser: British English on the studio's clock unless a test names another locale. */
export async function tabletContext(browser: Browser, viewport = TABLET_LANDSCAPE, options: { locale?: string } = {}): Promise<BrowserContext> {
  return browser.newContext({ viewport, hasTouch: true, isMobile: false, deviceScaleFactor: 1, locale: options.locale ?? 'en-GB', timezoneId: 'Europe/London' });
}

/** Runs `run` on a fresh page in a tablet-sized context of its own, closed whatever happens. */
export async function withTabletPage(browser: Browser, viewport: { width: number; height: number }, run: (page: Page) => Promise<void>): Promise<void> {
  const context = await tabletContext(browser, viewport);
  try {
    await run(await context.newPage());
  } finally {
    await context.close();
  }
}

export interface AxeViolation {
  id: string;
  impact: string | null;
  help: string;
  nodes: { target: string[] }[];
}

/** Runs axe-core in the page; fails on any serious or critical violation, naming each. */
export async function expectAccessible(page: Page, label: string): Promise<void> {
  // Colours read mid-transition (a button just pressed fades to its new colour) are neither the old nor
  // the new pair: let running CSS transitions finish first, so contrast is judged on what stays on screen.
  await page.waitForFunction(() => document.getAnimations().every((a) => !(a instanceof CSSTransition) || a.playState !== 'running'), undefined, { timeout: 5_000 });
  // Evaluated through the debugging protocol, so the page's own CSP (which forbids inline scripts) stays on.
  await page.evaluate(AXE_SOURCE);
  const violations = await page.evaluate(async () => {
    const axe = (window as unknown as { axe: { run: (ctx: Document, opts: object) => Promise<{ violations: AxeViolation[] }> } }).axe;
    const result = await axe.run(document, { runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22aa'] } });
    return result.violations.map((v) => ({ id: v.id, impact: v.impact, help: v.help, nodes: v.nodes.map((n) => ({ target: n.target })) }));
  });
  const bad = violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
  expect(bad.map((v) => `${label}: ${v.id} (${v.impact}) ${v.help} at ${v.nodes.map((n) => n.target.join(' ')).join(', ')}`)).toEqual([]);
}

/** Signs in through the real identity provider pages, as a person would. */
export async function signInThroughIdp(page: Page, appUrl: string, email: string, password: string): Promise<void> {
  await page.goto(`${appUrl}/`);
  await page.getByRole('link', { name: 'Sign in' }).or(page.getByRole('button', { name: 'Sign in' })).first().click();
  await page.getByLabel('Email').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((url) => url.href.startsWith(appUrl) && !url.pathname.startsWith('/api/'));
}
