import { createHmac, randomBytes } from 'node:crypto';
import { mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import type { Express } from 'express';
import { createApp } from '../../api/app.ts';
import { createOidcClient } from '../../api/auth/oidc-client.ts';
import { type Config, parseConfig } from '../../api/config.ts';
import type { AppContext } from '../../api/context.ts';
import { seedDemo } from '../../api/db/seed.ts';
import { installKeyring, keyringOf } from '../../api/crypto/medical.ts';
import { SESSION_COOKIE } from '../../api/http/session.ts';
import { createMailer } from '../../api/mail/mailer.ts';
import { startMailCatcher, type MailCatcher } from '../../scripts/mail-catcher.ts';
import { createDb } from '../../api/db/index.ts';
import { createFileStore } from '../../api/files/store.ts';
import { createTestBucket, testS3Endpoint } from './s3.ts';
import { createTestDb, type TestDb } from './db.ts';

export interface TestApp {
  app: Express;
  ctx: AppContext;
  config: Config;
  db: TestDb;
  mail: MailCatcher;
  /** Every line the app logged, in order. */
  logs: string[];
  /** A session for this user (by e-mail) made directly in the session store; returns the Cookie header. */
  sessionFor(email: string): Promise<string>;
  userId(email: string): Promise<string>;
  /** The bytes exactly as stored (sealed files still sealed), from the disk or the bucket; throws when the file is missing. */
  storedBytes(storagePath: string): Promise<Buffer>;
  close(): Promise<void>;
}

/** The key health details are sealed with in tests (a test may pass its own as MEDICAL_DATA_KEY). */
export const TEST_MEDICAL_KEY = Buffer.alloc(32, 7).toString('base64');

export const TEST_SESSION_SECRET = 'test-session-secret-0123456789abcdef-xyz';

/** The real app on a fresh database with the demo data, a real SMTP catcher, and config from an object. */
export async function createTestApp(overrides: Record<string, string> = {}, opts: { seed?: boolean; database?: string } = {}): Promise<TestApp> {
  // A database of the test's own (a restored one, say), left in place on close; else a fresh clone.
  const db: TestDb = opts.database ? { ...createDb(opts.database, { max: 5, log: () => {} }), name: 'given', url: opts.database, async drop() { await this.close(); } } : await createTestDb();
  const storage = await mkdtemp(path.join(os.tmpdir(), 'plinth-storage-'));
  installKeyring(keyringOf(overrides.MEDICAL_DATA_KEY ?? TEST_MEDICAL_KEY));
  // Stored files go to a bucket of the test runner's S3 fake, unless a test asks for the local disk.
  const endpoint = testS3Endpoint();
  const fileStore = endpoint && overrides.FILE_STORE !== 'local' ? await createTestBucket(endpoint) : {};
  const mail = await startMailCatcher({ port: 0, dir: path.join(storage, 'mail') });
  const config = parseConfig({
    NODE_ENV: 'test',
    PORT: '0',
    APP_ORIGIN: 'http://127.0.0.1:3999',
    SESSION_SECRET: TEST_SESSION_SECRET,
    SMTP_URL: `smtp://127.0.0.1:${mail.port}`,
    STORAGE_DIR: storage,
    DATABASE_URL: db.url,
    MEDICAL_DATA_KEY: TEST_MEDICAL_KEY,
    ...fileStore,
    ...overrides,
  });
  const files = createFileStore(config.files);
  if (opts.seed !== false) await seedDemo(db.db, { files });
  const logged: string[] = [];
  const ctx: AppContext = {
    config,
    db: db.db,
    files,
    mailer: createMailer(config.smtpUrl, config.mailFrom),
    oidc: createOidcClient(config.oidc, (msg) => logged.push(msg)),
    log: (msg, err) => logged.push(`${msg} ${err instanceof Error ? err.message : ''}`),
  };
  const app = createApp({ ctx, pool: db.pool });

  async function userId(email: string): Promise<string> {
    const row = await db.db.selectFrom('users').select('id').where('email', '=', email).executeTakeFirst();
    if (!row) throw new Error(`no user ${email}`);
    return row.id;
  }

  return {
    app,
    ctx,
    config,
    db,
    mail,
    logs: logged,
    userId,
    async storedBytes(storagePath: string) {
      const bytes = await files.get(storagePath);
      if (!bytes) throw new Error(`no stored file ${storagePath} in the ${files.driver} store`);
      return bytes;
    },
    async sessionFor(email: string) {
      const id = await userId(email);
      const sid = randomBytes(24).toString('base64url');
      const expires = new Date(Date.now() + 3600_000);
      await db.db
        .insertInto('sessions')
        .values({ sid, sess: JSON.stringify({ cookie: { originalMaxAge: 3600_000, expires: expires.toISOString(), httpOnly: true, path: '/', sameSite: 'lax' }, userId: id, signedInAt: Date.now() }), expire: expires })
        .execute();
      // The same signature express-session checks: HMAC-SHA256, base64 without padding.
      const sig = createHmac('sha256', TEST_SESSION_SECRET).update(sid).digest('base64').replace(/=+$/, '');
      return `${SESSION_COOKIE}=${encodeURIComponent(`s:${sid}.${sig}`)}`;
    },
    async close() {
      ctx.mailer.close();
      files.close();
      await mail.close();
      await db.drop();
      await rm(storage, { recursive: true, force: true });
    },
  };
}
