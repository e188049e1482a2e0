// Shared set-up of the kit, check and application log API tests: the demo products, lots, performers and
// pieces by name, clearance set by the lead's override rows, and the mail the lead receives.
import fs from 'node:fs/promises';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, beforeEach } from 'vitest';
import { sealJson } from '../../../api/crypto/medical.ts';
import { createTestApp, type TestApp } from '../../support/app.ts';
import { performerId, productionId, sessions, type Who } from '../../fixtures/performers.ts';
import { snapshotData } from '../../fixtures/snapshot.ts';

export let t: TestApp;
export let as: Record<Who, string>;
export let ids: {
  lantern: string;
  saltglass: string;
  juno: string;
  oz: string;
  products: Record<string, { id: string; formulationId: string }>;
  lots: Record<string, string>;
};
let restore: () => Promise<void>;

/** The real app on one database for the file, with the demo data put back (and the mail emptied) before every test. */
export function useApplicationApp(): void {
  beforeAll(async () => {
    t = await createTestApp();
    as = await sessions(t);
    // Start every performer with no patch tests, so each test's overrides alone decide clearance.
    await t.db.db.deleteFrom('patch_test_readings').execute();
    await t.db.db.deleteFrom('patch_test_photos').execute();
    await t.db.db.deleteFrom('patch_test_products').execute();
    await t.db.db.deleteFrom('patch_tests').execute();
    await t.db.db.deleteFrom('clearance_overrides').execute();
    restore = await snapshotData(t);
    const products = await t.db.db.selectFrom('products').select(['id', 'name', 'current_formulation_id']).execute();
    const lots = await t.db.db.selectFrom('product_lots').select(['id', 'code']).execute();
    ids = {
      lantern: await productionId(t, 'The Lantern Keeper'),
      saltglass: await productionId(t, 'Saltglass Mile'),
      juno: await performerId(t, 'Juno Castellane'),
      oz: await performerId(t, 'Oswin Parfitt-Reyes'),
      products: Object.fromEntries(products.map((p) => [p.name, { id: p.id, formulationId: p.current_formulation_id! }])),
      lots: Object.fromEntries(lots.map((l) => [l.code, l.id])),
    };
  });
  beforeEach(async () => {
    await restore();
    await fs.rm(t.mail.dir, { recursive: true, force: true });
    await fs.mkdir(t.mail.dir, { recursive: true });
  });
  afterAll(async () => {
    await t?.close();
  });
}

export const api = () => request(t.app);

export const HARBOUR = 'Harbour Bond silicone adhesive';
export const PIER = 'Pier silicone adhesive remover';
export const QUAYSIDE = 'Quayside acrylic emulsion adhesive';
export const MISTRAL = 'Mistral setting powder';

/** The lead's decision on a product for a performer, written as the patch-test log keeps it. */
export async function setClearance(performer: string, product: string, state: 'cleared' | 'caution' | 'do_not_use' | 'untested', at = new Date(Date.now() - 60_000)): Promise<void> {
  await t.db.db
    .insertInto('clearance_overrides')
    .values({ performer_id: performer, production_id: ids.lantern, formulation_id: ids.products[product]!.formulationId, state, note: sealJson('Lead reviewed the record'), set_by: await t.userId('lead@plinth.test'), set_at: at })
    .execute();
}

/** Runs a check as the artist on The Lantern Keeper. */
export async function runCheck(body: Record<string, unknown>, who: Who = 'artist') {
  return api()
    .post('/api/checks')
    .set('Cookie', as[who])
    .send({ productionId: ids.lantern, performerId: ids.juno, ...body });
}

/** A valid application body logged from a check: Harbour Bond (lot HB-2603) on today, removed with Pier. */
export function applicationBody(checkId: string, over: Record<string, unknown> = {}) {
  const start = new Date(Date.now() - 3 * 3600_000);
  return {
    checkId,
    appliedOn: start.toISOString().slice(0, 10),
    description: 'Scar appliance, left cheek',
    products: [{ productId: ids.products[HARBOUR]!.id, lotId: ids.lots['HB-2603'] }],
    removalProducts: [],
    startedAt: start.toISOString(),
    endedAt: null,
    notes: 'Edges blended with a light stipple',
    ...over,
  };
}

/** The messages the mail catcher holds, as raw text. */
export async function caughtMail(): Promise<string[]> {
  const files = (await fs.readdir(t.mail.dir)).filter((f) => f.endsWith('.eml')).sort();
  return Promise.all(files.map((f) => fs.readFile(path.join(t.mail.dir, f), 'utf8')));
}

/** Rows of the tables an application writes, to show nothing was half-saved. */
export async function logCounts() {
  const count = async (table: 'applications' | 'application_products' | 'skin_checks' | 'incidents' | 'lead_requests' | 'kits' | 'kit_products') =>
    Number((await t.db.db.selectFrom(table).select((eb) => eb.fn.countAll<string>().as('n')).executeTakeFirstOrThrow()).n);
  return { applications: await count('applications'), products: await count('application_products'), skinChecks: await count('skin_checks'), incidents: await count('incidents'), requests: await count('lead_requests'), kits: await count('kits'), kitProducts: await count('kit_products') };
}
