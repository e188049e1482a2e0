/**
 * `npm run bench [-- --scale]`: measures the API with autocannon beside a bare Express 5 + pg
 * primary-key lookup on the same database in the same run, EXPLAINs the reads each hot route
 * makes, weighs the client's initial JavaScript, and writes it all to bench/results.json.
 * Without --scale it loads a quick data set into a throwaway cluster; with --scale it reads the
 * studio `npm run seed:scale` made. Nothing here asserts a time; tests stay deterministic.
 */
import { createHmac, randomBytes } from 'node:crypto';
import { mkdir, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import express from 'express';
import { sql } from 'kysely';
import pg from 'pg';
import { createApp } from '../api/app.ts';
import { createOidcClient } from '../api/auth/oidc-client.ts';
import { parseConfig } from '../api/config.ts';
import { installKeyring, keyringOf } from '../api/crypto/medical.ts';
import { createDb } from '../api/db/index.ts';
import { migrateToLatest } from '../api/db/migrate.ts';
import { localFileStore } from '../api/files/drivers.ts';
import { SESSION_COOKIE } from '../api/http/session.ts';
import { allRoutes } from '../api/routes.ts';
import { CASTS, loadQuickData, PERFORMERS, USERS } from './bench-load.ts';
import { cpuSampler, explainStatements, formatTable, initialJsGzipBytes, LARGE_TABLE_ROWS, listen, measure, type PlanReport, postmasterPidOf, type Row, statementRecorder, type Target } from './bench-lib.ts';
import { createThrowawayCluster, ensureDatabase } from './pg.ts';
import { openScaleDatabase, SCALE_MEDICAL_KEY } from './scale-db.ts';

const SCALE = process.argv.includes('--scale');
const SECONDS = Number(process.env.BENCH_SECONDS ?? 6);
/** Hot routes run at each of these; the rest at the first only. */
const CONNECTIONS = (process.env.BENCH_CONNECTIONS ?? '10,50').split(',').map(Number);
/** A comma-separated list of words; only routes whose label contains one are measured (the baseline always is). */
const ONLY = (process.env.BENCH_ONLY ?? '').split(',').map((w) => w.trim().toLowerCase()).filter(Boolean);
const BUILD = process.env.BENCH_BUILD !== 'off';
const root = path.resolve(import.meta.dirname, '..');
const mounted = (method: string, p: string) => allRoutes.some((r) => r.method === method && r.path === p);
const wanted = (label: string) => !ONLY.length || ONLY.some((w) => label.toLowerCase().includes(w));

let clientSize: Awaited<ReturnType<typeof initialJsGzipBytes>> | null = null;
if (BUILD) {
  const { build } = await import('vite');
  await build({ root, logLevel: 'warn', configFile: path.join(root, 'vite.config.ts') });
  clientSize = await initialJsGzipBytes(path.join(root, 'dist'));
  console.log(`Initial JavaScript of the built client: ${(clientSize.gzipBytes / 1024).toFixed(1)} kB gzipped (${clientSize.files.length} files)`);
}

const secret = 'bench-session-secret-0123456789abcdef-xyz';
const baseConfig = parseConfig({ NODE_ENV: 'test', PORT: '0', SESSION_SECRET: secret });
let databaseUrl: string;
let storage: string;
let cleanup: () => Promise<void>;
if (SCALE) {
  const scale = await openScaleDatabase(baseConfig);
  databaseUrl = scale.url;
  storage = scale.storageDir;
  cleanup = scale.close;
  installKeyring(keyringOf(SCALE_MEDICAL_KEY));
  const c = new pg.Client({ connectionString: databaseUrl });
  const ready = await c.connect().then(
    async () => Number((await c.query<{ n: string }>('select count(*) as n from performers')).rows[0]!.n) > 1000,
    () => false,
  );
  await c.end().catch(() => {});
  // A release with newer migrations than the seed: bring the schema up to date (no rows are added).
  if (ready) {
    const migrator = createDb(databaseUrl, { log: () => {} });
    await migrateToLatest(migrator.db);
    await migrator.close();
  }
  if (!ready) {
    await cleanup();
    console.error('The scale database is empty or missing: run `npm run seed:scale` first.');
    process.exit(1);
  }
} else {
  const { cluster, dispose } = await createThrowawayCluster();
  await ensureDatabase(cluster, 'bench');
  databaseUrl = cluster.url('bench');
  cleanup = dispose;
  const loader = createDb(databaseUrl, { log: () => {} });
  await migrateToLatest(loader.db);
  storage = await loadQuickData(loader);
  await loader.pool.query('vacuum analyze');
  await loader.close();
}

const handle = createDb(databaseUrl, { log: () => {} });
try {
  await handle.pool.query('checkpoint');
  const counts = Object.fromEntries(
    (await handle.pool.query<{ t: string; n: string }>(
      `select relname as t, n_live_tup::text as n from pg_stat_user_tables where relname in ('performers','engagements','products','product_lots','casts','cast_movements','audit_log','patch_tests','patch_test_readings','users') order by relname`,
    )).rows.map((r) => [r.t, Number(r.n)]),
  );
  const config = parseConfig({ NODE_ENV: 'test', PORT: '0', SESSION_SECRET: secret, DATABASE_URL: databaseUrl, STORAGE_DIR: storage });
  const app = createApp({
    ctx: { config, db: handle.db, files: localFileStore(storage), mailer: { send: async () => ({ messageId: 'bench' }), close() {} }, oidc: createOidcClient(config.oidc), log: () => {} },
    pool: handle.pool,
    serveClient: BUILD,
  });
  const plinth = await listen(app);

  // The floor to compare with: Express 5 and one pg primary-key read, nothing else.
  const barePool = new pg.Pool({ connectionString: databaseUrl, max: 10 });
  const bareApp = express();
  bareApp.get('/performers/:id', async (req, res, next) => {
    try {
      const { rows } = await barePool.query('select id, legal_name, preferred_name, version from performers where id = $1', [req.params.id]);
      if (!rows[0]) res.status(404).end();
      else res.json(rows[0]);
    } catch (err) {
      next(err);
    }
  });
  const bare = await listen(bareApp);

  async function cookieFor(email: string): Promise<string> {
    const user = await handle.db.selectFrom('users').select('id').where('email', '=', email).executeTakeFirstOrThrow();
    const sid = randomBytes(24).toString('base64url');
    const expires = new Date(Date.now() + config.sessionTtlMs);
    const cookie = { originalMaxAge: config.sessionTtlMs, expires: expires.toISOString(), httpOnly: true, path: '/', sameSite: 'lax' };
    await handle.db.insertInto('sessions').values({ sid, sess: JSON.stringify({ cookie, userId: user.id, signedInAt: Date.now() }), expire: expires }).execute();
    return `${SESSION_COOKIE}=${encodeURIComponent(`s:${sid}.${createHmac('sha256', secret).update(sid).digest('base64').replace(/=+$/, '')}`)}`;
  }
  const [admin, head, lead, artist, archivist] = await Promise.all(['admin', 'head', 'lead', 'artist', 'archivist'].map((w) => cookieFor(`${w}@plinth.test`)));
  const juno = await handle.db.selectFrom('performers').select('id').where('legal_name', '=', 'Juno Castellane').executeTakeFirstOrThrow();
  const lantern = await handle.db.selectFrom('productions').select('id').where('name', '=', 'The Lantern Keeper').executeTakeFirstOrThrow();
  const someLabel = (await handle.db.selectFrom('casts').select('label_code').orderBy('label_code').offset(4242).limit(1).executeTakeFirst())?.label_code ?? 'C-000000';
  // The 30-product kit seed:scale gave Juno Castellane's tests (any 30 products on the quick data set).
  const kit = (await handle.db.selectFrom('products').select('id').orderBy(sql`name not like 'Studio %'`).orderBy('name').limit(30).execute()).map((r) => r.id);
  // The check is run from a saved kit, as the tablet runs it: one kit of those 30 products, made once.
  const kitName = 'Bench kit: 30 products';
  const kitId =
    (await handle.db.selectFrom('kits').select('id').where('production_id', '=', lantern.id).where('name', '=', kitName).executeTakeFirst())?.id ??
    (await handle.db.transaction().execute(async (trx) => {
      const made = await trx.insertInto('kits').values({ production_id: lantern.id, name: kitName }).returning('id').executeTakeFirstOrThrow();
      await trx.insertInto('kit_products').values(kit.map((product_id, position) => ({ kit_id: made.id, position, product_id }))).execute();
      return made.id;
    }));
  const p = plinth.base;

  // The routes a studio leans on all day; measured at every connection count, their reads EXPLAINed.
  const hot: Target[] = [
    { label: 'performer search ?q=castelane (head)', url: `${p}/api/performers?q=castelane`, cookie: head },
    { label: 'performer search ?q=thistlethorpe (head)', url: `${p}/api/performers?q=thistlethorpe`, cookie: head },
    { label: 'cast search fuzzy "castelane" (archivist)', url: `${p}/api/casts?q=castelane`, cookie: archivist },
    { label: 'cast search label code (archivist)', url: `${p}/api/casts?q=${someLabel}`, cookie: archivist },
    { label: "lead's home GET /api/home (lead)", url: `${p}/api/home`, cookie: lead },
    { label: 'performer page GET /api/performers/:id (head)', url: `${p}/api/performers/${juno.id}`, cookie: head },
    { label: 'performer page GET /api/performers/:id (lead)', url: `${p}/api/performers/${juno.id}`, cookie: lead },
  ];
  // Measured once they are mounted: the clearance table and the artist's check.
  if (mounted('get', '/api/performers/:id/patch-tests')) {
    const url = `${p}/api/performers/${juno.id}/patch-tests`;
    hot.push({ label: 'clearance table, 200 tests (head)', url, cookie: head }, { label: 'clearance table, 200 tests (lead)', url, cookie: lead });
  }
  if (mounted('post', '/api/checks')) {
    hot.push({ label: "artist's check, 30-product kit, 200 tests (artist)", url: `${p}/api/checks`, cookie: artist, method: 'POST', origin: config.appOrigin, body: { productionId: lantern.id, performerId: juno.id, kitId } });
  }
  const others: Target[] = [
    { label: 'GET /api/health', url: `${p}/api/health`, cookie: head },
    { label: 'GET /api/session', url: `${p}/api/session`, cookie: head },
    { label: 'GET /api/performers page 1', url: `${p}/api/performers?pageSize=25`, cookie: head },
    { label: 'GET /api/performers consent=incomplete', url: `${p}/api/performers?consent=incomplete&pageSize=25`, cookie: head },
    { label: 'GET /api/home (admin)', url: `${p}/api/home`, cookie: admin },
    { label: 'GET /api/users page 1 (admin)', url: `${p}/api/users?pageSize=25`, cookie: admin },
    { label: 'GET /api/consent-templates (lead)', url: `${p}/api/consent-templates`, cookie: lead },
    { label: 'GET /api/casts page 1 (archivist)', url: `${p}/api/casts?pageSize=25`, cookie: archivist },
    { label: 'GET /api/casts code path GH/NORTH/R1 (archivist)', url: `${p}/api/casts?q=GH%2FNORTH%2FR1&pageSize=25`, cookie: archivist },
    { label: 'GET /api/casts region=face&kind=mold, page 40 (archivist)', url: `${p}/api/casts?region=face&kind=mold&page=40`, cookie: archivist },
  ];

  // One request of each hot route with its statements recorded, then their plans.
  const recorder = statementRecorder();
  const plans: PlanReport[] = [];
  for (const t of hot.filter((h) => wanted(h.label))) {
    recorder.start();
    const res = await fetch(t.url, { method: t.method ?? 'GET', headers: { cookie: t.cookie ?? '', ...(t.body ? { 'content-type': 'application/json', origin: t.origin ?? '' } : {}) }, body: t.body ? JSON.stringify(t.body) : undefined });
    await res.arrayBuffer();
    const statements = recorder.stop();
    if (!res.ok) console.log(`  ${t.label}: answered ${res.status}`);
    plans.push(...(await explainStatements(databaseUrl, t.label, statements)));
  }

  const mode = SCALE ? 'the seed:scale studio' : `the quick data set (${PERFORMERS} performers, ${USERS} users, ${CASTS} casts)`;
  console.log(`\nautocannon on ${mode}, ${SECONDS} s per route after a 1 s warm-up, ${os.cpus().length} CPUs:\n`);
  const bareUrl = `${bare.base}/performers/${juno.id}`;
  // CPU a request costs, the API's and PostgreSQL's, where /proc shows them (see Row.cpu).
  const cpu = cpuSampler(await postmasterPidOf(databaseUrl).catch(() => null));
  const rows: Row[] = [];
  const baselines = new Map<number, number[]>();
  for (const [i, conns] of CONNECTIONS.entries()) {
    const first = await measure({ label: 'baseline: bare Express 5 + pg primary key (first)', url: bareUrl }, conns, SECONDS, cpu);
    rows.push(first);
    for (const t of [...hot, ...(i === 0 ? others : [])].filter((x) => wanted(x.label))) rows.push(await measure(t, conns, SECONDS, cpu));
    // Measured again last: the ratio is to the mean of both, so a machine that slows part-way shows as two baselines.
    const last = await measure({ label: 'baseline: bare Express 5 + pg primary key (last)', url: bareUrl }, conns, SECONDS, cpu);
    rows.push(last);
    baselines.set(conns, [first.rps, last.rps]);
  }
  const baselineRps = (c: number) => (baselines.get(c)!.reduce((a, b) => a + b, 0) / 2);
  console.log(formatTable(rows, baselineRps));

  console.log(`\nEXPLAIN (ANALYZE) of ${plans.length} reads made by the hot routes:`);
  for (const pl of plans) {
    const scans = pl.seqScans.map((s) => `${s.table} (${s.rows.toLocaleString('en')} rows)`).join(', ');
    console.log(`  ${pl.flagged ? 'SEQ SCAN ON A LARGE TABLE' : 'ok'.padEnd(25)} ${pl.executionMs.toFixed(2).padStart(8)} ms  ${pl.route}: ${pl.sql.slice(0, 110)}${scans ? `  [seq: ${scans}]` : ''}`);
  }
  const flagged = plans.filter((pl) => pl.flagged);
  console.log(flagged.length ? `\n${flagged.length} read(s) scan a table of ${LARGE_TABLE_ROWS.toLocaleString('en')} rows or more in sequence.` : `\nNo hot read scans a table of ${LARGE_TABLE_ROWS.toLocaleString('en')} rows or more in sequence.`);

  const results = {
    at: new Date().toISOString(),
    data: SCALE ? 'scale' : 'quick',
    machine: { cpus: os.cpus().length, cpu: os.cpus()[0]?.model ?? null, node: process.version },
    seconds: SECONDS,
    rows: counts,
    baseline: Object.fromEntries([...baselines].map(([c, v]) => [c, { first: v[0], last: v[1], mean: baselineRps(c) }])),
    routes: rows.map((r) => ({ ...r, hot: hot.some((h) => h.label === r.label), ratio: r.rps / baselineRps(r.connections) })),
    client: clientSize ? { initialJsGzipBytes: clientSize.gzipBytes, files: clientSize.files, limitBytes: 200 * 1024 } : null,
    explain: { largeTableRows: LARGE_TABLE_ROWS, flagged: flagged.length, plans },
  };
  await mkdir(path.join(root, 'bench'), { recursive: true });
  await writeFile(path.join(root, 'bench', 'results.json'), JSON.stringify(results, null, 2) + '\n');
  console.log('Written to bench/results.json');

  for (const s of [plinth.server, bare.server]) {
    s.closeAllConnections();
    s.close();
  }
  await barePool.end();
} finally {
  await handle.close();
  await cleanup();
}
