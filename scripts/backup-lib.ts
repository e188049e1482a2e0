// Backup and restore: one archive holding a pg_dump of the database and every stored file, with a
// manifest of row counts and SHA-256 sums that a restore checks itself against.
import { execFile } from 'node:child_process';
import { createHash } from 'node:crypto';
import { createReadStream, existsSync } from 'node:fs';
import { copyFile, mkdir, mkdtemp, readdir, readFile, rm, stat, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { dirname, join, relative, sep } from 'node:path';
import { promisify } from 'node:util';
import pg from 'pg';
import * as tar from 'tar';
import { findPgBin } from './pg.ts';

const execFileAsync = promisify(execFile);
const MANIFEST = 'plinth-backup.json';
const DUMP = 'database.dump';
/** Caught development mail is not the studio's data; everything else under storage/ is. */
const SKIP_DIRS = new Set(['mail']);

export interface BackupManifest {
  format: 'plinth-backup';
  version: 1;
  createdAt: string;
  tables: Record<string, number>;
  files: { path: string; sha256: string; bytes: number }[];
}

async function sha256File(path: string): Promise<string> {
  const hash = createHash('sha256');
  for await (const chunk of createReadStream(path)) hash.update(chunk as Buffer);
  return hash.digest('hex');
}

async function listFiles(root: string, at = root): Promise<string[]> {
  if (!existsSync(at)) return [];
  const out: string[] = [];
  for (const entry of await readdir(at, { withFileTypes: true })) {
    const full = join(at, entry.name);
    if (entry.isDirectory()) {
      if (at === root && SKIP_DIRS.has(entry.name)) continue;
      out.push(...(await listFiles(root, full)));
    } else if (entry.isFile() && !entry.name.startsWith('.')) {
      out.push(relative(root, full).split(sep).join('/'));
    }
  }
  return out.sort();
}

/** Rows in every table of the public schema, by table name. */
export async function rowCounts(databaseUrl: string): Promise<Record<string, number>> {
  const client = new pg.Client({ connectionString: databaseUrl });
  await client.connect();
  try {
    const { rows } = await client.query<{ tablename: string }>(`select tablename from pg_tables where schemaname = 'public' order by tablename`);
    const counts: Record<string, number> = {};
    for (const { tablename } of rows) {
      const r = await client.query<{ n: string }>(`select count(*) as n from public."${tablename.replace(/"/g, '""')}"`);
      counts[tablename] = Number(r.rows[0]!.n);
    }
    return counts;
  } finally {
    await client.end();
  }
}

function pgTool(name: 'pg_dump' | 'pg_restore'): string {
  return join(findPgBin(), name);
}

/** Writes one .tar.gz with the database dump, the stored files and their manifest; returns the manifest. */
export async function backup(opts: { databaseUrl: string; storageDir: string; out: string }): Promise<BackupManifest> {
  const work = await mkdtemp(join(tmpdir(), 'plinth-backup-'));
  try {
    // The custom format restores with pg_restore, data before triggers and indexes.
    await execFileAsync(pgTool('pg_dump'), ['--format=custom', '--no-owner', '--no-privileges', `--file=${join(work, DUMP)}`, opts.databaseUrl], { maxBuffer: 64 * 1024 * 1024 });
    const files: BackupManifest['files'] = [];
    for (const path of await listFiles(opts.storageDir)) {
      const source = join(opts.storageDir, path);
      const target = join(work, 'storage', path);
      await mkdir(dirname(target), { recursive: true });
      await copyFile(source, target);
      files.push({ path, sha256: await sha256File(source), bytes: (await stat(source)).size });
    }
    const manifest: BackupManifest = { format: 'plinth-backup', version: 1, createdAt: new Date().toISOString(), tables: await rowCounts(opts.databaseUrl), files };
    await writeFile(join(work, MANIFEST), JSON.stringify(manifest, null, 2));
    await mkdir(dirname(opts.out), { recursive: true });
    await tar.create({ gzip: true, file: opts.out, cwd: work, portable: true }, [MANIFEST, DUMP, ...(files.length ? ['storage'] : [])]);
    return manifest;
  } finally {
    await rm(work, { recursive: true, force: true });
  }
}

export interface RestoreReport {
  manifest: BackupManifest;
  /** Tables whose row count differs from the backup's (empty when all match). */
  tableMismatches: { table: string; expected: number; found: number }[];
  /** Files missing or with another SHA-256 than the backup's (empty when all match). */
  fileMismatches: string[];
}

/**
 * Brings a backup back into an empty database and storage folder, then checks every table's row
 * count and every file's SHA-256 against the manifest. Refuses a database that already has tables.
 */
export async function restore(opts: { databaseUrl: string; storageDir: string; file: string }): Promise<RestoreReport> {
  const existing = await rowCounts(opts.databaseUrl);
  if (Object.keys(existing).length > 0) throw new Error('The target database is not empty; restore only into an empty database.');
  if ((await listFiles(opts.storageDir)).length > 0) throw new Error(`The storage folder ${opts.storageDir} is not empty; restore only into an empty one.`);
  const work = await mkdtemp(join(tmpdir(), 'plinth-restore-'));
  try {
    await tar.extract({ file: opts.file, cwd: work });
    const manifest = JSON.parse(await readFile(join(work, MANIFEST), 'utf8')) as BackupManifest;
    if (manifest.format !== 'plinth-backup' || manifest.version !== 1) throw new Error('This file is not a Plinth backup.');
    await execFileAsync(pgTool('pg_restore'), ['--no-owner', '--no-privileges', '--exit-on-error', `--dbname=${opts.databaseUrl}`, join(work, DUMP)], { maxBuffer: 64 * 1024 * 1024 });
    const fileMismatches: string[] = [];
    for (const f of manifest.files) {
      const source = join(work, 'storage', f.path);
      const target = join(opts.storageDir, f.path);
      await mkdir(dirname(target), { recursive: true });
      if (existsSync(source)) await copyFile(source, target);
      if (!existsSync(target) || (await sha256File(target)) !== f.sha256) fileMismatches.push(f.path);
    }
    const found = await rowCounts(opts.databaseUrl);
    const tableMismatches = Object.entries(manifest.tables)
      .filter(([table, n]) => found[table] !== n)
      .map(([table, expected]) => ({ table, expected, found: found[table] ?? -1 }));
    return { manifest, tableMismatches, fileMismatches };
  } finally {
    await rm(work, { recursive: true, force: true });
  }
}
