// Patch tests: booking and moving them (head), applying, reading and closing them (lead), their photos,
// and a performer's clearance with the lead's overrides.
import { type Actor, can } from '#shared/policy.ts';
import { cameraJpeg } from '../../fixtures/images.ts';
import { type Check, type Entries, both, onProduction, policy } from './entry.ts';
import type { World } from './world.ts';

const lantern = onProduction('lantern');
const juno = (w: World) => w.performer(w.id.juno!);
/** One of Juno's tests as its handler sees it: the production it is on, and whose it is. */
const junoTest = (w: World) => ({ productionId: w.id.lantern!, performerId: w.id.juno! });
const hours = (n: number) => new Date(Date.now() + n * 3_600_000).toISOString();

/** A test's version (its key is its booking's). */
async function testVersion(w: World, id: string): Promise<number> {
  const { rows } = await w.t.db.pool.query<{ version: number }>(`select version from patch_tests where booking_id = $1`, [id]);
  if (!rows[0]) throw new Error(`no patch test ${id}`);
  return rows[0].version;
}

/**
 * An override is asked on the first of the performer's productions where the caller may override, or
 * on the first of them when there is none.
 */
const overrideOnJuno: Check = Object.assign(
  (actor: Actor, w: World) => {
    const productions = w.engaged[w.id.juno!] ?? [];
    const productionId = productions.find((p) => can(actor, 'clearance.override', { productionId: p })) ?? productions[0] ?? null;
    return can(actor, 'clearance.override', { performerId: w.id.juno!, productionId });
  },
  { actions: ['clearance.override'] as const },
);

export const patchTestEntries: Entries = {
  'GET /api/patch-tests': { may: policy('patchtests.read', lantern), input: (w) => ({ query: { productionId: w.id.lantern! } }) },
  'POST /api/patch-tests': {
    may: policy('patchtests.book', lantern),
    input: (w) => ({
      body: {
        performerId: w.id.juno,
        productionId: w.id.lantern,
        protocolId: 'department-use',
        startsAt: hours(21 * 24),
        location: 'Make-up room 2',
        products: [{ productId: w.id.ptProduct, lotId: w.id.ptLot, site: 'Left inner forearm 5' }],
      },
    }),
  },
  'GET /api/patch-tests/:id': { may: policy('patchtests.read', junoTest), input: (w) => ({ params: { id: w.id.ptClosed! } }) },
  'POST /api/patch-tests/:id/reschedule': {
    may: policy('patchtests.book', lantern),
    input: async (w) => ({ params: { id: w.id.ptBooked! }, body: { startsAt: hours(15 * 24), location: 'Make-up room 2', version: await testVersion(w, w.id.ptBooked!) } }),
  },
  'POST /api/patch-tests/:id/cancel': {
    may: policy('patchtests.book', lantern),
    input: async (w) => ({ params: { id: w.id.ptBooked! }, body: { version: await testVersion(w, w.id.ptBooked!) } }),
  },
  'POST /api/patch-tests/:id/apply': {
    may: policy('patchtests.record', lantern),
    input: async (w) => ({ params: { id: w.id.ptBooked! }, body: { appliedAt: hours(0), version: await testVersion(w, w.id.ptBooked!) } }),
    note: 'Juno has a patch-testing consent in force',
  },
  'POST /api/patch-tests/:id/removal': {
    may: policy('patchtests.record', lantern),
    input: async (w) => ({ params: { id: w.id.ptCovered! }, body: { removedAt: hours(0), version: await testVersion(w, w.id.ptCovered!) } }),
    note: 'an occluded test whose patches are still on',
  },
  'POST /api/patch-tests/:id/readings': {
    may: policy('patchtests.record', junoTest),
    input: async (w) => ({
      params: { id: w.id.ptApplied! },
      body: { pointId: 'h24', readAt: hours(0), sites: [{ testProductId: w.id.ptAppliedSite, code: '-' }], version: await testVersion(w, w.id.ptApplied!) },
    }),
    note: 'applied 26 hours ago: the 24-hour window (21 to 30 hours) is open',
  },
  'POST /api/patch-tests/:id/readings/:readingId/photos': {
    may: policy('patchtests.record', junoTest),
    input: async (w) => ({ params: { id: w.id.ptClosed!, readingId: w.id.ptReading! }, upload: { field: 'photo', filename: 'site.jpg', bytes: await cameraJpeg() } }),
  },
  'GET /api/patch-tests/:id/photos/:photoId': {
    may: both(policy('patchtests.read', junoTest), policy('medical.read', junoTest)),
    input: (w) => ({ params: { id: w.id.ptClosed!, photoId: w.id.ptPhoto! } }),
  },
  'POST /api/patch-tests/:id/close': {
    may: policy('patchtests.record', lantern),
    input: async (w) => ({ params: { id: w.id.ptApplied! }, body: { version: await testVersion(w, w.id.ptApplied!) } }),
  },
  'GET /api/performers/:id/patch-tests': { may: policy('patchtests.read', juno), input: (w) => ({ params: { id: w.id.juno! } }) },
  'GET /api/performers/:id/patch-tests/summary.pdf': {
    may: both(policy('patchtests.read', juno), policy('medical.read', juno)),
    input: (w) => ({ params: { id: w.id.juno! } }),
  },
  'POST /api/performers/:id/clearance-overrides': {
    may: overrideOnJuno,
    input: (w) => ({ params: { id: w.id.juno! }, body: { formulationId: w.id.formulation, state: 'caution', note: 'Use a thin layer only, and watch the edges.' } }),
  },
};
