import { mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { build, preview } from 'vite';
import { freePort } from '../../../scripts/ports.ts';

const ROOT = path.resolve(import.meta.dirname, '../../..');

export interface Harness {
  /** The harness page's address. */
  url: string;
  close(): Promise<void>;
}

/**
 * Builds the scanner harness with the app's own Vite config (same plugins, same chunking) into a
 * throwaway folder and serves it from a loopback port with the given Content-Security-Policy, so
 * the scanner runs under the same rules as the product's pages.
 */
export async function serveScannerHarness(contentSecurityPolicy: string): Promise<Harness> {
  const outDir = await mkdtemp(path.join(os.tmpdir(), 'plinth-harness-'));
  const configFile = path.join(ROOT, 'vite.config.ts');
  await build({
    root: ROOT,
    configFile,
    logLevel: 'warn',
    build: { outDir, emptyOutDir: true, sourcemap: false, rolldownOptions: { input: path.join(ROOT, 'tests/browser/harness/index.html') } },
  });
  const port = await freePort();
  const server = await preview({
    root: ROOT,
    configFile,
    logLevel: 'warn',
    build: { outDir },
    preview: { host: '127.0.0.1', port, strictPort: true, open: false, headers: { 'Content-Security-Policy': contentSecurityPolicy } },
  });
  return {
    url: `http://127.0.0.1:${port}/tests/browser/harness/index.html`,
    async close() {
      await server.close();
      await rm(outDir, { recursive: true, force: true });
    },
  };
}
