import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { ErrorBodySchema } from '#shared/errors.ts';
import { ProductDetailSchema, ProductPageSchema, type ProductDetail } from '#shared/schemas/catalogue.ts';
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
const productId = async (name: string) => (await t.db.db.selectFrom('products').select('id').where('name', '=', name).executeTakeFirstOrThrow()).id;
const detail = async (id: string, who: Who = 'head'): Promise<ProductDetail> => ProductDetailSchema.parse((await api().get(`/api/products/${id}`).set('Cookie', as[who])).body);
const names = (body: unknown) => ProductPageSchema.parse(body).items.map((i) => i.name);
const count = async (table: 'products' | 'product_formulations' | 'formulation_ingredients' | 'product_lots') =>
  Number((await t.db.db.selectFrom(table).select((eb) => eb.fn.countAll<string>().as('n')).executeTakeFirstOrThrow()).n);

const NEW_PRODUCT = {
  name: 'Lanternfish matte sealer',
  maker: 'Gullhaven Effects Supply',
  category: 'sealer',
  exposure: 'leave_on',
  inciLabel: 'Ingredients: Aqua, Acrylates Copolymer, Alcohol Denat., Glycerin, Moonlight Extract. May contain: CI 77891.',
};

describe('GET /api/products', () => {
  it('pages the whole catalogue by name for every staff role', async () => {
    for (const who of ['head', 'lead', 'artist', 'archivist', 'admin'] as const) {
      const res = await api().get('/api/products?pageSize=5').set('Cookie', as[who]);
      expect(res.status, who).toBe(200);
      const page = ProductPageSchema.parse(res.body);
      expect(page.total).toBe(22);
      expect(page.items).toHaveLength(5);
      expect(page.items[0]!.name).toBe('Breakwater acrylic sealer');
    }
    const last = ProductPageSchema.parse((await api().get('/api/products?pageSize=5&page=5').set('Cookie', as.artist)).body);
    expect(last.items.map((i) => i.name)).toEqual(['Tidewater citrus remover', 'Wharfside mold release']);
  });

  it('refuses a performer and a signed-in person with no role', async () => {
    for (const who of ['performer', 'norole'] as const) expect((await api().get('/api/products').set('Cookie', as[who])).status, who).toBe(403);
  });

  it('searches by name, by maker and by an ingredient of the current formulation', async () => {
    expect(names((await api().get('/api/products?q=harbour').set('Cookie', as.artist)).body)).toEqual(['Harbour Bond silicone adhesive']);
    expect(names((await api().get('/api/products?q=pebblecombe&pageSize=100').set('Cookie', as.artist)).body)).toEqual([
      'Dune barrier cream',
      'Saltmarsh isopropyl myristate remover',
      'Tern gentle skin cleanser',
      'Tidewater citrus remover',
    ]);
    // By synonym: "Rosin" names Colophonium, which only the resin adhesive lists.
    expect(names((await api().get('/api/products?q=rosin').set('Cookie', as.artist)).body)).toEqual(['Shingle resin adhesive']);
    // Harbour Bond's first formulation had Cyclopentasiloxane; its current one does not.
    expect(names((await api().get('/api/products?q=cyclopentasiloxane').set('Cookie', as.artist)).body)).toEqual([]);
  });

  it('filters by category, allergen group and expired lots', async () => {
    expect(names((await api().get('/api/products?category=remover').set('Cookie', as.artist)).body)).toEqual([
      'Pier silicone adhesive remover',
      'Saltmarsh isopropyl myristate remover',
      'Tidewater citrus remover',
    ]);
    expect(names((await api().get('/api/products?group=latex').set('Cookie', as.artist)).body)).toEqual(['Estuary liquid latex', 'Foghorn foam latex system']);
    const expired = ProductPageSchema.parse((await api().get('/api/products?expiredLots=true').set('Cookie', as.artist)).body);
    expect(expired.items.map((i) => [i.name, i.expiredLots, i.usableLots])).toEqual([['Harbour Bond silicone adhesive', 1, 2]]);
    expect(ProductPageSchema.parse((await api().get('/api/products?expiredLots=false').set('Cookie', as.artist)).body).total).toBe(21);
  });

  it('shows counts, groups and the solvent caution per row', async () => {
    const page = ProductPageSchema.parse((await api().get('/api/products?pageSize=100').set('Cookie', as.artist)).body);
    const row = (name: string) => page.items.find((i) => i.name === name)!;
    expect(row('Quayside acrylic emulsion adhesive')).toMatchObject({ ingredientCount: 6, formulationVersion: 1, usableLots: 2, expiredLots: 0, nextExpiry: '2027-06-30', solventCaution: false });
    expect(row('Quayside acrylic emulsion adhesive').groups.sort()).toEqual(['acrylates', 'other', 'preservatives', 'solvents']);
    expect(row('Flotsam prosthetic adhesive')).toMatchObject({ ingredientCount: null, groups: [] });
    expect(row('Harbour Bond silicone adhesive').formulationVersion).toBe(2);
    // Removers, and products whose first (largest) ingredient is a solvent, carry the caution.
    expect(page.items.filter((i) => i.solventCaution).map((i) => i.name).sort()).toEqual([
      'Breakwater acrylic sealer',
      'Lighthouse vinyl cap plastic',
      'Mooring acetone',
      'Pier silicone adhesive remover',
      'Saltmarsh isopropyl myristate remover',
      'Shingle resin adhesive',
      'Tidewater citrus remover',
    ]);
  });

  it('refuses an unknown category or group', async () => {
    const res = await api().get('/api/products?category=glue&group=resins').set('Cookie', as.artist);
    expect(res.status).toBe(400);
    expect(Object.keys(fieldsOf(res.body)).sort()).toEqual(['category', 'group']);
  });
});

describe('GET /api/products/:id', () => {
  it('shows ingredients in label order with their groups, every formulation and the lots with their state', async () => {
    const d = await detail(await productId('Harbour Bond silicone adhesive'), 'archivist');
    expect(d.formulations.map((f) => [f.version, f.current])).toEqual([
      [2, true],
      [1, false],
    ]);
    expect(d.formulations[0]!.ingredients!.map((i) => [i.name, i.ingredient?.group])).toEqual([
      ['Hexamethyldisiloxane', 'silicones'],
      ['Trimethylsiloxysilicate', 'silicones'],
      ['Dimethicone', 'silicones'],
      ['Vinyl Dimethicone', 'silicones'],
    ]);
    expect(d.lots.map((l) => [l.code, l.state, l.formulationVersion])).toEqual([
      ['HB-2411', 'expired', 1],
      ['HB-2603', 'in_date', 2],
      ['HB-2607', 'in_date', 2],
    ]);
    expect(d.safetySheet).toBeNull();
  });

  it('answers 404 for an unknown product', async () => {
    expect((await api().get('/api/products/00000000-0000-4000-8000-000000000000').set('Cookie', as.artist)).status).toBe(404);
  });
});

describe('POST /api/products', () => {
  it('adds a product from a pasted label: names in label order, unknown names kept unlinked, colourants marked', async () => {
    const res = await api().post('/api/products').set('Cookie', as.head).send(NEW_PRODUCT);
    expect(res.status).toBe(201);
    const d = ProductDetailSchema.parse(res.body);
    expect(d).toMatchObject({ name: NEW_PRODUCT.name, category: 'sealer', exposure: 'leave_on', version: 1, solventCaution: false, lots: [] });
    expect(d.formulations).toHaveLength(1);
    expect(d.formulations[0]!.ingredients!.map((i) => [i.name, i.ingredient?.inci ?? null, i.mayContain])).toEqual([
      ['Aqua', 'Aqua', false],
      ['Acrylates Copolymer', 'Acrylates Copolymer', false],
      ['Alcohol Denat.', 'Alcohol Denat.', false],
      ['Glycerin', 'Glycerin', false],
      ['Moonlight Extract', null, false],
      ['CI 77891', 'CI 77891', true],
    ]);
    const audit = await t.db.db.selectFrom('audit_log').select('details').where('action', '=', 'product.create').executeTakeFirstOrThrow();
    expect(audit.details).toMatchObject({ name: NEW_PRODUCT.name, ingredients: { names: 6, unknown: 1 } });
  });

  it('keeps silicone material figures', async () => {
    const res = await api()
      .post('/api/products')
      .set('Cookie', as.lead)
      .send({ name: 'Wavecrest platinum silicone', category: 'silicone', exposure: 'leave_on', densityGPerCm3: 1.08, mixRatio: { partA: 1, partB: 1 }, makerMaxSoftenerPercent: 30, inciLabel: 'Vinyl Dimethicone, Silica' });
    expect(res.status).toBe(201);
    expect(ProductDetailSchema.parse(res.body)).toMatchObject({ densityGPerCm3: 1.08, mixRatio: { partA: 1, partB: 1 }, makerMaxSoftenerPercent: 30 });
    const bad = await api().post('/api/products').set('Cookie', as.lead).send({ ...NEW_PRODUCT, name: 'Bad silicone', densityGPerCm3: 0, mixRatio: { partA: 1, partB: 0 } });
    expect(bad.status).toBe(400);
    expect(Object.keys(fieldsOf(bad.body)).sort()).toEqual(['densityGPerCm3', 'mixRatio.partB']);
  });

  it('accepts a product whose ingredients are not recorded yet, and refuses text with no name in it', async () => {
    const none = await api().post('/api/products').set('Cookie', as.head).send({ ...NEW_PRODUCT, inciLabel: '' });
    expect(none.status).toBe(201);
    expect(ProductDetailSchema.parse(none.body).formulations[0]!.ingredients).toBeNull();
    const empty = await api().post('/api/products').set('Cookie', as.head).send({ ...NEW_PRODUCT, name: 'Another', inciLabel: 'Ingredients: , ;' });
    expect(empty.status).toBe(400);
    expect(fieldsOf(empty.body).inciLabel).toEqual(['No ingredient names found. Paste the list from the label, or leave it empty if it is not known yet.']);
  });

  it('refuses a duplicate name (409, nothing saved) and an unknown category', async () => {
    const before = await count('products');
    const dup = await api().post('/api/products').set('Cookie', as.head).send({ ...NEW_PRODUCT, name: 'harbour bond SILICONE adhesive' });
    expect(dup.status).toBe(409);
    expect(fieldsOf(dup.body).name).toEqual(['Another product already has this name.']);
    const cat = await api().post('/api/products').set('Cookie', as.head).send({ ...NEW_PRODUCT, category: 'glue' });
    expect(cat.status).toBe(400);
    expect(fieldsOf(cat.body).category).toEqual(['Choose a category']);
    expect(await count('products')).toBe(before);
    expect(await count('product_formulations')).toBe(23);
  });

  it('refuses artists, the archivist, the administrator, performers and the role-less', async () => {
    for (const who of ['artist', 'archivist', 'admin', 'performer', 'norole'] as const) {
      expect((await api().post('/api/products').set('Cookie', as[who]).send(NEW_PRODUCT)).status, who).toBe(403);
    }
  });
});

describe('PUT /api/products/:id', () => {
  it('edits at the version read; a stale edit is refused with 409', async () => {
    const id = await productId('Dune barrier cream');
    const body = { name: 'Dune barrier cream', maker: 'Pebblecombe Laboratories', category: 'barrier', exposure: 'rinse_off', version: 1 };
    const ok = await api().put(`/api/products/${id}`).set('Cookie', as.lead).send(body);
    expect(ok.status).toBe(200);
    expect(ProductDetailSchema.parse(ok.body)).toMatchObject({ exposure: 'rinse_off', version: 2 });
    const stale = await api().put(`/api/products/${id}`).set('Cookie', as.head).send({ ...body, exposure: 'leave_on' });
    expect(stale.status).toBe(409);
    expect((await detail(id)).exposure).toBe('rinse_off');
  });

  it('answers 404 before anything else for an unknown product, 403 for an artist', async () => {
    const body = { name: 'X', category: 'other', exposure: 'leave_on', version: 1 };
    expect((await api().put('/api/products/00000000-0000-4000-8000-000000000000').set('Cookie', as.head).send(body)).status).toBe(404);
    expect((await api().put(`/api/products/${await productId('Dune barrier cream')}`).set('Cookie', as.artist).send(body)).status).toBe(403);
  });
});

describe('formulations', () => {
  it('a new formulation becomes current; lots keep the formulation they are of', async () => {
    const id = await productId('Quayside acrylic emulsion adhesive');
    const res = await api().post(`/api/products/${id}/formulations`).set('Cookie', as.head).send({ inciLabel: 'Aqua, Acrylates Copolymer, Phenoxyethanol', note: 'Maker dropped the isothiazolinone', version: 1 });
    expect(res.status).toBe(201);
    const d = ProductDetailSchema.parse(res.body);
    expect(d.formulations.map((f) => [f.version, f.current, f.note])).toEqual([
      [2, true, 'Maker dropped the isothiazolinone'],
      [1, false, null],
    ]);
    expect(d.currentFormulationId).toBe(d.formulations[0]!.id);
    expect(d.lots.every((l) => l.formulationVersion === 1)).toBe(true);
    expect(d.version).toBe(2);
    const stale = await api().post(`/api/products/${id}/formulations`).set('Cookie', as.head).send({ inciLabel: 'Aqua', version: 1 });
    expect(stale.status).toBe(409);
    expect(await count('product_formulations')).toBe(24);
  });

  it('records the ingredients of a formulation that had none, once', async () => {
    const id = await productId('Flotsam prosthetic adhesive');
    const d = await detail(id);
    const f = d.formulations[0]!.id;
    const res = await api().put(`/api/products/${id}/formulations/${f}/ingredients`).set('Cookie', as.lead).send({ inciLabel: 'Ingredients: Acrylates Copolymer, Aqua', version: 1 });
    expect(res.status).toBe(200);
    expect(ProductDetailSchema.parse(res.body).formulations[0]!.ingredients!.map((i) => i.name)).toEqual(['Acrylates Copolymer', 'Aqua']);
    const again = await api().put(`/api/products/${id}/formulations/${f}/ingredients`).set('Cookie', as.lead).send({ inciLabel: 'Aqua', version: 2 });
    expect(again.status).toBe(409);
    expect(ErrorBodySchema.parse(again.body).error.message).toBe('This formulation’s ingredients are already recorded. A changed list is a new formulation.');
    const other = (await detail(await productId('Dune barrier cream'))).formulations[0]!.id;
    expect((await api().put(`/api/products/${id}/formulations/${other}/ingredients`).set('Cookie', as.lead).send({ inciLabel: 'Aqua', version: 2 })).status).toBe(404);
  });
});

describe('lots', () => {
  it('adds a lot to the current formulation, edits it and retires it', async () => {
    const id = await productId('Tern gentle skin cleanser');
    const added = await api().post(`/api/products/${id}/lots`).set('Cookie', as.head).send({ code: 'TC-2612', expiresOn: '2028-12-31' });
    expect(added.status).toBe(201);
    const lot = ProductDetailSchema.parse(added.body).lots.find((l) => l.code === 'TC-2612')!;
    expect(lot).toMatchObject({ state: 'in_date', formulationVersion: 1, version: 1 });
    // Ten days from now: inside the 30-day warning.
    const soon = new Date(Date.now() + 10 * 86_400_000).toISOString().slice(0, 10);
    const edited = await api().put(`/api/products/${id}/lots/${lot.id}`).set('Cookie', as.lead).send({ code: 'TC-2612B', expiresOn: soon, version: 1 });
    expect(ProductDetailSchema.parse(edited.body).lots.find((l) => l.id === lot.id)).toMatchObject({ code: 'TC-2612B', state: 'expiring', version: 2 });
    const stale = await api().put(`/api/products/${id}/lots/${lot.id}`).set('Cookie', as.lead).send({ code: 'TC-X', expiresOn: '2027-01-01', version: 1 });
    expect(stale.status).toBe(409);
    const retired = await api().put(`/api/products/${id}/lots/${lot.id}/retired`).set('Cookie', as.head).send({ retired: true, version: 2 });
    expect(ProductDetailSchema.parse(retired.body).lots.at(-1)).toMatchObject({ id: lot.id, state: 'retired' });
    expect(await t.db.db.selectFrom('audit_log').select('action').where('action', 'like', 'lot.%').orderBy('id').execute()).toEqual([{ action: 'lot.create' }, { action: 'lot.update' }, { action: 'lot.retire' }]);
  });

  it('refuses a duplicate lot code within the product (any case), but not on another product', async () => {
    const id = await productId('Quayside acrylic emulsion adhesive');
    const dup = await api().post(`/api/products/${id}/lots`).set('Cookie', as.head).send({ code: 'qa-2602', expiresOn: '2028-01-31' });
    expect(dup.status).toBe(409);
    expect(fieldsOf(dup.body).code).toEqual(['This product already has a lot with this code.']);
    const elsewhere = await api().post(`/api/products/${await productId('Tern gentle skin cleanser')}/lots`).set('Cookie', as.head).send({ code: 'QA-2602', expiresOn: '2028-01-31' });
    expect(elsewhere.status).toBe(201);
  });

  it('refuses an expiry in an impossible year or on a day that does not exist', async () => {
    const id = await productId('Tern gentle skin cleanser');
    for (const expiresOn of ['20270-01-31', '1899-12-31', '2027-02-30']) {
      const res = await api().post(`/api/products/${id}/lots`).set('Cookie', as.head).send({ code: 'TC-Y', expiresOn });
      expect(res.status, expiresOn).toBe(400);
      expect(fieldsOf(res.body).expiresOn, expiresOn).toBeDefined();
    }
    const far = await api().post(`/api/products/${id}/lots`).set('Cookie', as.head).send({ code: 'TC-Y', expiresOn: '2999-01-31' });
    expect(fieldsOf(far.body).expiresOn).toEqual(['Use an expiry date between the years 2000 and 2100']);
    expect(await count('product_lots')).toBe(26);
  });

  it('refuses a formulation of another product for a lot', async () => {
    const id = await productId('Tern gentle skin cleanser');
    const other = (await detail(await productId('Dune barrier cream'))).formulations[0]!.id;
    const res = await api().post(`/api/products/${id}/lots`).set('Cookie', as.head).send({ code: 'TC-Z', expiresOn: '2028-01-31', formulationId: other });
    expect(res.status).toBe(400);
    expect(fieldsOf(res.body).formulationId).toEqual(['That is not a formulation of this product']);
  });

  it('answers 404 for a lot of another product and 403 for an artist', async () => {
    const tern = await productId('Tern gentle skin cleanser');
    const duneLot = (await detail(await productId('Dune barrier cream'))).lots[0]!;
    expect((await api().put(`/api/products/${tern}/lots/${duneLot.id}`).set('Cookie', as.head).send({ code: 'X', expiresOn: '2028-01-01', version: 1 })).status).toBe(404);
    expect((await api().post(`/api/products/${tern}/lots`).set('Cookie', as.artist).send({ code: 'X', expiresOn: '2028-01-01' })).status).toBe(403);
  });
});
