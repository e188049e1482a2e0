/**
 * `npm run backup [-- FILE]`: the database and every stored file into one archive (default
 * backups/plinth-<time>.tar.gz). `npm run restore -- FILE`: brings one back into an empty database
 * and storage folder, and checks row counts and SHA-256 sums against the archive's manifest.
 * Uses DATABASE_URL if set, else the private cluster in .data/ (started for the moment if it is not running).
 */
import path from 'node:path';
import pg from 'pg';
import { type Config, ConfigError, parseConfig } from '../api/config.ts';
import { backup, restore } from './backup-lib.ts';
import { ensureDatabase, startCluster } from './pg.ts';

const root = path.resolve(import.meta.dirname, '..');

async function reachable(url: string): Promise<boolean> {
  const c = new pg.Client({ connectionString: url, connectionTimeoutMillis: 1500 });
  try {
    await c.connect();
    await c.end();
    return true;
  } catch {
    return false;
  }
}

async function withDatabase<T>(config: Config, fn: (url: string) => Promise<T>): Promise<T> {
  if (config.databaseUrl) return fn(config.databaseUrl);
  const cluster = await startCluster({ dataDir: path.join(root, '.data', 'postgres'), port: config.dbPort, password: config.dbPassword, quiet: true });
  const url = cluster.url('plinth');
  // Already running (npm start in another terminal): use it and leave it running.
  const wasRunning = await reachable(url);
  try {
    await ensureDatabase(cluster, 'plinth');
    return await fn(url);
  } finally {
    if (!wasRunning) await cluster.stop();
  }
}

async function main(): Promise<void> {
  let config: Config;
  try {
    config = parseConfig(process.env);
  } catch (err) {
    console.error(err instanceof ConfigError ? err.message : err);
    process.exit(1);
  }
  const [command, file] = process.argv.slice(2);
  if (config.files.driver !== 'local') {
    // The bucket keeps its own copies (versioning, replication); this archive is for files on disk.
    console.error(
      `FILE_STORE=${config.files.driver}: the stored files live in the bucket "${config.files.bucket}", which this command does not copy. ` +
        'Back up the database with pg_dump and the bucket with its own versioning or replication (see "Backup and restore" in README.md).',
    );
    process.exit(2);
  }
  if (command === 'backup') {
    const out = path.resolve(file ?? path.join(root, 'backups', `plinth-${new Date().toISOString().replace(/[:.]/g, '-')}.tar.gz`));
    const manifest = await withDatabase(config, (url) => backup({ databaseUrl: url, storageDir: config.storageDir, out }));
    const rows = Object.values(manifest.tables).reduce((a, b) => a + b, 0);
    console.log(`Backup written to ${out}: ${Object.keys(manifest.tables).length} tables, ${rows} rows, ${manifest.files.length} files.`);
    return;
  }
  if (command === 'restore' && file) {
    const report = await withDatabase(config, (url) => restore({ databaseUrl: url, storageDir: config.storageDir, file: path.resolve(file) }));
    if (report.tableMismatches.length || report.fileMismatches.length) {
      console.error('Restored, but it does not match the backup:', JSON.stringify({ tables: report.tableMismatches, files: report.fileMismatches }, null, 2));
      process.exit(1);
    }
    console.log(`Restored ${Object.keys(report.manifest.tables).length} tables and ${report.manifest.files.length} files from the backup of ${report.manifest.createdAt}; every row count and file checksum matches.`);
    return;
  }
  console.error('Use: npm run backup [-- FILE]   or   npm run restore -- FILE');
  process.exit(2);
}

main().catch((err: unknown) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
