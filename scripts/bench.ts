/**
 * `npm run bench`: measures the API with autocannon on a throwaway database with a studio-sized
 * data set, beside a bare Express + pg primary-key lookup on the same database, and prints figures.
 * Nothing here asserts a time; tests stay deterministic.
 */
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import { createHmac, randomBytes } from 'node:crypto';
import { mkdtemp } from 'node:fs/promises';
import { rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import autocannon from 'autocannon';
import express from 'express';
import pg from 'pg';
import { createApp } from '../api/app.ts';
import { createOidcClient } from '../api/auth/oidc-client.ts';
import { parseConfig } from '../api/config.ts';
import { createDb } from '../api/db/index.ts';
import { migrateToLatest } from '../api/db/migrate.ts';
import { seedDemo } from '../api/db/seed.ts';
import { installKeyring, keyringOf } from '../api/crypto/medical.ts';
import { SESSION_COOKIE } from '../api/http/session.ts';
import { BODY_REGIONS, CAST_KINDS } from '../shared/domain/archive-casts.ts';
import { LABEL_CODE_SPACE, labelCodeFromNumber } from '../shared/domain/label-codes.ts';
import { loadCheckData } from './bench-check.ts';
import { createThrowawayCluster, ensureDatabase } from './pg.ts';

const USERS = Number(process.env.BENCH_USERS ?? 5000);
const PERFORMERS = Number(process.env.BENCH_PERFORMERS ?? 3000);
const SECONDS = Number(process.env.BENCH_SECONDS ?? 6);
const CONNECTIONS = Number(process.env.BENCH_CONNECTIONS ?? 10);
/** A comma-separated list of words; only routes whose label contains one are measured (the baseline always is). */
const ONLY = (process.env.BENCH_ONLY ?? '').split(',').map((w) => w.trim().toLowerCase()).filter(Boolean);
const CASTS = Number(process.env.BENCH_CASTS ?? 100_000);

interface Row {
  label: string;
  rps: number;
  p50: number;
  p975: number;
  p99: number;
  failed: number;
}

/** autocannon in a worker thread, so the load generator does not share the server's event loop. */
async function measure(label: string, url: string, cookie?: string, post?: unknown): Promise<Row | null> {
  if (ONLY.length && !label.includes('baseline') && !ONLY.some((w) => label.toLowerCase().includes(w))) return null;
  const headers: Record<string, string> = cookie ? { cookie } : {};
  const write = post === undefined ? {} : { method: 'POST' as const, body: JSON.stringify(post) };
  if (post !== undefined) headers['content-type'] = 'application/json';
  await autocannon({ url, connections: CONNECTIONS, duration: 1, headers, workers: 1, ...write });
  const r = await autocannon({ url, connections: CONNECTIONS, duration: SECONDS, headers, workers: 1, ...write });
  return { label, rps: r.requests.average, p50: r.latency.p50, p975: r.latency.p97_5, p99: r.latency.p99, failed: r.non2xx + r.errors + r.timeouts };
}

function listen(app: express.Express): Promise<{ server: Server; base: string }> {
  return new Promise((resolve) => {
    const server = app.listen(0, '127.0.0.1', () => resolve({ server, base: `http://127.0.0.1:${(server.address() as AddressInfo).port}` }));
  });
}

function printTable(rows: Row[], baselineRps: number): void {
  const head = ['route', 'req/s', 'p50 ms', 'p97.5 ms', 'p99 ms', '× baseline'];
  const body = rows.map((r) => [
    r.label + (r.failed ? `  (${r.failed} failed)` : ''),
    r.rps.toFixed(0),
    r.p50.toFixed(1),
    r.p975.toFixed(1),
    r.p99.toFixed(1),
    (r.rps / baselineRps).toFixed(2),
  ]);
  const widths = head.map((h, i) => Math.max(h.length, ...body.map((b) => b[i]!.length)));
  const line = (cells: string[]) => `| ${cells.map((c, i) => (i === 0 ? c.padEnd(widths[i]!) : c.padStart(widths[i]!))).join(' | ')} |`;
  console.log(line(head));
  console.log(`|${widths.map((w, i) => (i === 0 ? '-'.repeat(w + 2) : `${'-'.repeat(w + 1)}:`)).join('|')}|`);
  for (const b of body) console.log(line(b));
}

const { cluster, dispose } = await createThrowawayCluster();
try {
  await ensureDatabase(cluster, 'bench');
  const handle = createDb(cluster.url('bench'), { log: () => {} });
  await migrateToLatest(handle.db);
  const storage = await mkdtemp(`${tmpdir()}/plinth-bench-`);
  process.on('exit', () => rmSync(storage, { recursive: true, force: true }));
  const s0 = performance.now();
  installKeyring(keyringOf(randomBytes(32).toString('base64')));
  await seedDemo(handle.db, { storageDir: storage });
  console.log(`Demo scenario (11 signed consents with PDFs) seeded in ${((performance.now() - s0) / 1000).toFixed(2)} s`);
  const t0 = performance.now();
  for (let i = 0; i < USERS; i += 1000) {
    const rows = Array.from({ length: Math.min(1000, USERS - i) }, (_, k) => ({ email: `bench${i + k}@example.test`, display_name: `Bench Person ${i + k}` }));
    await handle.db.insertInto('users').values(rows).execute();
  }
  console.log(`Loaded ${USERS} extra users in ${((performance.now() - t0) / 1000).toFixed(2)} s`);
  const lantern = await handle.db.selectFrom('productions').select('id').where('name', '=', 'The Lantern Keeper').executeTakeFirstOrThrow();
  const t1 = performance.now();
  for (let i = 0; i < PERFORMERS; i += 500) {
    const rows = await handle.db
      .insertInto('performers')
      .values(Array.from({ length: Math.min(500, PERFORMERS - i) }, (_, k) => ({ legal_name: `Bench Performer ${i + k} ${['Arden', 'Blythe', 'Corwen', 'Dalby'][(i + k) % 4]}` })))
      .returning('id')
      .execute();
    await handle.db.insertInto('engagements').values(rows.map((r) => ({ performer_id: r.id, production_id: lantern.id }))).execute();
  }
  console.log(`Loaded ${PERFORMERS} extra performers on The Lantern Keeper in ${((performance.now() - t1) / 1000).toFixed(2)} s`);
  // Settle the freshly loaded database first, so autovacuum and a checkpoint do not land inside the first measurement.
  await handle.pool.query('vacuum analyze');
  await handle.pool.query('checkpoint');

  // The archive: CASTS casts of the bench performers, spread over the demo store's shelves and bins.
  const t2 = performance.now();
  const performerIds = (await handle.db.selectFrom('performers').select('id').execute()).map((r) => r.id);
  const shelves = (await handle.db.selectFrom('archive_locations').select('id').where('level', 'in', ['shelf', 'bin']).execute()).map((r) => r.id);
  const taken = new Set((await handle.db.selectFrom('casts').select('label_code').execute()).map((r) => r.label_code));
  const BATCH = 2500;
  for (let i = 0; i < CASTS; i += BATCH) {
    const rows = Array.from({ length: Math.min(BATCH, CASTS - i) }, (_, k) => {
      const n = i + k;
      let labelNumber = (n * 7_919 + 104_729) % LABEL_CODE_SPACE;
      while (taken.has(labelCodeFromNumber('cast', labelNumber))) labelNumber = (labelNumber + 1) % LABEL_CODE_SPACE;
      const label = labelCodeFromNumber('cast', labelNumber);
      taken.add(label);
      const shelf = shelves[n % shelves.length]!;
      return {
        label_code: label,
        performer_id: performerIds[n % performerIds.length]!,
        production_id: lantern.id,
        region: BODY_REGIONS[n % BODY_REGIONS.length]!,
        kind: CAST_KINDS[(n >> 2) % CAST_KINDS.length]!,
        material: 'Gypsum stone',
        made_on: `20${String(10 + (n % 16)).padStart(2, '0')}-0${1 + (n % 9)}-1${n % 10}`,
        made_by: 'Bench Maker',
        normal_location_id: shelf,
        current_location_id: shelf,
        since: new Date(),
      };
    });
    await handle.db.insertInto('casts').values(rows).execute();
  }
  await handle.pool.query('analyze casts; analyze performers; analyze engagements; analyze productions');
  console.log(`Loaded ${CASTS} casts in ${((performance.now() - t2) / 1000).toFixed(2)} s`);
  const someLabel = labelCodeFromNumber('cast', (4_242 * 7_919 + 104_729) % LABEL_CODE_SPACE);

  const secret = 'bench-session-secret-0123456789abcdef-xyz';
  const config = parseConfig({ NODE_ENV: 'test', PORT: '0', SESSION_SECRET: secret, DATABASE_URL: cluster.url('bench'), STORAGE_DIR: storage });
  const app = createApp({
    ctx: { config, db: handle.db, mailer: { send: async () => ({ messageId: 'bench' }), close() {} }, oidc: createOidcClient(config.oidc), log: () => {} },
    pool: handle.pool,
  });
  const plinth = await listen(app);

  // The floor to compare with: Express 5 and one pg primary-key read, nothing else.
  const barePool = new pg.Pool({ connectionString: cluster.url('bench'), max: 10 });
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
  const admin = await cookieFor('admin@plinth.test');
  const head = await cookieFor('head@plinth.test');
  const lead = await cookieFor('lead@plinth.test');
  const juno = await handle.db.selectFrom('performers').select('id').where('legal_name', '=', 'Juno Castellane').executeTakeFirstOrThrow();

  console.log(`\nautocannon, ${CONNECTIONS} connections, ${SECONDS} s per route after a 1 s warm-up; a department head's session unless named:\n`);
  const bareUrl = `${bare.base}/performers/${juno.id}`;
  const before = (await measure('bare Express 5 + pg, GET /performers/:id (baseline, first)', bareUrl))!;
  const rows: (Row | null)[] = [before];
  const p = plinth.base;
  rows.push(await measure('GET /api/health', `${p}/api/health`, head));
  rows.push(await measure('GET /api/session', `${p}/api/session`, head));
  rows.push(await measure('GET /api/performers/:id', `${p}/api/performers/${juno.id}`, head));
  rows.push(await measure(`GET /api/performers page 1 of ${PERFORMERS + 6}`, `${p}/api/performers?pageSize=25`, head));
  rows.push(await measure('GET /api/performers?q=castelane', `${p}/api/performers?q=castelane`, head));
  rows.push(await measure('GET /api/performers consent=incomplete', `${p}/api/performers?consent=incomplete&pageSize=25`, head));
  rows.push(await measure('GET /api/home (admin)', `${p}/api/home`, admin));
  rows.push(await measure(`GET /api/users page 1 of ${USERS + 8} (admin)`, `${p}/api/users?pageSize=25`, admin));
  rows.push(await measure('GET /api/users?q=person 42 (admin)', `${p}/api/users?q=person%2042&pageSize=25`, admin));
  rows.push(await measure('GET /api/consent-templates (lead)', `${p}/api/consent-templates`, lead));
  const archivist = await cookieFor('archivist@plinth.test');
  const casts = `${CASTS + 20} casts`;
  rows.push(await measure(`GET /api/casts page 1 of ${casts} (archivist)`, `${p}/api/casts?pageSize=25`, archivist));
  rows.push(await measure('GET /api/casts fuzzy "castelane" (archivist)', `${p}/api/casts?q=castelane`, archivist));
  rows.push(await measure('GET /api/casts "arden face mold" (3 terms, archivist)', `${p}/api/casts?q=arden%20face%20mold`, archivist));
  rows.push(await measure('GET /api/casts label code (archivist)', `${p}/api/casts?q=${someLabel}`, archivist));
  rows.push(await measure('GET /api/casts code path GH/NORTH/R1 (archivist)', `${p}/api/casts?q=GH%2FNORTH%2FR1&pageSize=25`, archivist));
  rows.push(await measure('GET /api/casts region=face&kind=mold, page 40 (archivist)', `${p}/api/casts?region=face&kind=mold&page=40`, archivist));
  // The artist's check: 200 past tests of one performer, a 30-product kit, one POST per check.
  const check = await loadCheckData(handle.db, { tests: 200, kitSize: 30 });
  await handle.pool.query('analyze');
  const artist = await cookieFor('artist@plinth.test');
  rows.push(await measure('POST /api/checks, 200 past tests, 30-product kit (artist)', `${p}/api/checks`, artist, { productionId: check.productionId, performerId: check.performerId, kitId: check.kitId }));
  // Measured again last: the ratio is to the mean of both, so a machine that slows down part-way shows up as two different baselines.
  const after = (await measure('bare Express 5 + pg, GET /performers/:id (baseline, last)', bareUrl))!;
  rows.push(after);
  printTable(rows.filter((r): r is Row => r !== null), (before.rps + after.rps) / 2);

  for (const s of [plinth.server, bare.server]) {
    s.closeAllConnections();
    s.close();
  }
  await barePool.end();
  await handle.close();
} finally {
  await dispose();
}
