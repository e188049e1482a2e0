import { mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import type { TestProject } from 'vitest/node';
import { parseConfig } from '../../api/config.ts';
import { seedDemo } from '../../api/db/seed.ts';
import { localFileStore } from '../../api/files/drivers.ts';
import { installKeyring, keyringOf } from '../../api/crypto/medical.ts';
import { TEST_MEDICAL_KEY } from './app.ts';
import { startServer } from '../../api/server.ts';
import { startIdp } from '../../fake-idp/server.ts';
import { startMailCatcher } from '../../scripts/mail-catcher.ts';
import { freePort } from '../../scripts/ports.ts';
import { createTestDb } from './db.ts';

declare module 'vitest' {
  export interface ProvidedContext {
    appUrl: string;
    idpUrl: string;
    mailDir: string;
    databaseUrl: string;
  }
}

/**
 * The whole product for browser tests: a seeded database, the bundled identity provider, the
 * mail catcher, and the app serving a fresh client build, each on a free loopback port.
 */
export default async function setup(project: TestProject) {
  const root = path.resolve(import.meta.dirname, '../..');
  const { build } = await import('vite');
  await build({ root, logLevel: 'warn', configFile: path.join(root, 'vite.config.ts') });

  const db = await createTestDb();
  const storage = await mkdtemp(path.join(os.tmpdir(), 'plinth-browser-'));
  installKeyring(keyringOf(TEST_MEDICAL_KEY));
  await seedDemo(db.db, { files: localFileStore(storage) });
  const mail = await startMailCatcher({ port: 0, dir: path.join(storage, 'mail') });
  const appPort = await freePort();
  const origin = `http://127.0.0.1:${appPort}`;
  const idp = await startIdp({
    port: 0,
    quiet: true,
    clients: [{ clientId: 'plinth', clientSecret: 'plinth-dev-secret', redirectUris: [`${origin}/api/auth/callback`], postLogoutRedirectUris: [`${origin}/`] }],
  });
  const config = parseConfig({
    NODE_ENV: 'test',
    PORT: String(appPort),
    APP_ORIGIN: origin,
    OIDC_ISSUER: idp.issuer,
    SMTP_URL: `smtp://127.0.0.1:${mail.port}`,
    STORAGE_DIR: storage,
    DATABASE_URL: db.url,
    MEDICAL_DATA_KEY: TEST_MEDICAL_KEY,
  });
  const server = await startServer(config, db.url, { serveClient: true });

  project.provide('appUrl', origin);
  project.provide('idpUrl', idp.issuer);
  project.provide('mailDir', mail.dir);
  project.provide('databaseUrl', db.url);

  return async () => {
    await server.close();
    await idp.close();
    await mail.close();
    await db.drop();
    await rm(storage, { recursive: true, force: true });
  };
}
