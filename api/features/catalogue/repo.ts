import { type RawBuilder, sql, type SqlBool } from 'kysely';
import type { ExposureType, ProductCategory } from '#shared/domain/catalogue.ts';
import type { FormulationFacts } from '#shared/domain/clearance.ts';
import { normaliseInciName, type AllergenGroup, type IngredientRef } from '#shared/domain/ingredients.ts';
import type { ProductFields, ProductListQuery } from '#shared/schemas/catalogue.ts';
import { type Db, idArray } from '../../db/index.ts';

/*
 * Products and their formulations. Every list function answers a whole list in one or two queries,
 * never one per product.
 */

export interface ProductRow extends ProductFields {
  id: string;
  currentFormulationId: string | null;
  sdsFileId: string | null;
  sdsFileName: string | null;
  sdsUploadedAt: Date | null;
  sdsUploadedBy: string | null;
  sdsByteSize: number | null;
  version: number;
  updatedAt: string;
}

const PRODUCT_COLUMNS = [
  'p.id',
  'p.name',
  'p.maker',
  'p.category',
  'p.exposure',
  'p.density_g_per_cm3',
  'p.mix_ratio_a',
  'p.mix_ratio_b',
  'p.max_softener_percent',
  'p.current_formulation_id',
  'p.sds_file_id',
  'p.sds_file_name',
  'p.sds_uploaded_at',
  'u.display_name as sds_uploader',
  'sf.byte_size as sds_byte_size',
  'p.version',
  'p.updated_at',
] as const;

function productQuery(db: Db) {
  return db.selectFrom('products as p').leftJoin('users as u', 'u.id', 'p.sds_uploaded_by').leftJoin('files as sf', 'sf.id', 'p.sds_file_id').select(PRODUCT_COLUMNS);
}
type ProductSelected = Awaited<ReturnType<ReturnType<typeof productQuery>['executeTakeFirstOrThrow']>>;

function toProduct(r: ProductSelected): ProductRow {
  return {
    id: r.id,
    name: r.name,
    maker: r.maker,
    category: r.category,
    exposure: r.exposure,
    densityGPerCm3: r.density_g_per_cm3,
    mixRatio: r.mix_ratio_a !== null && r.mix_ratio_b !== null ? { partA: r.mix_ratio_a, partB: r.mix_ratio_b } : null,
    makerMaxSoftenerPercent: r.max_softener_percent,
    currentFormulationId: r.current_formulation_id,
    sdsFileId: r.sds_file_id,
    sdsFileName: r.sds_file_name,
    sdsUploadedAt: r.sds_uploaded_at,
    sdsUploadedBy: r.sds_uploader,
    sdsByteSize: r.sds_byte_size,
    version: r.version,
    updatedAt: new Date(r.updated_at).toISOString(),
  };
}

function fieldColumns(f: ProductFields) {
  return {
    name: f.name,
    maker: f.maker,
    category: f.category,
    exposure: f.exposure,
    density_g_per_cm3: f.densityGPerCm3,
    mix_ratio_a: f.mixRatio?.partA ?? null,
    mix_ratio_b: f.mixRatio?.partB ?? null,
    max_softener_percent: f.makerMaxSoftenerPercent,
  };
}

export async function findProduct(db: Db, id: string): Promise<ProductRow | null> {
  const r = await productQuery(db).where('p.id', '=', id).executeTakeFirst();
  return r ? toProduct(r) : null;
}

/** What another feature shows of a product and uses of its material figures: many products, one query. */
export interface ProductSummary {
  id: string;
  name: string;
  category: ProductCategory;
  densityGPerCm3: number | null;
  mixRatio: { partA: number; partB: number } | null;
  makerMaxSoftenerPercent: number | null;
  /** Where its safety data sheet downloads from; null when none is on file. */
  safetySheetUrl: string | null;
}

export async function findProductSummaries(db: Db, ids: readonly string[]): Promise<Map<string, ProductSummary>> {
  const unique = [...new Set(ids)];
  if (unique.length === 0) return new Map();
  const rows = await productQuery(db).where('p.id', 'in', unique).execute();
  return new Map(
    rows.map(toProduct).map((p) => [
      p.id,
      {
        id: p.id,
        name: p.name,
        category: p.category,
        densityGPerCm3: p.densityGPerCm3,
        mixRatio: p.mixRatio,
        makerMaxSoftenerPercent: p.makerMaxSoftenerPercent,
        safetySheetUrl: p.sdsFileId ? `/api/products/${p.id}/safety-data-sheet` : null,
      },
    ]),
  );
}

/** Locks a product for a change to it, its formulations, lots or safety data sheet. */
export async function lockProduct(db: Db, id: string): Promise<ProductRow | null> {
  const r = await productQuery(db).where('p.id', '=', id).forUpdate('p').executeTakeFirst();
  return r ? toProduct(r) : null;
}

export async function insertProduct(db: Db, f: ProductFields, createdBy: string | null): Promise<string> {
  const r = await db.insertInto('products').values({ ...fieldColumns(f), created_by: createdBy }).returning('id').executeTakeFirstOrThrow();
  return r.id;
}

/** Writes the product's own fields if it is still at `version`. */
export async function updateProductAtVersion(db: Db, id: string, f: ProductFields, version: number): Promise<boolean> {
  return touchProductAtVersion(db, id, version, fieldColumns(f));
}

/** Moves the product to its next version with these column changes (a new formulation, a safety data sheet). */
export async function touchProductAtVersion(
  db: Db,
  id: string,
  version: number,
  set: Partial<{ current_formulation_id: string; sds_file_id: string; sds_file_name: string; sds_uploaded_at: Date; sds_uploaded_by: string }> & Partial<ReturnType<typeof fieldColumns>> = {},
): Promise<boolean> {
  const res = await db
    .updateTable('products')
    .set({ ...set, version: sql`version + 1`, updated_at: sql`now()` })
    .where('id', '=', id)
    .where('version', '=', version)
    .executeTakeFirst();
  return Number(res.numUpdatedRows) === 1;
}

/** A product created in this transaction gets its first formulation as current, without a version step. */
export async function setFirstFormulation(db: Db, productId: string, formulationId: string): Promise<void> {
  await db.updateTable('products').set({ current_formulation_id: formulationId }).where('id', '=', productId).where('current_formulation_id', 'is', null).execute();
}

// ---- formulations

export interface FormulationRow {
  id: string;
  productId: string;
  version: number;
  inciLabel: string | null;
  note: string | null;
  createdAt: string;
  createdBy: string | null;
}

export interface FormulationIngredientRow {
  position: number;
  name: string;
  mayContain: boolean;
  ingredient: { id: string; inci: string; group: AllergenGroup; trivial: boolean } | null;
}

/** Every formulation of a product, newest first. */
export async function listFormulations(db: Db, productId: string): Promise<FormulationRow[]> {
  const rows = await db
    .selectFrom('product_formulations as f')
    .leftJoin('users as u', 'u.id', 'f.created_by')
    .select(['f.id', 'f.product_id', 'f.version', 'f.inci_label', 'f.note', 'f.created_at', 'u.display_name'])
    .where('f.product_id', '=', productId)
    .orderBy('f.version', 'desc')
    .execute();
  return rows.map((r) => ({ id: r.id, productId: r.product_id, version: r.version, inciLabel: r.inci_label, note: r.note, createdAt: new Date(r.created_at).toISOString(), createdBy: r.display_name }));
}

/** The ingredient rows of many formulations, in label order, from one query. */
export async function listFormulationIngredients(db: Db, formulationIds: readonly string[]): Promise<Map<string, FormulationIngredientRow[]>> {
  const out = new Map<string, FormulationIngredientRow[]>();
  if (formulationIds.length === 0) return out;
  const rows = await db
    .selectFrom('formulation_ingredients as fi')
    .leftJoin('ingredients as i', 'i.id', 'fi.ingredient_id')
    .select(['fi.formulation_id', 'fi.position', 'fi.label_name', 'fi.may_contain', 'i.id', 'i.inci', 'i.allergen_group', 'i.trivial'])
    .where(sql<SqlBool>`fi.formulation_id = any(${idArray(formulationIds)})`)
    .orderBy('fi.formulation_id')
    .orderBy('fi.position')
    .execute();
  for (const r of rows) {
    const list = out.get(r.formulation_id) ?? out.set(r.formulation_id, []).get(r.formulation_id)!;
    list.push({
      position: r.position,
      name: r.label_name,
      mayContain: r.may_contain,
      ingredient: r.id && r.inci && r.allergen_group ? { id: r.id, inci: r.inci, group: r.allergen_group, trivial: r.trivial ?? false } : null,
    });
  }
  return out;
}

export async function nextFormulationVersion(db: Db, productId: string): Promise<number> {
  const r = await db.selectFrom('product_formulations').select(sql<number>`coalesce(max(version), 0)::int + 1`.as('next')).where('product_id', '=', productId).executeTakeFirstOrThrow();
  return r.next;
}

export async function insertFormulation(db: Db, f: { productId: string; version: number; inciLabel: string | null; note: string | null; createdBy: string | null }): Promise<string> {
  const r = await db
    .insertInto('product_formulations')
    .values({ product_id: f.productId, version: f.version, inci_label: f.inciLabel, note: f.note, created_by: f.createdBy })
    .returning('id')
    .executeTakeFirstOrThrow();
  return r.id;
}

/** Records a formulation's list once: only while nothing is recorded; false otherwise. */
export async function setFormulationLabelIfUnrecorded(db: Db, formulationId: string, productId: string, inciLabel: string): Promise<boolean> {
  const res = await db
    .updateTable('product_formulations')
    .set({ inci_label: inciLabel })
    .where('id', '=', formulationId)
    .where('product_id', '=', productId)
    .where('inci_label', 'is', null)
    .executeTakeFirst();
  return Number(res.numUpdatedRows) === 1;
}

export async function insertFormulationIngredients(db: Db, formulationId: string, entries: readonly { name: string; mayContain: boolean; ingredientId: string | null }[]): Promise<void> {
  if (entries.length === 0) return;
  await db
    .insertInto('formulation_ingredients')
    .values(entries.map((e, position) => ({ formulation_id: formulationId, position, label_name: e.name, may_contain: e.mayContain, ingredient_id: e.ingredientId })))
    .execute();
}

/** Each ingredient once, in label order, as `resolveIngredientList` gives it. */
function onceEach(refs: readonly IngredientRef[]): IngredientRef[] {
  const seen = new Set<string>();
  return refs.filter((r) => {
    if (!r.key || seen.has(r.key)) return false;
    seen.add(r.key);
    return true;
  });
}

/** `refOf` with each distinct name normalised once per call (a catalogue repeats a few hundred names thousands of times). */
function refMaker(): (row: FormulationIngredientRow) => IngredientRef {
  const keys = new Map<string, string>();
  const keyOf = (name: string) => keys.get(name) ?? keys.set(name, normaliseInciName(name)).get(name)!;
  return (row) => {
    if (row.ingredient) return { key: keyOf(row.ingredient.inci), name: row.name, inci: row.ingredient.inci, group: row.ingredient.group, trivial: row.ingredient.trivial };
    return { key: keyOf(row.name), name: row.name, inci: null, group: null, trivial: false };
  };
}

/**
 * Formulations as the clearance rule reads them (`FormulationFacts` of shared/domain/clearance.ts):
 * product id and name, and the ingredients in label order, each once; `ingredients` is null when the
 * list was never recorded. Two queries for any number of formulations; unknown ids are left out.
 */
export async function loadFormulationsWithIngredients(db: Db, formulationIds: readonly string[]): Promise<FormulationFacts[]> {
  const ids = [...new Set(formulationIds)];
  if (ids.length === 0) return [];
  const [heads, rows] = await Promise.all([
    db
      .selectFrom('product_formulations as f')
      .innerJoin('products as p', 'p.id', 'f.product_id')
      .select(['f.id', 'f.product_id', 'f.inci_label', 'p.name'])
      .where(sql<SqlBool>`f.id = any(${idArray(ids)})`)
      .execute(),
    listFormulationIngredients(db, ids),
  ]);
  const refOf = refMaker();
  const byId = new Map(
    heads.map((h) => {
      const refs = h.inci_label === null ? null : onceEach((rows.get(h.id) ?? []).map(refOf));
      return [h.id, { formulationId: h.id, productId: h.product_id, productName: h.name, ingredients: refs }] as const;
    }),
  );
  return ids.flatMap((id) => (byId.has(id) ? [byId.get(id)!] : []));
}

/** The current formulation of each product asked for, as `loadFormulationsWithIngredients` gives it. */
export async function loadCurrentFormulations(db: Db, productIds: readonly string[]): Promise<FormulationFacts[]> {
  if (productIds.length === 0) return [];
  const rows = await db.selectFrom('products').select('current_formulation_id').where('id', 'in', [...new Set(productIds)]).where('current_formulation_id', 'is not', null).execute();
  return loadFormulationsWithIngredients(
    db,
    rows.map((r) => r.current_formulation_id!),
  );
}

// ---- the list

function likePattern(q: string): string {
  return `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

/** A lot is expired from the day after its last day (UTC), as `lotExpired` in shared/domain/catalogue.ts says. */
const TODAY_UTC = sql`(now() at time zone 'utc')::date`;

function listConditions(q: ProductListQuery): RawBuilder<boolean> {
  const conds: RawBuilder<unknown>[] = [sql`true`];
  if (q.q) {
    const p = likePattern(q.q);
    conds.push(sql`(p.name ilike ${p} or p.maker ilike ${p} or exists (
      select 1 from formulation_ingredients fi left join ingredients i on i.id = fi.ingredient_id
      where fi.formulation_id = p.current_formulation_id
        and (fi.label_name ilike ${p} or i.inci ilike ${p} or exists (select 1 from unnest(i.synonyms) s where s ilike ${p}))))`);
  }
  if (q.category) conds.push(sql`p.category = ${q.category}`);
  if (q.group) {
    conds.push(sql`exists (select 1 from formulation_ingredients fi join ingredients i on i.id = fi.ingredient_id where fi.formulation_id = p.current_formulation_id and i.allergen_group = ${q.group})`);
  }
  if (q.expiredLots === 'true') conds.push(sql`exists (select 1 from product_lots l where l.product_id = p.id and l.retired_at is null and l.expires_on < ${TODAY_UTC})`);
  if (q.expiredLots === 'false') conds.push(sql`not exists (select 1 from product_lots l where l.product_id = p.id and l.retired_at is null and l.expires_on < ${TODAY_UTC})`);
  return sql<boolean>`${sql.join(conds, sql` and `)}`;
}

export interface ProductListRow {
  id: string;
  name: string;
  maker: string | null;
  category: ProductCategory;
  exposure: ExposureType;
  formulationVersion: number | null;
  recorded: boolean;
  /** The current formulation's ingredients in label order, for the count, the groups and the solvent rule. */
  ingredients: { group: AllergenGroup | null; trivial: boolean }[];
  usableLots: number;
  expiredLots: number;
  nextExpiry: string | null;
  hasSafetySheet: boolean;
}

/** One page of the catalogue, with lot counts and the current formulation's ingredient groups, in one query and its count. */
export async function listProducts(db: Db, q: ProductListQuery): Promise<{ items: ProductListRow[]; total: number }> {
  const where = listConditions(q);
  const dir = sql.raw(q.dir === 'desc' ? 'desc' : 'asc');
  const key = q.sort === 'maker' ? sql`lower(coalesce(p.maker, ''))` : q.sort === 'category' ? sql`p.category` : sql`lower(p.name)`;
  const rows = await db
    .selectFrom('products as p')
    .leftJoin('product_formulations as f', 'f.id', 'p.current_formulation_id')
    .select([
      'p.id',
      'p.name',
      'p.maker',
      'p.category',
      'p.exposure',
      'f.version as formulation_version',
      'f.inci_label',
      sql<boolean>`p.sds_file_id is not null`.as('has_sds'),
      sql<{ group: AllergenGroup | null; trivial: boolean }[]>`coalesce((select json_agg(json_build_object('group', i.allergen_group, 'trivial', coalesce(i.trivial, false)) order by fi.position)
        from formulation_ingredients fi left join ingredients i on i.id = fi.ingredient_id where fi.formulation_id = p.current_formulation_id), '[]'::json)`.as('ingredients'),
      sql<number>`(select count(*)::int from product_lots l where l.product_id = p.id and l.retired_at is null and l.expires_on >= ${TODAY_UTC})`.as('usable_lots'),
      sql<number>`(select count(*)::int from product_lots l where l.product_id = p.id and l.retired_at is null and l.expires_on < ${TODAY_UTC})`.as('expired_lots'),
      sql<string | null>`(select min(l.expires_on)::text from product_lots l where l.product_id = p.id and l.retired_at is null and l.expires_on >= ${TODAY_UTC})`.as('next_expiry'),
    ])
    .where(where)
    .orderBy(sql`${key} ${dir}, p.id ${dir}`)
    .limit(q.pageSize)
    .offset((q.page - 1) * q.pageSize)
    .execute();
  const count = await db.selectFrom('products as p').select(sql<number>`count(*)::int`.as('n')).where(where).executeTakeFirstOrThrow();
  return {
    total: count.n,
    items: rows.map((r) => ({
      id: r.id,
      name: r.name,
      maker: r.maker,
      category: r.category,
      exposure: r.exposure,
      formulationVersion: r.formulation_version,
      recorded: r.inci_label !== null,
      ingredients: r.ingredients,
      usableLots: r.usable_lots,
      expiredLots: r.expired_lots,
      nextExpiry: r.next_expiry,
      hasSafetySheet: r.has_sds,
    })),
  };
}
