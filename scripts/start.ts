/**
 * `npm start` (and `npm run dev` with --dev): brings up the whole of Plinth on loopback —
 * a private PostgreSQL cluster under .data/, migrations, demo data on first run, the bundled
 * identity provider, the local mail catcher, and the app.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, promises as fs, readdirSync, statSync } from 'node:fs';
import path from 'node:path';
import { type Config, ConfigError, parseConfig } from '../api/config.ts';
import { createDb } from '../api/db/index.ts';
import { migrateToLatest } from '../api/db/migrate.ts';
import { seedDemo } from '../api/db/seed.ts';
import { createFileStore } from '../api/files/store.ts';
import { installMedicalKeys } from '../api/crypto/medical-keys.ts';
import { resealColumns } from '../api/crypto/reseal.ts';
import { ensureDefaultProtocols } from '../api/features/protocols/index.ts';
import { startServer } from '../api/server.ts';
import { DEMO_PASSWORD, demoAccounts } from '../fake-idp/accounts.ts';
import { type Cluster, ensureDatabase, findPgBin, startCluster } from './pg.ts';
import { assertPortFree } from './ports.ts';

const root = path.resolve(import.meta.dirname, '..');
const dev = process.argv.includes('--dev');
const closers: (() => Promise<unknown>)[] = [];
let stopping = false;

async function shutdown(code: number): Promise<never> {
  if (!stopping) {
    stopping = true;
    const force = setTimeout(() => process.exit(code || 1), 15_000);
    force.unref();
    for (const close of closers.toReversed()) {
      try {
        await close();
      } catch (err) {
        console.error(`while stopping: ${err instanceof Error ? err.message : String(err)}`);
      }
    }
  }
  process.exit(code);
}

function newestMtime(dir: string): number {
  if (!existsSync(dir)) return 0;
  let newest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const p = path.join(dir, entry.name);
    newest = Math.max(newest, entry.isDirectory() ? newestMtime(p) : statSync(p).mtimeMs);
  }
  return newest;
}

/** The client is rebuilt when there is no build, or when app/ or shared/ changed since it was made. */
async function ensureClientBuild(): Promise<void> {
  const index = path.join(root, 'dist', 'index.html');
  const built = existsSync(index) ? statSync(index).mtimeMs : 0;
  const sources = Math.max(newestMtime(path.join(root, 'app')), newestMtime(path.join(root, 'shared')), statSync(path.join(root, 'index.html')).mtimeMs);
  if (built && built >= sources) return;
  console.log(built ? 'Client sources changed; rebuilding…' : 'Building the client (first run)…');
  const { build } = await import('vite');
  await build({ root, logLevel: 'warn', configFile: path.join(root, 'vite.config.ts') });
}

async function main(): Promise<void> {
  let config: Config;
  try {
    config = parseConfig(process.env);
  } catch (err) {
    console.error(err instanceof ConfigError ? err.message : err);
    process.exit(1);
  }

  await assertPortFree(config.port, 'app', config.host);
  if (config.startFakes) {
    await assertPortFree(config.idpPort, 'identity provider');
    await assertPortFree(config.smtpCatcherPort, 'mail catcher');
  }

  let databaseUrl = config.databaseUrl;
  if (!databaseUrl) {
    findPgBin();
    const cluster: Cluster = await startCluster({
      dataDir: path.join(root, '.data', 'postgres'),
      port: config.dbPort,
      password: config.dbPassword,
    });
    closers.push(() => cluster.stop());
    if (await ensureDatabase(cluster, 'plinth')) console.log('Created database "plinth".');
    databaseUrl = cluster.url('plinth');
  }

  // Health details are sealed from the first demo consent on: the key exists before the seed runs.
  installMedicalKeys(config);
  const handle = createDb(databaseUrl, { max: 2 });
  const files = createFileStore(config.files);
  try {
    const applied = await migrateToLatest(handle.db);
    if (applied.length) console.log(`Migrations applied: ${applied.join(', ')}`);
    // A column that became sealed after it had rows holds them in plain text until they are sealed here.
    const sealed = await resealColumns(handle.db, { onlyPlain: true });
    if (sealed) console.log(`Sealed ${sealed} health details left in plain text by an earlier release.`);
    // Demo people and records never enter a production database.
    if (!config.isProduction && (await seedDemo(handle.db, { files }))) console.log('Loaded the demo scenario (The Lantern Keeper).');
    // The test protocols a studio starts with are not demo data: every database gets them once.
    const protocols = await ensureDefaultProtocols(handle.db);
    if (protocols.length) console.log(`Added the default test protocols: ${protocols.join(', ')}`);
  } finally {
    files.close();
    await handle.close();
  }

  await fs.mkdir(config.storageDir, { recursive: true });
  if (config.startFakes) {
    // Loaded only here: a production install leaves these development fakes out.
    const { startMailCatcher } = await import('./mail-catcher.ts');
    const { startIdp } = await import('../fake-idp/server.ts');
    const catcher = await startMailCatcher({ port: config.smtpCatcherPort, dir: config.mailDir });
    closers.push(() => catcher.close());
    const idp = await startIdp({
      port: config.idpPort,
      quiet: true,
      clients: [
        {
          clientId: config.oidc.clientId,
          clientSecret: config.oidc.clientSecret,
          redirectUris: [config.oidc.redirectUri],
          postLogoutRedirectUris: [config.oidc.postLogoutRedirectUri],
        },
      ],
    });
    closers.push(() => idp.close());
  }

  if (dev) {
    // The API restarts on change under tsx watch; Vite serves the client with hot reload inside it.
    const child: ChildProcess = spawn(process.execPath, [path.join(root, 'node_modules/tsx/dist/cli.mjs'), 'watch', '--clear-screen=false', path.join(root, 'api/server.ts')], {
      stdio: 'inherit',
      env: { ...process.env, DATABASE_URL: databaseUrl, PLINTH_VITE_MIDDLEWARE: '1' },
    });
    closers.push(
      () =>
        new Promise<void>((resolve) => {
          if (child.exitCode !== null) return resolve();
          child.once('exit', () => resolve());
          child.kill('SIGTERM');
        }),
    );
    child.once('exit', (code) => {
      if (!stopping) void shutdown(code ?? 1);
    });
  } else {
    await ensureClientBuild();
    const server = await startServer(config, databaseUrl, { serveClient: true });
    closers.push(() => server.close());
  }

  const width = Math.max(...demoAccounts.map((a) => a.email.length));
  console.log(
    [
      '',
      `Plinth is running at ${config.appOrigin}${dev ? ' (development mode)' : ''}`,
      config.startFakes ? `Identity provider: http://127.0.0.1:${config.idpPort}   Mail catcher: smtp://127.0.0.1:${config.smtpCatcherPort} (messages in ${path.relative(root, config.mailDir)}/)` : '',
      '',
      config.startFakes ? `Demo sign-ins (password for all: ${DEMO_PASSWORD}):` : '',
      ...(config.startFakes ? demoAccounts.map((a) => `  ${a.email.padEnd(width)}  ${a.description}`) : []),
      '',
      'Press Ctrl-C to stop.',
    ]
      .filter((l, i, all) => l !== '' || all[i - 1] !== '')
      .join('\n'),
  );
}

process.on('SIGINT', () => void shutdown(0));
process.on('SIGTERM', () => void shutdown(0));
main().catch((err: unknown) => {
  console.error(`\nPlinth could not start: ${err instanceof Error ? err.message : String(err)}`);
  void shutdown(1);
});
