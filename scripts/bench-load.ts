// The quick data set `npm run bench` loads into a throwaway cluster when it is not run with --scale:
// the demo scenario, BENCH_USERS users, BENCH_PERFORMERS performers and BENCH_CASTS casts.
import { mkdtemp } from 'node:fs/promises';
import { rmSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import { tmpdir } from 'node:os';
import { installKeyring, keyringOf } from '../api/crypto/medical.ts';
import type { DbHandle } from '../api/db/index.ts';
import { seedDemo } from '../api/db/seed.ts';
import { localFileStore } from '../api/files/drivers.ts';
import { BODY_REGIONS, CAST_KINDS } from '../shared/domain/archive-casts.ts';
import { LABEL_CODE_SPACE, labelCodeFromNumber } from '../shared/domain/label-codes.ts';

export const USERS = Number(process.env.BENCH_USERS ?? 5000);
export const PERFORMERS = Number(process.env.BENCH_PERFORMERS ?? 3000);
export const CASTS = Number(process.env.BENCH_CASTS ?? 100_000);

/** Loads the quick data set; returns the folder holding its stored files. */
export async function loadQuickData(handle: DbHandle): Promise<string> {
  const storage = await mkdtemp(`${tmpdir()}/plinth-bench-`);
  process.on('exit', () => rmSync(storage, { recursive: true, force: true }));
  const s0 = performance.now();
  installKeyring(keyringOf(randomBytes(32).toString('base64')));
  await seedDemo(handle.db, { files: localFileStore(storage) });
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
  return storage;
}
