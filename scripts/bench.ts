/**
 * `npm run bench`: measures the API on a throwaway database with a studio-sized data set and
 * prints figures. Nothing here asserts a time; tests stay deterministic.
 */
import type { AddressInfo } from 'node:net';
import { createHmac, randomBytes } from 'node:crypto';
import { createApp } from '../api/app.ts';
import { createOidcClient } from '../api/auth/oidc-client.ts';
import { parseConfig } from '../api/config.ts';
import { createDb } from '../api/db/index.ts';
import { migrateToLatest } from '../api/db/migrate.ts';
import { seedDemo } from '../api/db/seed.ts';
import { SESSION_COOKIE } from '../api/http/session.ts';
import { BODY_REGIONS, CAST_KINDS } from '../shared/domain/archive-casts.ts';
import { LABEL_CODE_SPACE, labelCodeFromNumber } from '../shared/domain/label-codes.ts';
import { createThrowawayCluster, ensureDatabase } from './pg.ts';

const USERS = Number(process.env.BENCH_USERS ?? 5000);
const REQUESTS = Number(process.env.BENCH_REQUESTS ?? 400);
const CONCURRENCY = Number(process.env.BENCH_CONCURRENCY ?? 8);
const PERFORMERS = Number(process.env.BENCH_PERFORMERS ?? 3000);
const CASTS = Number(process.env.BENCH_CASTS ?? 100_000);

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))]!;
}

async function measure(label: string, url: string, cookie: string): Promise<void> {
  const times: number[] = [];
  let next = 0;
  const started = performance.now();
  await Promise.all(
    Array.from({ length: CONCURRENCY }, async () => {
      while (next < REQUESTS) {
        next++;
        const t0 = performance.now();
        const res = await fetch(url, { headers: { cookie } });
        await res.arrayBuffer();
        if (!res.ok) throw new Error(`${label}: HTTP ${res.status}`);
        times.push(performance.now() - t0);
      }
    }),
  );
  const wall = (performance.now() - started) / 1000;
  times.sort((a, b) => a - b);
  console.log(
    `${label.padEnd(44)} n=${times.length}  p50=${percentile(times, 50).toFixed(1)} ms  p95=${percentile(times, 95).toFixed(1)} ms  max=${times.at(-1)!.toFixed(1)} ms  ${(times.length / wall).toFixed(0)} req/s`,
  );
}

const { cluster, dispose } = await createThrowawayCluster();
try {
  await ensureDatabase(cluster, 'bench');
  const handle = createDb(cluster.url('bench'), { log: () => {} });
  await migrateToLatest(handle.db);
  const { mkdtemp } = await import('node:fs/promises');
  const { rmSync } = await import('node:fs');
  const { tmpdir } = await import('node:os');
  const storage = await mkdtemp(`${tmpdir()}/plinth-bench-`);
  const s0 = performance.now();
  await seedDemo(handle.db, { storageDir: storage });
  console.log(`Demo scenario (11 signed consents with PDFs) seeded in ${((performance.now() - s0) / 1000).toFixed(2)} s`);
  process.on('exit', () => rmSync(storage, { recursive: true, force: true }));
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
  const server = app.listen(0, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
  const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;

  async function cookieFor(email: string): Promise<string> {
    const user = await handle.db.selectFrom('users').select('id').where('email', '=', email).executeTakeFirstOrThrow();
    const sid = randomBytes(24).toString('base64url');
    const expires = new Date(Date.now() + 3600_000);
    await handle.db.insertInto('sessions').values({ sid, sess: JSON.stringify({ cookie: { expires: expires.toISOString(), httpOnly: true, path: '/' }, userId: user.id }), expire: expires }).execute();
    return `${SESSION_COOKIE}=${encodeURIComponent(`s:${sid}.${createHmac('sha256', secret).update(sid).digest('base64').replace(/=+$/, '')}`)}`;
  }
  const cookie = await cookieFor('admin@plinth.test');
  const head = await cookieFor('head@plinth.test');
  const lead = await cookieFor('lead@plinth.test');
  const archivist = await cookieFor('archivist@plinth.test');

  console.log(`\n${REQUESTS} requests each, ${CONCURRENCY} at a time, on ${base}:`);
  await measure('GET /api/health', `${base}/api/health`, cookie);
  await measure('GET /api/session', `${base}/api/session`, cookie);
  await measure('GET /api/home (admin)', `${base}/api/home`, cookie);
  await measure(`GET /api/users page 1 of ${USERS + 7}`, `${base}/api/users?pageSize=25`, cookie);
  await measure('GET /api/users search "person 42"', `${base}/api/users?q=person%2042&pageSize=25`, cookie);
  await measure('GET /api/users sorted by e-mail, page 150', `${base}/api/users?sort=email&page=150&pageSize=25`, cookie);
  await measure(`GET /api/performers page 1 of ${PERFORMERS + 6} (head)`, `${base}/api/performers?pageSize=25`, head);
  await measure('GET /api/performers fuzzy "castelane" (head)', `${base}/api/performers?q=castelane`, head);
  await measure('GET /api/performers consent=incomplete (head)', `${base}/api/performers?consent=incomplete&pageSize=25`, head);
  await measure('GET /api/consent-templates (lead)', `${base}/api/consent-templates`, lead);
  const casts = `${CASTS + 20} casts`;
  await measure(`GET /api/casts page 1 of ${casts}`, `${base}/api/casts?pageSize=25`, archivist);
  await measure('GET /api/casts fuzzy "castelane"', `${base}/api/casts?q=castelane`, archivist);
  await measure('GET /api/casts "arden face mold" (3 terms)', `${base}/api/casts?q=arden%20face%20mold`, archivist);
  await measure('GET /api/casts label code', `${base}/api/casts?q=${someLabel}`, archivist);
  await measure('GET /api/casts code path GH/NORTH/R1', `${base}/api/casts?q=GH%2FNORTH%2FR1&pageSize=25`, archivist);
  await measure('GET /api/casts region=face&kind=mold, page 40', `${base}/api/casts?region=face&kind=mold&page=40`, archivist);

  server.closeAllConnections();
  server.close();
  await handle.close();
} finally {
  await dispose();
}
