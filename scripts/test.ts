// `npm test`: runs vitest against a throwaway PostgreSQL cluster that lives
// only as long as this process, so tests can never touch the dev data in .data/.
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync } from 'node:fs';
import { constants as osConstants } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { aptInstall, createThrowawayCluster } from './pg.ts';
import { startS3Fake } from './s3-fake.ts';

const repoRoot = fileURLToPath(new URL('..', import.meta.url));
const vitestBin = join(repoRoot, 'node_modules', '.bin', 'vitest');
const CHROMIUM = '/usr/bin/chromium';

function projectFilters(args: readonly string[]): string[] {
  const filters: string[] = [];
  for (let i = 0; i < args.length; i++) {
    const arg = args[i] ?? '';
    if (arg === '--') break;
    if (arg === '--project') {
      const value = args[i + 1];
      if (value !== undefined) filters.push(value);
      i++;
    } else if (arg.startsWith('--project=')) {
      filters.push(arg.slice('--project='.length));
    }
  }
  return filters;
}

function globMatches(pattern: string, name: string): boolean {
  const source = pattern
    .split('*')
    .map((part) => part.replace(/[.+?^${}()|[\]\\]/g, '\\$&'))
    .join('.*');
  return new RegExp(`^${source}$`).test(name);
}

/** Mirrors vitest's --project filter (wildcards, "!" to exclude) closely enough to know whether "browser" is in. */
function browserProjectWillRun(args: readonly string[]): boolean {
  const filters = projectFilters(args);
  const excluded = filters.filter((f) => f.startsWith('!')).map((f) => f.slice(1));
  const included = filters.filter((f) => !f.startsWith('!'));
  if (excluded.some((f) => globMatches(f, 'browser'))) return false;
  return included.length === 0 || included.some((f) => globMatches(f, 'browser'));
}

function ensureChromium(): void {
  if (existsSync(CHROMIUM)) return;
  if (process.getuid?.() !== 0) {
    throw new Error(
      `The browser tests need Chromium at ${CHROMIUM}. Install Debian's "chromium" package ` +
        '(sudo apt-get install chromium) and run again, or leave them out with --project unit --project api.',
    );
  }
  console.log(`The browser tests need Chromium and ${CHROMIUM} is missing; installing Debian's chromium package…`);
  aptInstall(['chromium']);
  if (!existsSync(CHROMIUM)) throw new Error(`Debian's chromium package installed, but ${CHROMIUM} is still missing.`);
}

let child: ChildProcess | undefined;
let interruptedBy: NodeJS.Signals | undefined;
let signalCount = 0;

function signalExitCode(signal: NodeJS.Signals): number {
  return 128 + (osConstants.signals[signal] ?? 1);
}

function onSignal(signal: NodeJS.Signals): void {
  interruptedBy ??= signal;
  signalCount++;
  if (child && child.exitCode === null && child.signalCode === null) {
    // A terminal's Ctrl-C already reached vitest through the process group;
    // forwarding covers a plain `kill`. A third signal means vitest is stuck.
    child.kill(signalCount >= 3 ? 'SIGKILL' : signal);
  }
}

function runVitest(args: readonly string[]): Promise<number> {
  return new Promise<number>((resolvePromise, reject) => {
    child = spawn(vitestBin, ['run', ...args], { stdio: 'inherit', env: process.env });
    child.once('error', reject);
    child.once('exit', (code, signal) => {
      resolvePromise(code ?? (signal ? signalExitCode(signal) : 1));
    });
  });
}

async function main(): Promise<number> {
  const args = process.argv.slice(2);
  // Before the cluster exists: an install can take minutes and needs no database.
  if (browserProjectWillRun(args)) ensureChromium();

  const { cluster, dispose } = await createThrowawayCluster();
  // The API tests keep their stored files in buckets of this fake, as several API processes would.
  const s3 = await startS3Fake();
  try {
    if (interruptedBy) return signalExitCode(interruptedBy);
    // Tests create their own databases from this one, so parallel files do not collide.
    process.env.TEST_DATABASE_URL = cluster.url('postgres');
    process.env.TEST_S3_ENDPOINT = s3.endpoint;
    // The SDK's notice that Node 20 support ends later is not a test failure.
    process.env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED = 'true';
    process.env.NODE_ENV = 'test';
    return await runVitest(args);
  } finally {
    await s3.close();
    await dispose();
  }
}

process.on('SIGINT', onSignal);
process.on('SIGTERM', onSignal);

main().then(
  (code) => process.exit(interruptedBy && code === 0 ? signalExitCode(interruptedBy) : code),
  (err: unknown) => {
    // After an interrupt the error is just the signal's echo from a killed child.
    if (interruptedBy) {
      console.error(`Interrupted by ${interruptedBy}; the test cluster has been removed.`);
      process.exit(signalExitCode(interruptedBy));
    }
    console.error(err instanceof Error ? err.message : err);
    process.exit(1);
  },
);
