import { Kysely, PostgresDialect } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { lotRefusal } from '#shared/domain/catalogue.ts';
import { performerClearance } from '#shared/domain/clearance.ts';
import type { Database } from '../../api/db/schema.ts';
import { findLotsForTest } from '../../api/features/catalogue/lot-repo.ts';
import { loadCurrentFormulations, loadFormulationsWithIngredients } from '../../api/features/catalogue/repo.ts';
import { createTestApp, type TestApp } from '../support/app.ts';

/** The functions booking, readings and clearance read the catalogue through. */
let t: TestApp;
let queries = 0;
let counted: Kysely<Database>;

beforeAll(async () => {
  t = await createTestApp();
  // The same pool, with every query counted, so "one query per list" is checked rather than assumed.
  counted = new Kysely<Database>({ dialect: new PostgresDialect({ pool: t.db.pool }), log: (e) => void (e.level === 'query' && queries++) });
});
afterAll(async () => {
  await t?.close();
});

const lotId = async (code: string) => (await t.db.db.selectFrom('product_lots').select('id').where('code', '=', code).executeTakeFirstOrThrow()).id;
const product = async (name: string) => t.db.db.selectFrom('products').select(['id', 'current_formulation_id']).where('name', '=', name).executeTakeFirstOrThrow();

describe('findLotsForTest', () => {
  it('returns product, formulation and expiry for every lot asked for, in one query', async () => {
    const ids = await Promise.all(['HB-2411', 'HB-2603', 'QA-2602', 'TW-2604'].map(lotId));
    queries = 0;
    const lots = await findLotsForTest(counted, [...ids, '00000000-0000-4000-8000-000000000000']);
    expect(queries).toBe(1);
    expect(lots.size).toBe(4);
    const old = lots.get(ids[0]!)!;
    expect(old).toMatchObject({ code: 'HB-2411', productName: 'Harbour Bond silicone adhesive', formulationVersion: 1, expiresOn: '2026-10-31', retiredAt: null });
    expect(old.currentFormulationId).not.toBe(old.formulationId);
    expect(lots.get(ids[1]!)!.formulationId).toBe(old.currentFormulationId);
  });

  it('lets a booking refuse an expired lot, a lot of another product and an unknown lot, and accept a good one', async () => {
    const harbour = await product('Harbour Bond silicone adhesive');
    const ids = await Promise.all(['HB-2411', 'HB-2603', 'QA-2602'].map(lotId));
    const lots = await findLotsForTest(t.db.db, ids);
    const at = new Date('2026-12-02T09:00:00Z');
    expect(lotRefusal(lots.get(ids[0]!), harbour.id, at)).toBe('Lot HB-2411 expired on 2026-10-31 and cannot be used for a test.');
    expect(lotRefusal(lots.get(ids[1]!), harbour.id, at)).toBeNull();
    expect(lotRefusal(lots.get(ids[2]!), harbour.id, at)).toBe('Lot QA-2602 belongs to another product.');
    expect(lotRefusal(lots.get('00000000-0000-4000-8000-000000000000'), harbour.id, at)).toBe('That lot is not in the catalogue.');
  });
});

describe('loadFormulationsWithIngredients', () => {
  it('gives the clearance inputs for many formulations in two queries: label order, each ingredient once, carriers marked', async () => {
    const names = ['Quayside acrylic emulsion adhesive', 'Breakwater acrylic sealer', 'Lighthouse vinyl cap plastic', 'Flotsam prosthetic adhesive'];
    const rows = await Promise.all(names.map(product));
    queries = 0;
    const facts = await loadFormulationsWithIngredients(counted, rows.map((r) => r.current_formulation_id!));
    expect(queries).toBe(2);
    expect(facts.map((f) => f.productName)).toEqual(names);
    expect(facts[0]!.ingredients!.map((i) => [i.inci, i.group, i.trivial])).toEqual([
      ['Aqua', 'other', true],
      ['Acrylates Copolymer', 'acrylates', false],
      ['Propylene Glycol', 'solvents', false],
      ['Glycerin', 'other', true],
      ['Phenoxyethanol', 'preservatives', false],
      ['Methylisothiazolinone', 'preservatives', false],
    ]);
    // A name the vocabulary lacks still counts, under its own key, and is never trivial.
    expect(facts[2]!.ingredients!.find((i) => i.inci === null)).toMatchObject({ name: 'Vinyl Chloride/Vinyl Acetate Copolymer', group: null, trivial: false });
    expect(facts[3]!.ingredients).toBeNull();
  });

  it('feeds the clearance rule: a product with no ingredients stays Untested with "ingredients not recorded"; a shared ingredient gives Caution', async () => {
    const [quayside, breakwater, flotsam] = await loadCurrentFormulations(t.db.db, [
      (await product('Quayside acrylic emulsion adhesive')).id,
      (await product('Breakwater acrylic sealer')).id,
      (await product('Flotsam prosthetic adhesive')).id,
    ]);
    const results = performerClearance({
      formulations: [breakwater!, flotsam!],
      testedFormulations: [quayside!],
      tests: [
        {
          testId: 't1',
          productId: quayside!.productId,
          formulationId: quayside!.formulationId,
          status: 'closed',
          appliedAt: new Date('2026-11-02T09:00:00Z'),
          requiredPointIds: ['d2', 'd4'],
          readings: [
            { pointId: 'd2', code: '+', readAt: new Date('2026-11-04T09:30:00Z') },
            { pointId: 'd4', code: '++', readAt: new Date('2026-11-06T09:00:00Z') },
          ],
        },
      ],
      declaredAllergies: [],
      overrides: [],
      now: new Date('2026-12-02T00:00:00Z'),
    });
    // The deciding reason comes first.
    expect(results.map((r) => [r.productName, r.state, r.reasons[0]!.text])).toEqual([
      ['Breakwater acrylic sealer', 'caution', 'shares an ingredient with a product that reacted'],
      ['Flotsam prosthetic adhesive', 'untested', 'not tested'],
    ]);
    expect(results[1]!.reasons.map((x) => x.text)).toContain('ingredients not recorded');
  });
});
