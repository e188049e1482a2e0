// Finding Debian's PostgreSQL server binaries, and installing packages with apt-get when we are root.
import { spawnSync } from 'node:child_process';
import { accessSync, constants as fsConstants, existsSync, readdirSync } from 'node:fs';
import { join } from 'node:path';

const PG_ROOT = '/usr/lib/postgresql';
const REQUIRED_BINARIES = ['initdb', 'pg_ctl', 'postgres'] as const;
const NOT_FOUND_MESSAGE =
  'PostgreSQL server binaries not found. Install Debian\'s "postgresql" package (sudo apt-get install postgresql) and run again.';


export function isRoot(): boolean {
  return process.getuid?.() === 0;
}

function isExecutable(path: string): boolean {
  try {
    accessSync(path, fsConstants.X_OK);
    return true;
  } catch {
    return false;
  }
}

export function runuserPath(): string {
  // CI's PATH is not guaranteed to include the sbin folders.
  return existsSync('/usr/sbin/runuser') ? '/usr/sbin/runuser' : 'runuser';
}

function installedServers(): { version: string; bin: string }[] {
  let entries: string[];
  try {
    entries = readdirSync(PG_ROOT);
  } catch {
    return [];
  }
  return entries
    .filter((name) => /^\d+(\.\d+)?$/.test(name))
    .sort((a, b) => Number.parseFloat(b) - Number.parseFloat(a))
    .map((version) => ({ version, bin: join(PG_ROOT, version, 'bin') }))
    .filter(({ bin }) => REQUIRED_BINARIES.every((name) => isExecutable(join(bin, name))));
}

function hasAptLists(): boolean {
  try {
    return readdirSync('/var/lib/apt/lists').some((name) => /_Packages(\.|$)/.test(name));
  } catch {
    return false;
  }
}

/**
 * Installs Debian packages as root. `apt-get update` runs only when there are
 * no package lists yet, or when an install from the existing lists fails
 * (stale lists point at files the mirror no longer has).
 */
export function aptInstall(packages: readonly string[]): void {
  if (!isRoot()) {
    throw new Error(`Installing ${packages.join(', ')} needs root (sudo apt-get install ${packages.join(' ')}).`);
  }
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  let updated = false;
  const update = (): void => {
    updated = true;
    // Exits non-zero when any one configured source is unreachable, even though
    // the reachable ones were refreshed, so the install below decides success.
    spawnSync('apt-get', ['update'], { stdio: 'inherit', env });
  };
  const install = (): number | null =>
    spawnSync(
      'apt-get',
      // Another engineer's run may hold the dpkg lock; wait for it rather than fail.
      ['install', '-y', '--no-install-recommends', '-o', 'DPkg::Lock::Timeout=300', ...packages],
      { stdio: 'inherit', env },
    ).status;

  if (!hasAptLists()) update();
  let status = install();
  if (status !== 0 && !updated) {
    update();
    status = install();
  }
  if (status !== 0) {
    throw new Error(`apt-get install ${packages.join(' ')} failed (exit ${status ?? 'by signal'}); see its output above.`);
  }
}

export function findPgBin(opts: { install?: boolean } = {}): string {
  const found = installedServers()[0];
  if (found) return found.bin;
  if (!isRoot() || opts.install === false) throw new Error(NOT_FOUND_MESSAGE);

  console.log("PostgreSQL server not found; installing Debian's postgresql package…");
  aptInstall(['postgresql']);
  const installed = installedServers();
  // The package starts a system cluster on 5432. Stopping it keeps anything
  // from quietly relying on it instead of on the private clusters made here.
  if (existsSync('/usr/bin/pg_ctlcluster')) {
    for (const { version } of installed) {
      spawnSync('pg_ctlcluster', [version, 'main', 'stop'], { stdio: 'ignore' });
    }
  }
  const bin = installed[0]?.bin;
  if (!bin) throw new Error(`${NOT_FOUND_MESSAGE} (The postgresql package installed, but no server was found under ${PG_ROOT}.)`);
  return bin;
}
