// Shared set-up of the appliance build API tests: the demo molds, products and lots by name, a valid
// build to vary, and the row counts that show nothing was half-saved.
import request from 'supertest';
import { afterAll, beforeAll, beforeEach } from 'vitest';
import type { CreateBuildInput } from '#shared/schemas/builds.ts';
import { createTestApp, type TestApp } from '../../support/app.ts';
import { castByKey } from '../../fixtures/archive.ts';
import { productionId, sessions, type Who } from '../../fixtures/performers.ts';
import { snapshotData } from '../../fixtures/snapshot.ts';

// Live bindings: each test file calls useBuildApp() and reads these once the hooks have run.
export let t: TestApp;
export let as: Record<Who, string>;
export let ids: DemoIds;
let restore: () => Promise<void>;

export interface DemoIds {
  lantern: string;
  saltglass: string;
  juno: string;
  molds: { junoFace: string; junoHand: string; ozHead: string; ozShoulders: string; halvardTeeth: string; junoFacePositive: string };
  products: Record<'slipway' | 'slackTide' | 'kelpwrack' | 'seaFret' | 'lighthouse' | 'mooring' | 'wharfside' | 'harbour', string>;
  /** Lot ids by code. */
  lots: Record<string, string>;
  /** Formulation of each lot, by code. */
  formulations: Record<string, string>;
}

async function demoIds(): Promise<DemoIds> {
  const db = t.db.db;
  const product = async (name: string) => (await db.selectFrom('products').select('id').where('name', '=', name).executeTakeFirstOrThrow()).id;
  const lots = await db.selectFrom('product_lots').select(['id', 'code', 'formulation_id']).execute();
  return {
    lantern: await productionId(t, 'The Lantern Keeper'),
    saltglass: await productionId(t, 'Saltglass Mile'),
    juno: (await db.selectFrom('performers').select('id').where('legal_name', '=', 'Juno Castellane').executeTakeFirstOrThrow()).id,
    molds: {
      junoFace: (await castByKey(t, 'juno-face-mold')).id,
      junoHand: (await castByKey(t, 'juno-hand-mold')).id,
      ozHead: (await castByKey(t, 'oz-head-mold')).id,
      ozShoulders: (await castByKey(t, 'oz-shoulders-mold')).id,
      halvardTeeth: (await castByKey(t, 'halvard-teeth-mold')).id,
      junoFacePositive: (await castByKey(t, 'juno-face-positive')).id,
    },
    products: {
      slipway: await product('Slipway platinum silicone base'),
      slackTide: await product('Slack Tide silicone softener'),
      kelpwrack: await product('Kelpwrack flesh-red silicone pigment'),
      seaFret: await product('Sea-fret rayon flocking'),
      lighthouse: await product('Lighthouse vinyl cap plastic'),
      mooring: await product('Mooring acetone'),
      wharfside: await product('Wharfside mold release'),
      harbour: await product('Harbour Bond silicone adhesive'),
    },
    lots: Object.fromEntries(lots.map((l) => [l.code, l.id])),
    formulations: Object.fromEntries(lots.map((l) => [l.code, l.formulation_id])),
  };
}

/** The real app on one database for the file, with the demo data put back before every test. */
export function useBuildApp(): void {
  beforeAll(async () => {
    t = await createTestApp();
    as = await sessions(t);
    restore = await snapshotData(t);
    ids = await demoIds();
  });
  beforeEach(async () => {
    await restore();
  });
  afterAll(async () => {
    await t?.close();
  });
}

export const api = () => request(t.app);

/** A build every rule accepts: 15 g of part A of a 1 : 1 silicone with softener at 100 %, pigment, a thinned coating. */
export function validBuild(over: Partial<CreateBuildInput> = {}): CreateBuildInput {
  return {
    productionId: ids.lantern,
    moldId: ids.molds.junoHand,
    madeOn: new Date().toISOString().slice(0, 10),
    madeBy: 'Rafe Lindqvist',
    materials: [
      { role: 'part_a', productId: ids.products.slipway, lotId: ids.lots['SP-2611']! },
      { role: 'part_b', productId: ids.products.slipway, lotId: ids.lots['SP-2611']! },
      { role: 'softener', productId: ids.products.slackTide, lotId: ids.lots['ST-2605']! },
      { role: 'pigment', productId: ids.products.kelpwrack, lotId: ids.lots['KW-2604']! },
      { role: 'cap_material', productId: ids.products.lighthouse, lotId: ids.lots['LC-2604']! },
      { role: 'solvent', productId: ids.products.mooring, lotId: ids.lots['MA-2603']! },
      { role: 'release_agent', productId: ids.products.wharfside, lotId: ids.lots['WR-2602']! },
    ],
    mix: {
      ratio: { partA: 1, partB: 1 },
      softener: { percent: 100, makerMaxPercent: 100 },
      pigment: { kind: 'drops', drops: 10, dropMassG: 0.03 },
      target: { kind: 'partA', partAG: 15 },
      scaleResolutionG: 0.1,
    },
    weighed: { partA: 15.1, softener: 30, pigment: 0.3, partB: 15 },
    coating: { capParts: 1, solventParts: 8, targetMl: 90 },
    piecesMade: 5,
    notes: null,
    ...over,
  };
}

export const createAs = (who: Who, body: unknown) => api().post('/api/appliance-builds').set('Cookie', as[who]).send(body as object);

/** Rows a build writes, and the audit entries about builds: unchanged after a refusal. */
export async function buildRowCounts(): Promise<Record<string, number>> {
  const db = t.db.db;
  const n = async (table: 'appliance_builds' | 'appliance_build_materials' | 'appliance_pieces' | 'appliance_plans') =>
    Number((await db.selectFrom(table).select((eb) => eb.fn.countAll<string>().as('n')).executeTakeFirstOrThrow()).n);
  const audit = await db.selectFrom('audit_log').select((eb) => eb.fn.countAll<string>().as('n')).where('action', 'like', 'build.%').executeTakeFirstOrThrow();
  return {
    builds: await n('appliance_builds'),
    materials: await n('appliance_build_materials'),
    pieces: await n('appliance_pieces'),
    plans: await n('appliance_plans'),
    audit: Number(audit.n),
  };
}

/** The build id of a demo build, by the performer's mold it was poured from. */
export async function demoBuild(moldId: string): Promise<{ id: string; version: number }> {
  return t.db.db.selectFrom('appliance_builds').select(['id', 'version']).where('mold_id', '=', moldId).executeTakeFirstOrThrow();
}
