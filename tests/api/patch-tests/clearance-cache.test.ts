import { Kysely, PostgresDialect } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sealJson } from '../../../api/crypto/medical.ts';
import type { Database } from '../../../api/db/schema.ts';
import { forgetClearanceKept, keptTestedSummary, keptTestFacts, readClearanceStamps, sharedOnlyRows, splitListing } from '../../../api/features/patch-tests/clearance-cache.ts';
import { loadClearanceFacts } from '../../../api/features/patch-tests/clearance-loader.ts';
import { loadTableFacts } from '../../../api/features/patch-tests/clearance-scope.ts';
import { createTestApp, type TestApp } from '../../support/app.ts';

/**
 * What clearance keeps between requests is right on the very next read after any change, made by this
 * process or another: the stamps move with every row clearance reads, and nothing is kept without one.
 * `t.db.db` stands for another API process here: it shares the database and none of `kept`'s memory.
 */
let t: TestApp;
let kept: Kysely<Database>;
let statements: string[] = [];
let juno: string;
let oswin: string;
let productionId: string;
let leadId: string;
const NOW = new Date('2026-12-02T12:00:00Z');

const product = async (name: string) => t.db.db.selectFrom('products').select(['id', 'current_formulation_id']).where('name', '=', name).executeTakeFirstOrThrow();
const lot = async (code: string) => t.db.db.selectFrom('product_lots').select(['id', 'product_id', 'formulation_id']).where('code', '=', code).executeTakeFirstOrThrow();
const stampOf = async (performerId: string) => readClearanceStamps(t.db.db, performerId);

/** A test of one performer on one lot, closed with the given codes at D2 and D4, or still booked without codes. */
async function test(pid: string, lotCode: string, codes: [string, string] | null): Promise<{ bookingId: string; testProductId: string }> {
  const db = t.db.db;
  const appliedAt = new Date('2026-11-02T09:00:00Z');
  const version = await db.selectFrom('protocol_versions').select('id').where('protocol_id', '=', 'occluded-48h').orderBy('version', 'desc').executeTakeFirstOrThrow();
  const booking = await db.insertInto('bookings').values({ performer_id: pid, production_id: productionId, purpose: 'patch_test', starts_at: appliedAt, location: 'Studio 2', status: codes ? 'done' : 'booked', created_by: leadId }).returning('id').executeTakeFirstOrThrow();
  await db
    .insertInto('patch_tests')
    .values(codes ? { booking_id: booking.id, performer_id: pid, production_id: productionId, protocol_version_id: version.id, status: 'closed', applied_at: appliedAt, removed_at: new Date(appliedAt.getTime() + 48 * 3600_000), closed_at: new Date(appliedAt.getTime() + 96 * 3600_000) } : { booking_id: booking.id, performer_id: pid, production_id: productionId, protocol_version_id: version.id, status: 'booked' })
    .execute();
  const l = await lot(lotCode);
  const tp = await db.insertInto('patch_test_products').values({ test_id: booking.id, position: 0, product_id: l.product_id, lot_id: l.id, formulation_id: l.formulation_id, site: 'Left inner forearm 1' }).returning('id').executeTakeFirstOrThrow();
  if (codes) {
    await db
      .insertInto('patch_test_readings')
      .values([
        { test_product_id: tp.id, point_id: 'd2', read_at: new Date(appliedAt.getTime() + 48.5 * 3600_000), code: sealJson(codes[0]), read_by: leadId },
        { test_product_id: tp.id, point_id: 'd4', read_at: new Date(appliedAt.getTime() + 96 * 3600_000), code: sealJson(codes[1]), read_by: leadId },
      ])
      .execute();
  }
  return { bookingId: booking.id, testProductId: tp.id };
}

/** The kept handle's clearance of some products, with the statements it ran. */
async function clearanceOf(pid: string, names: string[]) {
  const ids = await Promise.all(names.map(async (n) => (await product(n)).id));
  statements = [];
  const facts = await loadClearanceFacts(kept, { performerId: pid, productIds: ids, now: NOW });
  return { byName: new Map(facts.results.map((r) => [r.productName, r])), tested: facts.tested, ran: statements };
}
const readsTests = (ran: string[]) => ran.some((s) => /from "patch_test_products"/.test(s));
const readsIngredients = (ran: string[]) => ran.some((s) => /from "formulation_ingredients"/.test(s));

beforeAll(async () => {
  t = await createTestApp();
  kept = new Kysely<Database>({ dialect: new PostgresDialect({ pool: t.db.pool }), log: (e) => void (e.level === 'query' && statements.push(e.query.sql)) });
  juno = (await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', 'Juno Castellane').executeTakeFirstOrThrow()).id;
  oswin = (await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', 'Oswin Parfitt-Reyes').executeTakeFirstOrThrow()).id;
  productionId = (await t.db.db.selectFrom('productions').select('id').where('name', '=', 'The Lantern Keeper').executeTakeFirstOrThrow()).id;
  leadId = await t.userId('lead@plinth.test');
  // Start from performers with no tests and no decisions of the lead's.
  await t.db.db.deleteFrom('patch_test_readings').execute();
  await t.db.db.deleteFrom('patch_test_products').execute();
  await t.db.db.deleteFrom('patch_tests').where('performer_id', 'in', [juno, oswin]).execute();
  await t.db.db.deleteFrom('clearance_overrides').where('performer_id', 'in', [juno, oswin]).execute();
});
afterAll(async () => {
  await t?.close();
});

describe('the stamps', () => {
  it("move for the performer on every change to their tests, tested products, readings and session status, and only theirs", async () => {
    const moves = async (change: () => Promise<unknown>) => {
      const [before, other] = [await stampOf(juno), await stampOf(oswin)];
      await change();
      const after = await stampOf(juno);
      expect(after.performer).not.toBeNull();
      expect(after.performer).not.toBe(before.performer);
      expect((await stampOf(oswin)).performer).toBe(other.performer);
      // The catalogue is not theirs: it stays.
      expect(after.catalogue).toBe(before.catalogue);
    };
    let made = { bookingId: '', testProductId: '' };
    await moves(async () => (made = await test(juno, 'MS-2604', ['-', '-'])));
    await moves(() => t.db.db.updateTable('patch_test_readings').set({ code: sealJson('+') }).where('test_product_id', '=', made.testProductId).where('point_id', '=', 'd4').execute());
    await moves(() => t.db.db.deleteFrom('patch_test_readings').where('test_product_id', '=', made.testProductId).where('point_id', '=', 'd4').execute());
    await moves(() => t.db.db.updateTable('patch_test_products').set({ site: 'Left inner forearm 2' }).where('id', '=', made.testProductId).execute());
    await moves(() => t.db.db.updateTable('patch_tests').set({ status: 'applied' }).where('booking_id', '=', made.bookingId).execute());
    await moves(() => t.db.db.updateTable('bookings').set({ status: 'cancelled' }).where('id', '=', made.bookingId).execute());
    await moves(() => t.db.db.deleteFrom('patch_test_products').where('id', '=', made.testProductId).execute());
    await moves(() => t.db.db.deleteFrom('patch_tests').where('booking_id', '=', made.bookingId).execute());
    // A booking's other details are not read by clearance: moving the session leaves the stamp.
    const b = await t.db.db.selectFrom('bookings').select('id').where('performer_id', '=', oswin).executeTakeFirst();
    if (b) {
      const before = await stampOf(oswin);
      await t.db.db.updateTable('bookings').set({ location: 'Studio 9' }).where('id', '=', b.id).execute();
      expect((await stampOf(oswin)).performer).toBe(before.performer);
    }
  });

  it('move for the catalogue on changes to products, formulations, their ingredients, the vocabulary and protocol versions', async () => {
    const moves = async (change: () => Promise<unknown>) => {
      const before = await stampOf(juno);
      await change();
      const after = await stampOf(juno);
      expect(after.catalogue).not.toBeNull();
      expect(after.catalogue).not.toBe(before.catalogue);
      expect(after.performer).toBe(before.performer);
    };
    const mistral = await product('Mistral setting powder');
    await moves(() => t.db.db.updateTable('products').set({ maker: 'Invented Works' }).where('id', '=', mistral.id).execute());
    await moves(() => t.db.db.updateTable('product_formulations').set({ inci_label: 'Talc, Silica' }).where('id', '=', mistral.current_formulation_id!).execute());
    await moves(() => t.db.db.updateTable('formulation_ingredients').set({ may_contain: false }).where('formulation_id', '=', mistral.current_formulation_id!).execute());
    await moves(() => t.db.db.updateTable('ingredients').set({ synonyms: ['Invented synonym'] }).where('inci', '=', 'Talc').execute());
    await moves(() => t.db.db.updateTable('protocol_versions').set({ description: 'Edited' }).where('protocol_id', '=', 'occluded-48h').execute());
  });
});

describe('what clearance keeps', () => {
  it("is not read again while the stamps stand, and a reading written by another process is in the very next answer", async () => {
    forgetClearanceKept(kept);
    await test(juno, 'QA-2602', ['-', '-']);
    const cold = await clearanceOf(juno, ['Quayside acrylic emulsion adhesive']);
    expect(readsTests(cold.ran)).toBe(true);
    expect(cold.byName.get('Quayside acrylic emulsion adhesive')!.state).toBe('cleared');
    const warm = await clearanceOf(juno, ['Quayside acrylic emulsion adhesive']);
    expect(readsTests(warm.ran)).toBe(false);
    expect(readsIngredients(warm.ran)).toBe(false);
    expect(warm.ran.length).toBeLessThan(cold.ran.length);
    expect(warm.byName.get('Quayside acrylic emulsion adhesive')!.state).toBe('cleared');

    // A second test, written through the other handle: ++ at D4 stops the product (product brief §3: any + or stronger).
    await test(juno, 'QA-2602', ['+', '++']);
    const after = await clearanceOf(juno, ['Quayside acrylic emulsion adhesive']);
    expect(readsTests(after.ran)).toBe(true);
    expect(after.byName.get('Quayside acrylic emulsion adhesive')).toMatchObject({ state: 'do_not_use', reasons: [{ code: 'reacted' }] });
  });

  it('answers a cancelled session on the next read', async () => {
    forgetClearanceKept(kept);
    const booked = await test(oswin, 'MS-2604', null);
    const before = await clearanceOf(oswin, ['Mistral setting powder']);
    expect(before.byName.get('Mistral setting powder')).toMatchObject({ state: 'pending', reasons: [{ code: 'test_booked' }] });
    await t.db.db.updateTable('bookings').set({ status: 'cancelled' }).where('id', '=', booked.bookingId).execute();
    const after = await clearanceOf(oswin, ['Mistral setting powder']);
    expect(after.tested.find((r) => r.testId === booked.bookingId)!.status).toBe('cancelled');
    expect(after.byName.get('Mistral setting powder')!.state).not.toBe('pending');
  });

  it('answers an ingredient edit made elsewhere on the next read, in the check and the table alike', async () => {
    forgetClearanceKept(kept);
    // Juno reacted to Quayside (the test above); Breakwater shares Acrylates Copolymer with it (catalogue seed INCI lists).
    const before = await clearanceOf(juno, ['Breakwater acrylic sealer']);
    expect(before.byName.get('Breakwater acrylic sealer')!.reasons[0]!.code).toBe('shared_ingredient');
    const tableBefore = await loadTableFacts(kept, { performerId: juno, now: NOW });
    expect(tableBefore.shared.results.map((r) => r.productName)).toContain('Breakwater acrylic sealer');
    // Warm, the table reads neither the tests nor the catalogue's listing by ingredient again.
    statements = [];
    const tableWarm = await loadTableFacts(kept, { performerId: juno, now: NOW });
    expect(readsTests(statements) || readsIngredients(statements)).toBe(false);
    expect(tableWarm.shared).toEqual(tableBefore.shared);
    await t.db.db.updateTable('ingredients').set({ trivial: true }).where('inci', '=', 'Acrylates Copolymer').execute();
    try {
      const after = await clearanceOf(juno, ['Breakwater acrylic sealer']);
      expect(readsIngredients(after.ran)).toBe(true);
      expect(after.byName.get('Breakwater acrylic sealer')!.reasons.map((r) => r.code)).not.toContain('shared_ingredient');
      const tableAfter = await loadTableFacts(kept, { performerId: juno, now: NOW });
      expect(tableAfter.shared.results.map((r) => r.productName)).not.toContain('Breakwater acrylic sealer');
    } finally {
      await t.db.db.updateTable('ingredients').set({ trivial: false }).where('inci', '=', 'Acrylates Copolymer').execute();
    }
  });

  it('keeps nothing for a performer whose rows were written with the triggers off, and reads them every time', async () => {
    forgetClearanceKept(kept);
    const c = await t.db.pool.connect();
    try {
      await c.query('begin');
      await c.query('set local session_replication_role = replica');
      await c.query(`delete from clearance_stamps where key = $1`, [`performer:${oswin}`]);
      await c.query('commit');
    } finally {
      c.release();
    }
    expect((await stampOf(oswin)).performer).toBeNull();
    const first = await clearanceOf(oswin, ['Mistral setting powder']);
    const second = await clearanceOf(oswin, ['Mistral setting powder']);
    expect(readsTests(first.ran)).toBe(true);
    expect(readsTests(second.ran)).toBe(true);
  });

  it("keeps the tests' facts beside kept rows only, worked out again under a new catalogue stamp", async () => {
    forgetClearanceKept(kept);
    await clearanceOf(juno, ['Quayside acrylic emulsion adhesive']);
    const { tested } = await clearanceOf(juno, ['Quayside acrylic emulsion adhesive']);
    expect(Object.isFrozen(tested)).toBe(true);
    let built = 0;
    const build = () => ({ n: ++built });
    const first = keptTestFacts(tested, '41', build);
    expect(keptTestFacts(tested, '41', build)).toBe(first);
    expect(built).toBe(1);
    expect(keptTestFacts(tested, '42', build)).toEqual({ n: 2 });
    // Rows nobody keeps (a key without a stamp), or no catalogue stamp: worked out every time.
    const loose = [...tested];
    keptTestFacts(loose, '42', build);
    keptTestFacts(loose, '42', build);
    keptTestFacts(tested, null, build);
    expect(built).toBe(5);
  });

  it('sorts a kept listing once for the keys it was split by, and again for other keys', async () => {
    const row = (productId: string, o: { allergy?: boolean; shares?: boolean; unlinked?: string[] }) => ({
      productId,
      formulationId: `f-${productId}`,
      allergy: o.allergy ?? false,
      shares: o.shares ?? false,
      unlinkedNames: o.unlinked ?? [],
      unlinkedKeys: o.unlinked ?? [],
    });
    const listing = Object.freeze([
      row('p1', { allergy: true, shares: true }),
      row('p2', { shares: true }),
      row('p3', { unlinked: ['colophonium'] }),
      row('p4', { unlinked: ['lanolin'] }),
      row('p5', {}),
    ]);
    const keys = { allergy: new Set(['colophonium']), reacted: new Set(['lanolin', 'beeswax']) };
    const first = splitListing(listing, keys);
    // A declared allergy outranks sharing; an unlinked label name counts by its key; the listing's order stays.
    expect(first.allergyProductIds).toEqual(['p1', 'p3']);
    expect(first.sharing.map((r) => r.productId)).toEqual(['p2', 'p4']);
    // The same keys in another order: the kept split. Other keys: split again.
    expect(splitListing(listing, { allergy: new Set(['colophonium']), reacted: new Set(['beeswax', 'lanolin']) })).toBe(first);
    const other = splitListing(listing, { allergy: new Set(), reacted: new Set(['lanolin']) });
    expect(other).not.toBe(first);
    expect(other.allergyProductIds).toEqual(['p1']);
    expect(other.sharing.map((r) => r.productId)).toEqual(['p2', 'p4']);
    // A listing nobody keeps is split every time.
    const loose = [...listing];
    expect(splitListing(loose, keys)).not.toBe(splitListing(loose, keys));
  });

  it('pages the shared-only rows as filtering then slicing would, whatever the page', () => {
    const many = Object.freeze(Array.from({ length: 60 }, (_, i) => ({ productId: `p${i % 50}`, formulationId: `f${i}`, allergy: false, shares: true, unlinkedNames: [], unlinkedKeys: [] })));
    const split = splitListing(many, { allergy: new Set(), reacted: new Set(['lanolin']) });
    const core = new Set(['p0', 'p3', 'p7', 'p49', 'not-listed']);
    const expected = many.filter((r) => !core.has(r.productId));
    expect(sharedOnlyRows(split, core)).toEqual({ total: expected.length, rows: expected });
    for (const [from, to] of [[0, 25], [25, 50], [50, 75], [75, 100], [3, 4]] as const) {
      expect(sharedOnlyRows(split, core, { from, to })).toEqual({ total: expected.length, rows: expected.slice(from, to) });
    }
  });

  it("works out the tested products' ids once while the rows are kept", async () => {
    forgetClearanceKept(kept);
    await clearanceOf(juno, ['Quayside acrylic emulsion adhesive']);
    const { tested } = await clearanceOf(juno, ['Quayside acrylic emulsion adhesive']);
    const summary = keptTestedSummary(tested);
    expect(tested.length).toBeGreaterThan(1);
    expect(summary.reactedFormulationIds.size).toBeGreaterThan(0);
    expect(keptTestedSummary(tested)).toBe(summary);
    expect([...summary.formulationIds].sort()).toEqual([...new Set(tested.map((r) => r.formulationId))].sort());
    expect([...summary.productIds].sort()).toEqual([...new Set(tested.map((r) => r.productId))].sort());
    expect([...summary.reactedFormulationIds].sort()).toEqual([...new Set(tested.filter((r) => r.readings.some((x) => ['+', '++', '+++'].includes(x.code))).map((r) => r.formulationId))].sort());
    expect(keptTestedSummary([...tested])).not.toBe(summary);
  });

  it('hands out frozen rows, so no caller can change what the next request gets', async () => {
    forgetClearanceKept(kept);
    await clearanceOf(juno, ['Quayside acrylic emulsion adhesive']);
    const { tested } = await clearanceOf(juno, ['Quayside acrylic emulsion adhesive']);
    expect(tested.length).toBeGreaterThan(0);
    expect(() => {
      (tested[0]!.readings as { code: string }[])[0]!.code = '-';
    }).toThrow(TypeError);
  });
});
