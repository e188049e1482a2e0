import type { Server } from 'node:http';
import { pathToFileURL } from 'node:url';
import type { RequestHandler } from 'express';
import { createApp } from './app.ts';
import { installMedicalKeys } from './crypto/medical-keys.ts';
import { createOidcClient } from './auth/oidc-client.ts';
import { type Config, ConfigError, parseConfig } from './config.ts';
import type { AppContext } from './context.ts';
import { createDb } from './db/index.ts';
import { allJobs } from './jobs/jobs.ts';
import { startJobRunner, type JobRunner } from './jobs/runner.ts';
import { createMailer } from './mail/mailer.ts';
import { createFileStore } from './files/store.ts';

export interface RunningServer {
  url: string;
  close(): Promise<void>;
}

export function log(msg: string, err?: unknown): void {
  const detail = err instanceof Error ? ` — ${err.stack ?? err.message}` : err ? ` — ${String(err)}` : '';
  console.error(`[plinth] ${msg}${detail}`);
}

/** Builds the app around a database URL and listens; the caller owns the database itself. */
export async function startServer(config: Config, databaseUrl: string, opts: { serveClient?: boolean; clientMiddleware?: RequestHandler } = {}): Promise<RunningServer> {
  installMedicalKeys(config);
  const handle = createDb(databaseUrl, { log });
  const mailer = createMailer(config.smtpUrl, config.mailFrom);
  const files = createFileStore(config.files);
  const ctx: AppContext = { config, db: handle.db, files, mailer, oidc: createOidcClient(config.oidc, log), log };
  const app = createApp({ ctx, pool: handle.pool, serveClient: opts.serveClient ?? true, clientMiddleware: opts.clientMiddleware });

  const server: Server = await new Promise((resolve, reject) => {
    const s = app.listen(config.port, config.host);
    s.once('listening', () => resolve(s));
    s.once('error', (err: NodeJS.ErrnoException) =>
      reject(err.code === 'EADDRINUSE' ? new Error(`Port ${config.port} (app) is already in use.`) : err),
    );
  });
  // Under NODE_ENV=test the runner stays off: tests start it themselves.
  const jobs: JobRunner | null = config.jobs ? await startJobRunner(ctx, { connectionString: databaseUrl, jobs: allJobs }) : null;
  return {
    url: config.appOrigin,
    async close() {
      await jobs?.stop();
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
      mailer.close();
      files.close();
      await handle.close();
    },
  };
}

// `npm run dev` runs this file under `tsx watch`, with Vite's dev server as middleware.
if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  let config: Config;
  try {
    config = parseConfig(process.env);
  } catch (err) {
    console.error(err instanceof ConfigError ? err.message : err);
    process.exit(1);
  }
  if (!config.databaseUrl) {
    console.error('DATABASE_URL is not set. Use `npm run dev` or `npm start`, which start the database first.');
    process.exit(1);
  }
  let clientMiddleware: RequestHandler | undefined;
  let closeVite: (() => Promise<void>) | undefined;
  if (process.env.PLINTH_VITE_MIDDLEWARE === '1') {
    const { createServer } = await import('vite');
    const vite = await createServer({ server: { middlewareMode: true, hmr: { port: Number(process.env.VITE_HMR_PORT ?? 24678) } }, appType: 'spa' });
    clientMiddleware = vite.middlewares as unknown as RequestHandler;
    closeVite = () => vite.close();
  }
  const running = await startServer(config, config.databaseUrl, { serveClient: !clientMiddleware, clientMiddleware });
  console.log(`[plinth] API listening on ${running.url}`);
  const stop = async () => {
    await running.close();
    await closeVite?.();
    process.exit(0);
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}
