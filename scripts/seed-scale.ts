/**
 * `npm run seed:scale`: a large studio in a database of its own (see scripts/scale-db.ts), for
 * `npm run bench -- --scale`: the demo scenario, then SCALE_PERFORMERS performers (20,000),
 * SCALE_PRODUCTS products with formulations and lots (5,000), SCALE_CASTS casts with their
 * movements (100,000), SCALE_READINGS patch-test readings (200,000) and SCALE_AUDIT audit
 * entries (1,000,000). The database is emptied first.
 */
import { rm } from 'node:fs/promises';
import pg from 'pg';
import { ConfigError, parseConfig } from '../api/config.ts';
import { installKeyring, keyringOf } from '../api/crypto/medical.ts';
import { createDb } from '../api/db/index.ts';
import { migrateToLatest } from '../api/db/migrate.ts';
import { seedDemo } from '../api/db/seed.ts';
import { localFileStore } from '../api/files/drivers.ts';
import { ensureDefaultProtocols } from '../api/features/protocols/index.ts';
import { openScaleDatabase, SCALE_DATABASE, SCALE_MEDICAL_KEY } from './scale-db.ts';
import { loadPatchTests } from './seed-scale-tests.ts';
import { loadAudit, loadCasts, loadCatalogue, loadPerformers, loadStaffAndProductions, type ScaleSizes } from './seed-scale-lib.ts';

const size = (name: string, fallback: number) => {
  const n = Number(process.env[name] ?? fallback);
  if (!Number.isInteger(n) || n < 0) throw new Error(`${name} must be a whole number.`);
  return n;
};
const N: ScaleSizes = {
  performers: size('SCALE_PERFORMERS', 20_000),
  products: size('SCALE_PRODUCTS', 5_000),
  casts: size('SCALE_CASTS', 100_000),
  audit: size('SCALE_AUDIT', 1_000_000),
  readings: size('SCALE_READINGS', 200_000),
  productions: size('SCALE_PRODUCTIONS', 60),
  staff: size('SCALE_STAFF', 400),
};

let config;
try {
  config = parseConfig(process.env);
} catch (err) {
  console.error(err instanceof ConfigError ? err.message : err);
  process.exit(1);
}

const started = performance.now();
const timings: { step: string; seconds: number }[] = [];
async function step<T>(label: string, work: () => Promise<T>): Promise<T> {
  const t0 = performance.now();
  const out = await work();
  const seconds = (performance.now() - t0) / 1000;
  timings.push({ step: label, seconds });
  console.log(`${label.padEnd(58)} ${seconds.toFixed(1).padStart(7)} s`);
  return out;
}

const scale = await openScaleDatabase(config);
try {
  if (scale.cluster) {
    const admin = new pg.Client({ connectionString: scale.cluster.url('postgres') });
    await admin.connect();
    await admin.query(`drop database if exists ${SCALE_DATABASE} with (force)`);
    await admin.query(`create database ${SCALE_DATABASE}`);
    await admin.end();
  }
  await rm(scale.storageDir, { recursive: true, force: true });
  const handle = createDb(scale.url, { max: 2, log: () => {} });
  const client = new pg.Client({ connectionString: scale.url });
  await client.connect();
  try {
    const existing = await client.query<{ n: string }>(`select count(*) as n from information_schema.tables where table_schema = 'public'`);
    if (!scale.cluster && Number(existing.rows[0]!.n) > 0) throw new Error('SCALE_DATABASE_URL names a database that already has tables; give seed:scale an empty one.');
    await step('migrations', () => migrateToLatest(handle.db));
    // The scale database seals health details with a key of its own, never the studio's.
    installKeyring(keyringOf(SCALE_MEDICAL_KEY));
    await step('demo scenario (The Lantern Keeper) and default protocols', async () => {
      await seedDemo(handle.db, { files: localFileStore(scale.storageDir) });
      await ensureDefaultProtocols(handle.db);
    });
    // Bulk loads do not wait for the disk at each commit; nothing here must survive a crash.
    await client.query('set synchronous_commit = off');
    await client.query(`set maintenance_work_mem = '256MB'`);
    await step(`${N.staff} staff on ${N.productions} more productions, with leads`, () => loadStaffAndProductions(client, N));
    await step(`${N.performers.toLocaleString('en')} performers and their engagements`, () => loadPerformers(client, N.performers - 6));
    await step(`${N.products.toLocaleString('en')} products, formulations, ingredients and lots`, () => loadCatalogue(client, N.products));
    await step(`${N.casts.toLocaleString('en')} casts and their movements`, () => loadCasts(client, N.casts, () => {}));
    const junoTests = size('SCALE_JUNO_TESTS', 200);
    await step(`${N.readings.toLocaleString('en')} patch-test readings (Juno Castellane: ${junoTests} tests of a 30-product kit)`, () =>
      loadPatchTests(client, { readings: N.readings, junoTests, kitSize: 30 }),
    );
    await step(`${N.audit.toLocaleString('en')} audit entries`, () => loadAudit(client, N.audit, () => {}));
    await step('vacuum analyze', () => client.query('vacuum analyze'));
    const counts = await client.query<{ t: string; n: string }>(
      `select t, n from (values ('performers', (select count(*) from performers)), ('engagements', (select count(*) from engagements)),
         ('products', (select count(*) from products)), ('product_formulations', (select count(*) from product_formulations)),
         ('product_lots', (select count(*) from product_lots)), ('casts', (select count(*) from casts)),
         ('cast_movements', (select count(*) from cast_movements)), ('patch_tests', (select count(*) from patch_tests)),
         ('patch_test_readings', (select count(*) from patch_test_readings)), ('audit_log', (select count(*) from audit_log))) v(t, n)`,
    );
    console.log(`\nIn ${SCALE_DATABASE}: ${counts.rows.map((r) => `${r.t} ${Number(r.n).toLocaleString('en')}`).join(', ')}`);
    console.log(`Done in ${((performance.now() - started) / 1000).toFixed(1)} s. Measure it with: npm run bench -- --scale`);
  } finally {
    await client.end();
    await handle.close();
  }
} finally {
  await scale.close();
}
