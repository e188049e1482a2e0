// The scanner has no product page yet, so it is mounted on a harness page of its own
// (tests/browser/harness), built with the app's Vite config and served under the app's own
// Content-Security-Policy. Chromium's fake capture device plays a picture as the camera.
import type { Browser, Page } from 'playwright-core';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { qrPng } from '../../api/files/qr.ts';
import { expectAccessible, launchBrowser, TABLET_LANDSCAPE, TABLET_PORTRAIT, tabletContext } from '../support/browser.ts';
import { type FakeCamera, fakeCameraFromImage } from '../support/fake-camera.ts';
import { type Harness, serveScannerHarness } from './harness/serve.ts';

const appUrl = inject('appUrl');
const CODE = 'https://plinth.test/performers/7d1f0c52-3b7e-4c1a-9a55-2f4a1d6e8b90';

interface CameraLog {
  requests(): MediaStreamConstraints[];
  opened(): number;
  liveTracks(): number;
}

let harness: Harness;
let codeCamera: FakeCamera;
let blankCamera: FakeCamera;
/** Plays the QR code; the context's permissions decide whether the page may use it. */
let codeBrowser: Browser;
/** Plays a plain frame with no code, access granted: the scanner keeps looking. */
let blankBrowser: Browser;
/** Has no camera at all, access granted. */
let noCameraBrowser: Browser;

beforeAll(async () => {
  const appPage = await fetch(`${appUrl}/`);
  const csp = appPage.headers.get('content-security-policy');
  if (!csp) throw new Error('The app served no Content-Security-Policy to copy onto the harness.');
  harness = await serveScannerHarness(csp);
  codeCamera = await fakeCameraFromImage(await qrPng(CODE));
  blankCamera = await fakeCameraFromImage(await sharp({ create: { width: 400, height: 400, channels: 3, background: '#ffffff' } }).png().toBuffer());
  codeBrowser = await launchBrowser(codeCamera.deviceArgs);
  blankBrowser = await launchBrowser(blankCamera.args);
  noCameraBrowser = await launchBrowser(['--use-fake-ui-for-media-stream']);
});

afterAll(async () => {
  await codeBrowser?.close();
  await blankBrowser?.close();
  await noCameraBrowser?.close();
  await codeCamera?.dispose();
  await blankCamera?.dispose();
  await harness?.close();
});

/** What the harness page saw of the camera (see tests/browser/harness/main.tsx). */
function cameraLog<K extends keyof CameraLog>(page: Page, read: K): Promise<ReturnType<CameraLog[K]>> {
  return page.evaluate((key) => (window as unknown as { cameraLog: CameraLog }).cameraLog[key]() as ReturnType<CameraLog[K]>, read);
}

async function results(page: Page): Promise<string[]> {
  return JSON.parse((await page.getByTestId('results').textContent()) ?? '[]') as string[];
}

async function expectTouchSized(page: Page): Promise<void> {
  const scanner = page.getByRole('region', { name: 'Scan a label' });
  for (const control of await scanner.locator('button, input').all()) {
    const box = await control.boundingBox();
    expect(box?.height ?? 0, await control.evaluate((el) => el.outerHTML)).toBeGreaterThanOrEqual(44);
    expect(box?.width ?? 0).toBeGreaterThanOrEqual(44);
  }
}

describe('QR scanner with a camera', () => {
  it('reads the code the camera sees, reports it once and lets go of the camera; the reader loads only when a scanner opens', async () => {
    const context = await tabletContext(codeBrowser, TABLET_LANDSCAPE);
    await context.grantPermissions(['camera']);
    const page = await context.newPage();
    const scripts: string[] = [];
    page.on('request', (req) => {
      if (req.resourceType() === 'script') scripts.push(new URL(req.url()).pathname);
    });
    try {
      await page.goto(harness.url);
      await page.getByRole('button', { name: 'Open the scanner' }).waitFor();
      const beforeOpen = [...scripts];
      await page.getByRole('button', { name: 'Open the scanner' }).click();
      await page.getByTestId('qr-scanner-status').filter({ hasText: 'Code read.' }).waitFor();
      expect(await results(page)).toEqual([CODE]);
      expect(await cameraLog(page, 'liveTracks')).toBe(0);
      // The reader is its own chunk, fetched after the page had loaded without it.
      const reader = scripts.filter((s) => !beforeOpen.includes(s));
      expect(reader.length).toBeGreaterThan(0);
      expect(beforeOpen.some((s) => /decode/.test(s))).toBe(false);
      expect(reader.some((s) => /decode/.test(s))).toBe(true);
      await expectAccessible(page, 'scanner after a read');
    } finally {
      await context.close();
    }
  });

  it('while looking it shows the live camera under a clear instruction, asks for the rear camera, passes an accessibility check, and closing it stops the camera', async () => {
    const context = await tabletContext(blankBrowser, TABLET_PORTRAIT);
    const page = await context.newPage();
    try {
      await page.goto(harness.url);
      await page.getByRole('button', { name: 'Open the scanner' }).click();
      const scanner = page.getByRole('region', { name: 'Scan a label' });
      await scanner.getByRole('status').filter({ hasText: 'Point the camera at the code' }).waitFor();
      await page.waitForFunction(() => (document.querySelector('video')?.videoWidth ?? 0) > 0);
      expect(await page.evaluate(() => [document.querySelector('video')?.videoWidth, document.querySelector('video')?.videoHeight])).toEqual([640, 480]);
      const requests = await cameraLog(page, 'requests');
      expect(requests.at(-1)).toEqual({ video: { facingMode: { ideal: 'environment' } }, audio: false });
      expect(await cameraLog(page, 'liveTracks')).toBe(1);
      await expectAccessible(page, 'scanner looking');
      await expectTouchSized(page);

      await page.getByRole('button', { name: 'Close the scanner' }).click();
      await scanner.waitFor({ state: 'detached' });
      expect(await cameraLog(page, 'liveTracks')).toBe(0);
      expect(await results(page)).toEqual([]);
    } finally {
      await context.close();
    }
  });
});

describe('QR scanner without a camera', () => {
  it('when camera access is refused it says so, offers to try again, and takes a typed code instead', async () => {
    const context = await tabletContext(codeBrowser, TABLET_PORTRAIT);
    const page = await context.newPage();
    try {
      await page.goto(harness.url);
      await page.getByRole('button', { name: 'Open the scanner' }).click();
      const alert = page.getByRole('alert');
      await alert.filter({ hasText: 'The camera is not available' }).waitFor();
      expect(await alert.textContent()).toContain('Plinth is not allowed to use the camera');
      expect(await alert.getByRole('button', { name: 'Try again' }).isVisible()).toBe(true);
      expect(await cameraLog(page, 'opened')).toBe(0);
      await expectAccessible(page, 'camera refused');
      await expectTouchSized(page);

      await page.getByRole('button', { name: 'Open', exact: true }).click();
      await page.getByText('Type the code, or point the camera at it.').waitFor();
      expect(await page.getByLabel('Or type the code').getAttribute('aria-invalid')).toBe('true');
      expect(await results(page)).toEqual([]);

      await page.getByLabel('Or type the code').fill('  R3-S2-B07 ');
      await page.getByRole('button', { name: 'Open', exact: true }).click();
      await page.getByTestId('qr-scanner-status').filter({ hasText: 'Code read.' }).waitFor();
      expect(await results(page)).toEqual(['R3-S2-B07']);
    } finally {
      await context.close();
    }
  });

  it('on a device with no camera it says none was found, and trying again once access is granted to a real camera reads the code', async () => {
    const noCamera = await tabletContext(noCameraBrowser, TABLET_LANDSCAPE);
    const page = await noCamera.newPage();
    try {
      await page.goto(harness.url);
      await page.getByRole('button', { name: 'Open the scanner' }).click();
      await page.getByRole('alert').filter({ hasText: 'No camera was found on this device' }).waitFor();
      expect(await page.getByLabel('Or type the code').isVisible()).toBe(true);
      await expectAccessible(page, 'no camera');
    } finally {
      await noCamera.close();
    }

    // Refused first, then allowed: "Try again" opens the camera and the read goes through.
    const refused = await tabletContext(codeBrowser, TABLET_LANDSCAPE);
    const again = await refused.newPage();
    try {
      await again.goto(harness.url);
      await again.getByRole('button', { name: 'Open the scanner' }).click();
      await again.getByRole('alert').filter({ hasText: 'not allowed' }).waitFor();
      await refused.grantPermissions(['camera']);
      await again.getByRole('button', { name: 'Try again' }).click();
      await again.getByTestId('qr-scanner-status').filter({ hasText: 'Code read.' }).waitFor();
      expect(await results(again)).toEqual([CODE]);
      expect(await cameraLog(again, 'liveTracks')).toBe(0);
    } finally {
      await refused.close();
    }
  });
});
