import { describe, expect, it } from 'vitest';
import { ErrorBodySchema } from '#shared/errors.ts';
import { BuildDetailSchema } from '#shared/schemas/builds.ts';
import { api, as, buildRowCounts, createAs, ids, t, useBuildApp, validBuild } from './setup.ts';

useBuildApp();

const fields = (body: unknown) => ErrorBodySchema.parse(body).error.details?.fields ?? {};

describe('POST /api/appliance-builds', () => {
  it('records a build: materials with their lots and formulations, the weigh-out worked out here, five pieces on the shelf', async () => {
    const res = await createAs('artist', validBuild());
    expect(res.status).toBe(201);
    const b = BuildDetailSchema.parse(res.body);
    expect(b.performer.name).toBe('Juno Castellane');
    expect(b.mold.id).toBe(ids.molds.junoHand);
    expect(b.materials.map((m) => [m.role, m.product.name, m.lot.code])).toEqual([
      ['part_a', 'Slipway platinum silicone base', 'SP-2611'],
      ['part_b', 'Slipway platinum silicone base', 'SP-2611'],
      ['softener', 'Slack Tide silicone softener', 'ST-2605'],
      ['pigment', 'Kelpwrack flesh-red silicone pigment', 'KW-2604'],
      ['cap_material', 'Lighthouse vinyl cap plastic', 'LC-2604'],
      ['solvent', 'Mooring acetone', 'MA-2603'],
      ['release_agent', 'Wharfside mold release', 'WR-2602'],
    ]);
    // Clearance keys on a formulation: each material keeps the one its lot is of.
    expect(b.materials[0]!.formulationId).toBe(ids.formulations['SP-2611']);
    // For a 1 : 1 material, 15 g of part A pairs with 15 g of part B, and softener at 100 % equals A + B:
    // 30 g (common practice, no published source). Ten drops of 0.03 g are 0.3 g.
    expect(b.plan.steps.map((s) => [s.ingredient, s.grams])).toEqual([
      ['partA', 15],
      ['softener', 30],
      ['pigment', 0.3],
      ['partB', 15],
    ]);
    expect(b.plan.steps.find((s) => s.ingredient === 'pigment')!.drops).toBe(10);
    // 1 part to 8 parts solvent is 9 parts: 90 ml holds 10 ml of cap material and 80 ml of solvent (common practice, no published source).
    expect(b.coatingVolumes!.capMl).toBeCloseTo(10, 9);
    expect(b.coatingVolumes!.solventMl).toBeCloseTo(80, 9);
    // The demold default when none is given: about 30 minutes for platinum silicone (common practice, no published source).
    expect(b.cureMinutes).toBe(30);
    expect(b.weighed).toEqual({ partA: 15.1, softener: 30, pigment: 0.3, partB: 15 });
    expect(b.pieces.map((p) => [p.number, p.status])).toEqual([1, 2, 3, 4, 5].map((n) => [n, 'on_hand']));
    expect(b.tally).toEqual({ made: 5, used: 0, spoiled: 0, remaining: 5 });
    expect(b.canManage).toBe(true);
    expect(b.canPlan).toBe(false);
    const audit = await t.db.db.selectFrom('audit_log').select(['action', 'production_id']).where('entity_id', '=', b.id).execute();
    expect(audit).toEqual([{ action: 'build.create', production_id: ids.lantern }]);
  });

  it('takes a cure time from the data sheet over the default, and a mold from an earlier production of a performer engaged now', async () => {
    const res = await createAs('head', validBuild({ moldId: ids.molds.ozShoulders, cureMinutes: 45 }));
    expect(res.status).toBe(201);
    const b = BuildDetailSchema.parse(res.body);
    expect(b.cureMinutes).toBe(45);
    expect(b.mold.productionName).toBe('The Glass Orchard');
    expect(b.productionName).toBe('The Lantern Keeper');
  });

  describe('refuses bad input with a clear message under its field, and saves nothing', () => {
    const cases: [string, () => unknown, Record<string, RegExp>][] = [
      ['a ratio of zero', () => validBuild({ mix: { ...validBuild().mix, ratio: { partA: 0, partB: 1 } } }), { 'mix.ratio.partA': /Part A of the ratio must be more than 0/ }],
      ['a negative weighed amount', () => validBuild({ weighed: { partA: -1, softener: null, pigment: null, partB: null } }), { 'weighed.partA': /cannot be negative/ }],
      ['a negative target', () => validBuild({ mix: { ...validBuild().mix, target: { kind: 'total', totalG: -5 } } }), { 'mix.target.totalG': /must be more than 0/ }],
      [
        'a softener over the maker’s stated maximum',
        () => validBuild({ mix: { ...validBuild().mix, softener: { percent: 150, makerMaxPercent: 100 } } }),
        { 'mix.softener.percent': /At most 100 %, the maker's stated maximum/ },
      ],
      [
        'a maximum softener other than the catalogue’s',
        () => validBuild({ mix: { ...validBuild().mix, softener: { percent: 150, makerMaxPercent: 200 } } }),
        { 'mix.softener.makerMaxPercent': /The catalogue gives 100 % as the maker’s maximum for Slipway platinum silicone base/ },
      ],
      ['a ratio other than the catalogue’s', () => validBuild({ mix: { ...validBuild().mix, ratio: { partA: 10, partB: 1 } } }), { 'mix.ratio.partA': /The catalogue gives Slipway platinum silicone base a ratio of 1 : 1/ }],
      [
        'a target below the scale’s resolution',
        () => validBuild({ mix: { ...validBuild().mix, target: { kind: 'partA', partAG: 0.05 } } }),
        { 'mix.target.partAG': /Less than the scale can weigh \(0.1 g\)/ },
      ],
      ['pieces made below zero', () => validBuild({ piecesMade: -2 }), { piecesMade: /cannot be negative/ }],
      ['a date in the future', () => validBuild({ madeOn: '2099-01-01' }), { madeOn: /cannot be dated in the future/ }],
      [
        'a lot of another product',
        () => validBuild({ materials: validBuild().materials.map((m, i) => (i === 0 ? { ...m, lotId: ids.lots['HB-2603']! } : m)) }),
        { 'materials.0.lotId': /Lot HB-2603 belongs to another product/ },
      ],
      [
        'part B of another material than part A',
        () => validBuild({ materials: validBuild().materials.map((m, i) => (i === 1 ? { ...m, productId: ids.products.harbour, lotId: ids.lots['HB-2603']! } : m)) }),
        { 'materials.1.productId': /same material as part A/ },
      ],
      ['softener in the batch but none named', () => validBuild({ materials: validBuild().materials.filter((m) => m.role !== 'softener') }), { materials: /name the softener and its lot/ }],
      ['no part A', () => validBuild({ materials: validBuild().materials.filter((m) => m.role !== 'part_a') }), { materials: /Name the part A/ }],
      ['a positive named as the mold', () => validBuild({ moldId: ids.molds.junoFacePositive }), { moldId: /is a positive, not a mold/ }],
      ['a destroyed mold', () => validBuild({ moldId: ids.molds.halvardTeeth }), { moldId: /no longer held by the archive \(destroyed\)/ }],
    ];
    for (const [what, body, expected] of cases) {
      it(what, async () => {
        const before = await buildRowCounts();
        const res = await createAs('artist', body());
        expect(res.status).toBe(400);
        const got = fields(res.body);
        for (const [field, message] of Object.entries(expected)) expect(got[field]?.join(' '), field).toMatch(message);
        expect(await buildRowCounts()).toEqual(before);
      });
    }

    it('an expired lot (checked on the day the build was made), and a retired one', async () => {
      const db = t.db.db;
      const expired = await db
        .insertInto('product_lots')
        .values({ product_id: ids.products.slipway, formulation_id: ids.formulations['SP-2611']!, code: 'SP-2409', expires_on: '2026-09-30' })
        .returning('id')
        .executeTakeFirstOrThrow();
      await db.updateTable('product_lots').set({ retired_at: new Date() }).where('id', '=', ids.lots['ST-2605']!).execute();
      const before = await buildRowCounts();
      const body = validBuild({ materials: validBuild().materials.map((m, i) => (i === 1 ? { ...m, lotId: expired.id } : m)) });
      const res = await createAs('artist', body);
      expect(res.status).toBe(400);
      expect(fields(res.body)['materials.1.lotId']).toEqual(['Lot SP-2409 expired on 2026-09-30 and cannot be used in an appliance build.']);
      expect(fields(res.body)['materials.2.lotId']).toEqual(['Lot ST-2605 has been retired and cannot be used in an appliance build.']);
      expect(await buildRowCounts()).toEqual(before);
      // The same lot on a build made while it was in date is accepted.
      const earlier = await createAs('artist', { ...body, madeOn: '2026-09-30', materials: body.materials.filter((m) => m.role !== 'softener'), mix: { ...body.mix, softener: null } });
      expect(earlier.status).toBe(201);
    });

    it('every problem at once, so the form shows them all', async () => {
      const res = await createAs('artist', validBuild({ madeOn: '2099-01-01', materials: validBuild().materials.filter((m) => m.role !== 'softener' && m.role !== 'cap_material') }));
      expect(res.status).toBe(400);
      expect(Object.keys(fields(res.body)).sort()).toEqual(['madeOn', 'materials']);
      expect(fields(res.body).materials).toEqual(['The batch has softener in it: name the softener and its lot', 'The coating needs its cap material and lot']);
    });
  });
});

describe('PUT /api/appliance-builds/:id', () => {
  async function created() {
    return BuildDetailSchema.parse((await createAs('artist', validBuild())).body);
  }
  const put = (id: string, body: unknown, who: 'artist' | 'head' = 'artist') => api().put(`/api/appliance-builds/${id}`).set('Cookie', as[who]).send(body as object);
  const edit = (b: { version: number }, over: Record<string, unknown> = {}) => {
    const { productionId: _p, moldId: _m, ...rest } = validBuild();
    return { ...rest, version: b.version, ...over };
  };

  it('corrects the weighed amounts and the materials, and moves the version on', async () => {
    const b = await created();
    const res = await put(b.id, edit(b, { weighed: { partA: 15, softener: 30.2, pigment: 0.3, partB: 15.1 }, materials: validBuild().materials.filter((m) => m.role !== 'release_agent') }));
    expect(res.status).toBe(200);
    const after = BuildDetailSchema.parse(res.body);
    expect(after.version).toBe(b.version + 1);
    expect(after.weighed.softener).toBe(30.2);
    expect(after.materials.map((m) => m.role)).not.toContain('release_agent');
  });

  it('answers a stale version with 409 and changes nothing', async () => {
    const b = await created();
    expect((await put(b.id, edit(b, { notes: 'first' }))).status).toBe(200);
    const stale = await put(b.id, edit(b, { notes: 'second', piecesMade: 9 }));
    expect(stale.status).toBe(409);
    const now = BuildDetailSchema.parse((await api().get(`/api/appliance-builds/${b.id}`).set('Cookie', as.artist)).body);
    expect(now.notes).toBe('first');
    expect(now.tally.made).toBe(5);
    expect(now.version).toBe(b.version + 1);
  });

  it('adds pieces numbered on, removes only pieces on the shelf (highest first), and never fewer than used and spoiled', async () => {
    const b = await created();
    const mark = (n: number, status: 'used' | 'spoiled', version: number) =>
      api().put(`/api/appliance-pieces/${b.pieces[n - 1]!.id}/status`).set('Cookie', as.artist).send({ status, version });
    expect((await mark(2, 'used', 1)).status).toBe(200);
    expect((await mark(5, 'spoiled', 1)).status).toBe(200);
    const more = BuildDetailSchema.parse((await put(b.id, edit(b, { piecesMade: 7 }))).body);
    expect(more.pieces.map((p) => p.number)).toEqual([1, 2, 3, 4, 5, 6, 7]);
    const fewer = BuildDetailSchema.parse((await put(b.id, edit(more, { piecesMade: 3 }))).body);
    expect(fewer.pieces.map((p) => [p.number, p.status])).toEqual([
      [1, 'on_hand'],
      [2, 'used'],
      [5, 'spoiled'],
    ]);
    const before = await buildRowCounts();
    const refused = await put(b.id, edit(fewer, { piecesMade: 1, notes: 'not saved' }));
    expect(refused.status).toBe(400);
    expect(fields(refused.body).piecesMade).toEqual(['2 pieces are used or spoiled already, so at least 2 were made']);
    // Refused inside the transaction: the notes and materials stay as they were.
    expect(await buildRowCounts()).toEqual(before);
    const still = BuildDetailSchema.parse((await api().get(`/api/appliance-builds/${b.id}`).set('Cookie', as.artist)).body);
    expect(still.notes).toBeNull();
    expect(still.version).toBe(fewer.version);
  });

  it('keeps a lot the build already lists once it is retired, but refuses a newly chosen retired lot', async () => {
    const b = await created();
    await t.db.db.updateTable('product_lots').set({ retired_at: new Date() }).where('id', 'in', [ids.lots['SP-2611']!, ids.lots['SP-2606']!]).execute();
    expect((await put(b.id, edit(b, { notes: 'tub used up' }))).status).toBe(200);
    const swapped = validBuild().materials.map((m) => (m.role === 'part_b' ? { ...m, lotId: ids.lots['SP-2606']! } : m));
    const res = await put(b.id, edit({ version: b.version + 1 }, { materials: swapped }));
    expect(res.status).toBe(400);
    expect(fields(res.body)['materials.1.lotId']).toEqual(['Lot SP-2606 has been retired and cannot be used in an appliance build.']);
  });

  it('answers 404 for a build that does not exist', async () => {
    expect((await put('00000000-0000-4000-8000-000000000000', edit({ version: 1 }))).status).toBe(404);
  });
});
