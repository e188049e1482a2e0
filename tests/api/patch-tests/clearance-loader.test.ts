import { Kysely, PostgresDialect } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sealJson } from '../../../api/crypto/medical.ts';
import type { Database } from '../../../api/db/schema.ts';
import { performerClearances } from '../../../api/features/patch-tests/index.ts';
import { forgetClearanceKept } from '../../../api/features/patch-tests/clearance-cache.ts';
import { loadTableFacts } from '../../../api/features/patch-tests/clearance-scope.ts';
import { createTestApp, type TestApp } from '../../support/app.ts';

/** The loader the artist's check and the clearance table read: real rows, a fixed number of queries. */
let t: TestApp;
let queries = 0;
let counted: Kysely<Database>;
let performerId: string;
let productionId: string;
let leadId: string;
const NOW = new Date('2026-12-02T12:00:00Z');

const product = async (name: string) => t.db.db.selectFrom('products').select(['id', 'current_formulation_id']).where('name', '=', name).executeTakeFirstOrThrow();
const lot = async (code: string) => t.db.db.selectFrom('product_lots').select(['id', 'product_id', 'formulation_id']).where('code', '=', code).executeTakeFirstOrThrow();

/** A closed occluded test of one performer with the given codes at D2 and D4 for each lot. */
async function closedTest(pid: string, appliedAt: Date, items: { lot: string; codes: [string, string] }[]): Promise<void> {
  const db = t.db.db;
  const version = await db.selectFrom('protocol_versions').select('id').where('protocol_id', '=', 'occluded-48h').orderBy('version', 'desc').executeTakeFirstOrThrow();
  const booking = await db.insertInto('bookings').values({ performer_id: pid, production_id: productionId, purpose: 'patch_test', starts_at: appliedAt, location: 'Studio 2', status: 'done', created_by: leadId }).returning('id').executeTakeFirstOrThrow();
  await db.insertInto('patch_tests').values({ booking_id: booking.id, performer_id: pid, production_id: productionId, protocol_version_id: version.id, status: 'closed', applied_at: appliedAt, removed_at: new Date(appliedAt.getTime() + 48 * 3600_000), closed_at: new Date(appliedAt.getTime() + 96 * 3600_000) }).execute();
  for (const [i, item] of items.entries()) {
    const l = await lot(item.lot);
    const tp = await db.insertInto('patch_test_products').values({ test_id: booking.id, position: i, product_id: l.product_id, lot_id: l.id, formulation_id: l.formulation_id, site: `Left inner forearm ${i + 1}` }).returning('id').executeTakeFirstOrThrow();
    await db
      .insertInto('patch_test_readings')
      .values([
        { test_product_id: tp.id, point_id: 'd2', read_at: new Date(appliedAt.getTime() + 48.5 * 3600_000), code: sealJson(item.codes[0]), read_by: leadId },
        { test_product_id: tp.id, point_id: 'd4', read_at: new Date(appliedAt.getTime() + 96 * 3600_000), code: sealJson(item.codes[1]), read_by: leadId },
      ])
      .execute();
  }
}

beforeAll(async () => {
  t = await createTestApp();
  counted = new Kysely<Database>({ dialect: new PostgresDialect({ pool: t.db.pool }), log: (e) => void (e.level === 'query' && queries++) });
  performerId = (await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', 'Juno Castellane').executeTakeFirstOrThrow()).id;
  productionId = (await t.db.db.selectFrom('productions').select('id').where('name', '=', 'The Lantern Keeper').executeTakeFirstOrThrow()).id;
  leadId = await t.userId('lead@plinth.test');
  // Start from a performer with no tests of their own.
  await t.db.db.deleteFrom('patch_test_readings').execute();
  await t.db.db.deleteFrom('patch_test_products').execute();
  await t.db.db.deleteFrom('patch_tests').where('performer_id', '=', performerId).execute();
  // …and none of the lead's decisions the demo's application log set for her.
  await t.db.db.deleteFrom('clearance_overrides').where('performer_id', '=', performerId).execute();
  // Juno's patch-testing form declares a fragrance allergy in her own words.
  const consent = await t.db.db.selectFrom('consents').select('id').where('performer_id', '=', performerId).where('kind', '=', 'patch_testing').executeTakeFirstOrThrow();
  await t.db.db.updateTable('consent_answers').set({ answer: JSON.stringify(sealJson('I am allergic to fragrance, and sticking plasters')) }).where('consent_id', '=', consent.id).where('question_id', '=', 'known_allergies').execute();

  // Quayside reacted (+ then ++); Tidewater stayed negative; the old Harbour Bond formulation stayed negative.
  await closedTest(performerId, new Date('2026-11-02T09:00:00Z'), [
    { lot: 'QA-2602', codes: ['+', '++'] },
    { lot: 'PR-2602', codes: ['-', '-'] },
    { lot: 'HB-2411', codes: ['-', '-'] },
  ]);
  const flotsam = await product('Flotsam prosthetic adhesive');
  await t.db.db.insertInto('clearance_overrides').values({ performer_id: performerId, production_id: productionId, formulation_id: flotsam.current_formulation_id!, state: 'caution', note: sealJson('Asked the performer; use sparingly'), set_by: leadId, set_at: new Date('2026-11-20T10:00:00Z') }).execute();
});
afterAll(async () => {
  await t?.close();
});

describe('performerClearances', () => {
  it('answers each product from the real rows: reacted, shared ingredient, declared allergy, clear, new formulation, override', async () => {
    const names = ['Quayside acrylic emulsion adhesive', 'Breakwater acrylic sealer', 'Tidewater citrus remover', 'Pier silicone adhesive remover', 'Harbour Bond silicone adhesive', 'Flotsam prosthetic adhesive', 'Mistral setting powder', 'Tern gentle skin cleanser'];
    const ids = await Promise.all(names.map(async (n) => (await product(n)).id));
    const results = await performerClearances(t.db.db, { performerId, productIds: ids, now: NOW });
    const byName = new Map(results.map((r) => [r.productName, r]));
    // Clearance rule of the product brief §3: any + or stronger is Do not use.
    expect(byName.get('Quayside acrylic emulsion adhesive')).toMatchObject({ state: 'do_not_use', reasons: [{ code: 'reacted' }] });
    // Shares Acrylates Copolymer with Quayside (catalogue seed INCI lists), so Caution.
    expect(byName.get('Breakwater acrylic sealer')!.state).toBe('caution');
    expect(byName.get('Breakwater acrylic sealer')!.reasons[0]!.code).toBe('shared_ingredient');
    // Tidewater lists Limonene, Linalool and Citral, fragrance allergens (Annex III, check-values.md §2): the declared fragrance allergy stops it.
    expect(byName.get('Tidewater citrus remover')).toMatchObject({ state: 'do_not_use', reasons: [{ code: 'declared_allergy' }] });
    // Negative through the final reading: Cleared for 12 months from the final reading (product brief §3 default validity).
    const pier = byName.get('Pier silicone adhesive remover')!;
    expect(pier.state).toBe('cleared');
    expect(pier.validUntil!.toISOString()).toBe('2027-11-06T09:00:00.000Z');
    // The negative test was of the first formulation; the current one is untested again (product brief §3).
    expect(byName.get('Harbour Bond silicone adhesive')).toMatchObject({ state: 'untested', reasons: [{ code: 'new_formulation' }] });
    expect(byName.get('Flotsam prosthetic adhesive')).toMatchObject({ state: 'caution', overridden: true, computedState: 'untested', override: { state: 'caution', by: 'Dr. Tomasz Brill' } });
    // Parfum is in the fragrance group (catalogue seed vocabulary), so the declared fragrance allergy stops it untested.
    expect(byName.get('Mistral setting powder')).toMatchObject({ state: 'do_not_use', reasons: [{ code: 'declared_allergy' }] });
    expect(byName.get('Tern gentle skin cleanser')).toMatchObject({ state: 'untested', reasons: [{ code: 'not_tested' }] });
    // States and reasons only: nothing of the sealed codes or the override note.
    const text = JSON.stringify(results);
    expect(text).not.toContain('++');
    expect(text).not.toContain('sparingly');
  });

  it('reads every product of the catalogue in the same fixed number of queries as two, whatever the tests', async () => {
    const two = await Promise.all(['Quayside acrylic emulsion adhesive', 'Mistral setting powder'].map(async (n) => (await product(n)).id));
    // Cold each time: nothing kept from an earlier read (`clearance-cache.ts`).
    forgetClearanceKept(counted);
    queries = 0;
    await performerClearances(counted, { performerId, productIds: two, now: NOW });
    const forTwo = queries;
    forgetClearanceKept(counted);
    queries = 0;
    const all = await performerClearances(counted, { performerId, now: NOW });
    expect(queries).toBe(forTwo);
    // The stamps, tested products, overrides, declared answers, current formulations, the vocabulary, protocols,
    // formulations and their ingredients (as measured).
    expect(forTwo).toBeLessThanOrEqual(9);
    const count = await t.db.db.selectFrom('products').select((e) => e.fn.countAll<string>().as('n')).executeTakeFirstOrThrow();
    expect(all).toHaveLength(Number(count.n));
    // A second test with three more products adds no query.
    await closedTest(performerId, new Date('2026-11-10T09:00:00Z'), [
      { lot: 'MS-2604', codes: ['-', '-'] },
      { lot: 'DB-2602', codes: ['-', '-'] },
      { lot: 'GG-2601', codes: ['?+', '?+'] },
    ]);
    forgetClearanceKept(counted);
    queries = 0;
    const again = await performerClearances(counted, { performerId, now: NOW });
    expect(queries).toBe(forTwo);
    // ?+ at the final reading: Caution, retest advised (product brief §3).
    expect(again.find((r) => r.productName === 'Gull grey pigment powder')).toMatchObject({ state: 'caution', retestAdvised: true });
  });

  it('declares nothing for a performer whose forms name no allergen, and never reads the vocabulary then', async () => {
    const other = (await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', 'Oswin Parfitt-Reyes').executeTakeFirstOrThrow()).id;
    const tide = (await product('Tidewater citrus remover')).id;
    queries = 0;
    const [r] = await performerClearances(counted, { performerId: other, productIds: [tide], now: NOW });
    expect(r).toMatchObject({ state: 'untested', reasons: [{ code: 'not_tested' }] });
    expect(queries).toBeLessThanOrEqual(7);
  });
});

describe('the clearance table of one performer', () => {
  const view = (r: { productId: string; state: string; reasons: { code: string }[]; overridden: boolean }) => ({ productId: r.productId, state: r.state, reasons: r.reasons.map((x) => x.code), overridden: r.overridden });

  it('gives what the whole-catalogue loader gives, with the shared-ingredient Cautions a page at a time by name', async () => {
    // The independent path: every product of the catalogue answered, then the Untested "not tested" ones left out.
    const everything = (await performerClearances(t.db.db, { performerId, now: NOW })).filter((r) => r.state !== 'untested' || r.reasons[0]?.code !== 'not_tested' || r.overridden);
    const first = await loadTableFacts(t.db.db, { performerId, now: NOW, sharedPage: { page: 1, pageSize: 1 } });
    const total = first.shared.total;
    // Quayside reacted, and more than one untested product lists one of its non-trivial ingredients (catalogue seed INCI lists).
    expect(total).toBeGreaterThan(1);
    const pages = [first];
    for (let page = 2; page <= total + 1; page++) pages.push(await loadTableFacts(t.db.db, { performerId, now: NOW, sharedPage: { page, pageSize: 1 } }));
    const shared = pages.flatMap((p) => p.shared.results);
    // One product a page, none after the last, none twice, in name order.
    expect(pages.map((p) => p.shared.results.length)).toEqual([...Array.from({ length: total }, () => 1), 0]);
    expect(new Set(shared.map((r) => r.productId)).size).toBe(total);
    const names = shared.map((r) => r.productName.toLowerCase());
    expect(names).toEqual(names.toSorted());
    for (const r of shared) expect(view(r)).toEqual({ productId: r.productId, state: 'caution', reasons: ['shared_ingredient', 'not_tested'], overridden: false });
    // The table proper and the pages together hold exactly what the whole-catalogue answer holds, state and reasons alike.
    const table = first.results.filter((r) => r.state !== 'untested' || r.reasons[0]?.code !== 'not_tested' || r.overridden);
    const byProduct = (rows: typeof everything) => rows.map(view).toSorted((a, b) => a.productId.localeCompare(b.productId));
    expect(byProduct([...table, ...shared])).toEqual(byProduct(everything));
    // Breakwater shares Acrylates Copolymer with Quayside: on a page, not in the table proper; the declared allergy's Tidewater in the table.
    expect(shared.map((r) => r.productName)).toContain('Breakwater acrylic sealer');
    expect(table.map((r) => r.productName)).toContain('Tidewater citrus remover');
    expect(table.map((r) => r.productName)).not.toContain('Breakwater acrylic sealer');
  });

  it('reads a page in the same number of queries as the whole list', async () => {
    forgetClearanceKept(counted);
    queries = 0;
    await loadTableFacts(counted, { performerId, now: NOW, sharedPage: { page: 1, pageSize: 1 } });
    const paged = queries;
    forgetClearanceKept(counted);
    queries = 0;
    await loadTableFacts(counted, { performerId, now: NOW });
    expect(queries).toBe(paged);
    // The stamps, tested products, overrides, declared answers, protocols, tested formulations and their ingredients, the
    // vocabulary, the catalogue listing, overridden products, the current formulations, and theirs: a fixed count (as measured).
    expect(paged).toBeLessThanOrEqual(13);
  });
});
