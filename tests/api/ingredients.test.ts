import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { ErrorBodySchema } from '#shared/errors.ts';
import { IngredientDetailSchema, IngredientPageSchema, LabelMatchesSchema, ProductDetailSchema } from '#shared/schemas/catalogue.ts';
import { createTestApp, type TestApp } from '../support/app.ts';
import { sessions, type Who } from '../fixtures/performers.ts';
import { snapshotData } from '../fixtures/snapshot.ts';

let t: TestApp;
let as: Record<Who, string>;
let restore: () => Promise<void>;

beforeAll(async () => {
  t = await createTestApp();
  as = await sessions(t);
  restore = await snapshotData(t);
});
beforeEach(async () => {
  await restore();
});
afterAll(async () => {
  await t?.close();
});

const api = () => request(t.app);
const fieldsOf = (body: unknown) => ErrorBodySchema.parse(body).error.details?.fields ?? {};
const ingredientId = async (inci: string) => (await t.db.db.selectFrom('ingredients').select('id').where('inci', '=', inci).executeTakeFirstOrThrow()).id;
const audits = async (action: string) => (await t.db.db.selectFrom('audit_log').select('id').where('action', '=', action).execute()).length;

const NEW = { inci: 'Hydroxypropyl Methacrylate', synonyms: ['HPMA', '2-Hydroxypropyl Methacrylate'], cas: '27813-02-1', group: 'acrylates', trivial: false };

describe('GET /api/ingredients', () => {
  it('lists the vocabulary by INCI name for every staff role', async () => {
    for (const who of ['head', 'lead', 'artist', 'archivist', 'admin'] as const) {
      const res = await api().get('/api/ingredients?pageSize=100').set('Cookie', as[who]);
      expect(res.status, who).toBe(200);
      const page = IngredientPageSchema.parse(res.body);
      expect(page.total).toBeGreaterThan(90);
      const names = page.items.map((i) => i.inci.toLowerCase());
      expect(names).toEqual([...names].sort());
    }
  });

  it('refuses a performer and a signed-in person with no role', async () => {
    for (const who of ['performer', 'norole'] as const) {
      const res = await api().get('/api/ingredients').set('Cookie', as[who]);
      expect(res.status, who).toBe(403);
      expect(ErrorBodySchema.parse(res.body).error.message).toBe('You do not have permission to see the product catalogue.');
    }
  });

  it('finds an ingredient by a synonym, by CAS number and by group', async () => {
    const bySynonym = IngredientPageSchema.parse((await api().get('/api/ingredients?q=colophony').set('Cookie', as.artist)).body);
    expect(bySynonym.items.map((i) => i.inci)).toEqual(['Colophonium']);
    // CAS 67-63-0 is isopropyl alcohol (from memory)
    const byCas = IngredientPageSchema.parse((await api().get('/api/ingredients?q=67-63-0').set('Cookie', as.artist)).body);
    expect(byCas.items.map((i) => i.inci)).toEqual(['Isopropyl Alcohol']);
    const rosin = IngredientPageSchema.parse((await api().get('/api/ingredients?group=rosin').set('Cookie', as.artist)).body);
    expect(rosin.items.map((i) => i.inci).sort()).toEqual(['Colophonium', 'Glyceryl Rosinate']);
  });

  it('shows which products list an ingredient', async () => {
    const res = await api().get(`/api/ingredients/${await ingredientId('Acrylates Copolymer')}`).set('Cookie', as.archivist);
    const d = IngredientDetailSchema.parse(res.body);
    expect(d.products.map((p) => p.name)).toEqual(['Breakwater acrylic sealer', 'Pebble alcohol-activated palette', 'Quayside acrylic emulsion adhesive']);
    expect(d.productCount).toBe(3);
  });
});

describe('POST /api/ingredients', () => {
  it('lets the head and the lead add an ingredient, audited', async () => {
    const res = await api().post('/api/ingredients').set('Cookie', as.head).send(NEW);
    expect(res.status).toBe(201);
    expect(IngredientDetailSchema.parse(res.body)).toMatchObject({ inci: NEW.inci, synonyms: NEW.synonyms, cas: NEW.cas, group: 'acrylates', version: 1 });
    expect(await audits('ingredient.create')).toBe(1);
    const lead = await api().post('/api/ingredients').set('Cookie', as.lead).send({ ...NEW, inci: 'Tosylamide/Formaldehyde Resin', synonyms: [], cas: null, group: 'other' });
    expect(lead.status).toBe(201);
  });

  it('refuses artists, the archivist, the administrator, performers and the role-less', async () => {
    for (const who of ['artist', 'archivist', 'admin', 'performer', 'norole'] as const) {
      const res = await api().post('/api/ingredients').set('Cookie', as[who]).send(NEW);
      expect(res.status, who).toBe(403);
    }
    expect(await audits('ingredient.create')).toBe(0);
  });

  it('refuses an unknown allergen group and a CAS number whose check digit is wrong', async () => {
    const group = await api().post('/api/ingredients').set('Cookie', as.head).send({ ...NEW, group: 'resins' });
    expect(group.status).toBe(400);
    expect(fieldsOf(group.body).group).toEqual(['Choose an allergen group']);
    // CAS check digit (CAS Registry rule, from memory): for 67-63-?, 3·1 + 6·2 + 7·3 + 6·4 = 60, so only 67-63-0 checks out
    const cas = await api().post('/api/ingredients').set('Cookie', as.head).send({ ...NEW, cas: '67-63-1' });
    expect(cas.status).toBe(400);
    expect(fieldsOf(cas.body).cas).toEqual(['Not a valid CAS number (form 1234-56-7, with a matching check digit)']);
  });

  it('refuses a duplicate INCI name, however it is written, and a name or CAS number another ingredient holds (409)', async () => {
    const dup = await api().post('/api/ingredients').set('Cookie', as.head).send({ ...NEW, inci: 'isopropyl  ALCOHOL', synonyms: [], cas: null });
    expect(dup.status).toBe(409);
    expect(fieldsOf(dup.body).inci).toEqual(['This name is already in the vocabulary, as Isopropyl Alcohol.']);
    const synonym = await api().post('/api/ingredients').set('Cookie', as.head).send({ ...NEW, synonyms: ['HPMA', 'Rosin'] });
    expect(synonym.status).toBe(409);
    expect(fieldsOf(synonym.body)['synonyms.1']).toEqual(['“Rosin” already names Colophonium.']);
    const cas = await api().post('/api/ingredients').set('Cookie', as.head).send({ ...NEW, cas: '67-63-0' });
    expect(cas.status).toBe(409);
    expect(fieldsOf(cas.body).cas).toEqual(['This CAS number already belongs to Isopropyl Alcohol.']);
    expect(await t.db.db.selectFrom('ingredients').select('id').where('inci', '=', NEW.inci).execute()).toEqual([]);
  });

  it('links label names that were waiting for it in saved formulations', async () => {
    const lighthouse = await t.db.db.selectFrom('products').select('id').where('name', '=', 'Lighthouse vinyl cap plastic').executeTakeFirstOrThrow();
    const before = ProductDetailSchema.parse((await api().get(`/api/products/${lighthouse.id}`).set('Cookie', as.head)).body);
    expect(before.formulations[0]!.ingredients!.find((i) => i.name === 'Vinyl Chloride/Vinyl Acetate Copolymer')!.ingredient).toBeNull();
    const res = await api().post('/api/ingredients').set('Cookie', as.head).send({ inci: 'Vinyl Chloride/Vinyl Acetate Copolymer', synonyms: ['VC/VA Copolymer'], cas: null, group: 'other', trivial: false });
    expect(res.status).toBe(201);
    const after = ProductDetailSchema.parse((await api().get(`/api/products/${lighthouse.id}`).set('Cookie', as.head)).body);
    expect(after.formulations[0]!.ingredients!.find((i) => i.name === 'Vinyl Chloride/Vinyl Acetate Copolymer')!.ingredient?.inci).toBe('Vinyl Chloride/Vinyl Acetate Copolymer');
  });
});

describe('PUT /api/ingredients/:id', () => {
  it('edits at the version read, and refuses a stale edit with 409', async () => {
    const id = await ingredientId('Ethyl Acetate');
    const first = await api().put(`/api/ingredients/${id}`).set('Cookie', as.lead).send({ ingredient: { inci: 'Ethyl Acetate', synonyms: ['Acetic Ether'], cas: '141-78-6', group: 'solvents', trivial: false }, version: 1 });
    expect(first.status).toBe(200);
    expect(IngredientDetailSchema.parse(first.body)).toMatchObject({ synonyms: ['Acetic Ether'], version: 2 });
    const stale = await api().put(`/api/ingredients/${id}`).set('Cookie', as.head).send({ ingredient: { inci: 'Ethyl Acetate', synonyms: [], cas: null, group: 'solvents', trivial: true }, version: 1 });
    expect(stale.status).toBe(409);
    expect(ErrorBodySchema.parse(stale.body).error.details).toMatchObject({ currentVersion: 2 });
    const row = await t.db.db.selectFrom('ingredients').select(['synonyms', 'trivial']).where('id', '=', id).executeTakeFirstOrThrow();
    expect(row).toEqual({ synonyms: ['Acetic Ether'], trivial: false });
  });

  it('answers 404 for an unknown ingredient and 403 for an artist', async () => {
    const body = { ingredient: { inci: 'Nothing', synonyms: [], cas: null, group: 'other', trivial: false }, version: 1 };
    expect((await api().put('/api/ingredients/00000000-0000-4000-8000-000000000000').set('Cookie', as.head).send(body)).status).toBe(404);
    expect((await api().put(`/api/ingredients/${await ingredientId('Talc')}`).set('Cookie', as.artist).send(body)).status).toBe(403);
  });
});

describe('POST /api/ingredients/match', () => {
  it('matches a pasted label in label order, marks unknown names, shade-range colourants and repeats', async () => {
    const label = 'Ingredients: Aqua (Water), Colophony, Glycerin, Water, Mystery Resin 7. May contain: CI 77491.';
    const res = await api().post('/api/ingredients/match').set('Cookie', as.artist).send({ label });
    expect(res.status).toBe(200);
    const { entries } = LabelMatchesSchema.parse(res.body);
    expect(entries.map((e) => [e.name, e.ingredient?.inci ?? null, e.mayContain, e.duplicate])).toEqual([
      ['Aqua (Water)', 'Aqua', false, false],
      ['Colophony', 'Colophonium', false, false],
      ['Glycerin', 'Glycerin', false, false],
      ['Water', 'Aqua', false, true],
      ['Mystery Resin 7', null, false, false],
      ['CI 77491', 'CI 77491', true, false],
    ]);
    expect(entries[1]!.ingredient).toMatchObject({ group: 'rosin', trivial: false });
  });

  it('refuses a performer', async () => {
    expect((await api().post('/api/ingredients/match').set('Cookie', as.performer).send({ label: 'Aqua' })).status).toBe(403);
  });
});
