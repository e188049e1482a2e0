import { sql } from 'kysely';
import type { AllergenGroup, Ingredient } from '#shared/domain/ingredients.ts';
import type { IngredientListQuery, IngredientRecord } from '#shared/schemas/catalogue.ts';
import type { Db } from '../../db/index.ts';

/** A vocabulary entry with its row id and version. */
export interface IngredientRow extends Ingredient {
  id: string;
  synonyms: string[];
  version: number;
  updatedAt: string;
}

const COLUMNS = ['i.id', 'i.inci', 'i.synonyms', 'i.cas', 'i.allergen_group', 'i.trivial', 'i.version', 'i.updated_at'] as const;

type Selected = { id: string; inci: string; synonyms: string[]; cas: string | null; allergen_group: AllergenGroup; trivial: boolean; version: number; updated_at: Date };

function toRow(r: Selected): IngredientRow {
  return { id: r.id, inci: r.inci, synonyms: r.synonyms, cas: r.cas, group: r.allergen_group, trivial: r.trivial, version: r.version, updatedAt: new Date(r.updated_at).toISOString() };
}

function likePattern(q: string): string {
  return `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

/** Products whose current formulation lists the ingredient. */
const PRODUCT_COUNT = sql<number>`(select count(distinct p.id)::int from products p join formulation_ingredients fi on fi.formulation_id = p.current_formulation_id where fi.ingredient_id = i.id)`;

/** One page of the vocabulary, by INCI name; the search looks at INCI names, synonyms and CAS numbers. */
export async function listIngredients(db: Db, q: IngredientListQuery): Promise<{ items: IngredientRecord[]; total: number }> {
  let base = db.selectFrom('ingredients as i');
  if (q.q) {
    const p = likePattern(q.q);
    base = base.where(sql<boolean>`(i.inci ilike ${p} or i.cas = ${q.q} or exists (select 1 from unnest(i.synonyms) s where s ilike ${p}))`);
  }
  if (q.group) base = base.where('i.allergen_group', '=', q.group);
  const rows = await base
    .select([...COLUMNS, PRODUCT_COUNT.as('product_count')])
    .orderBy(sql`lower(i.inci)`)
    .orderBy('i.id')
    .limit(q.pageSize)
    .offset((q.page - 1) * q.pageSize)
    .execute();
  const count = await base.select(sql<number>`count(*)::int`.as('n')).executeTakeFirstOrThrow();
  return { total: count.n, items: rows.map((r) => ({ ...toRow(r), productCount: r.product_count })) };
}

export async function findIngredient(db: Db, id: string): Promise<(IngredientRow & { productCount: number }) | null> {
  const r = await db.selectFrom('ingredients as i').select([...COLUMNS, PRODUCT_COUNT.as('product_count')]).where('i.id', '=', id).executeTakeFirst();
  return r ? { ...toRow(r), productCount: r.product_count } : null;
}

/** Locks one entry for an edit. */
export async function lockIngredient(db: Db, id: string): Promise<IngredientRow | null> {
  const r = await db.selectFrom('ingredients as i').select(COLUMNS).where('i.id', '=', id).forUpdate().executeTakeFirst();
  return r ? toRow(r) : null;
}

/** Products whose current formulation lists the ingredient, by name. */
export async function listProductsUsingIngredient(db: Db, id: string): Promise<{ id: string; name: string }[]> {
  return db
    .selectFrom('products as p')
    .innerJoin('formulation_ingredients as fi', 'fi.formulation_id', 'p.current_formulation_id')
    .select(['p.id', 'p.name'])
    .where('fi.ingredient_id', '=', id)
    .groupBy(['p.id', 'p.name'])
    .orderBy(sql`lower(p.name)`)
    .execute();
}

/**
 * Serialises changes to the vocabulary, so two edits cannot both claim one name between the
 * uniqueness check and the write.
 */
export async function lockVocabulary(db: Db): Promise<void> {
  await sql`select pg_advisory_xact_lock(727101)`.execute(db);
}

/** Entries other than `exceptId` holding any of these matching keys, with the keys they hold. */
export async function findIngredientsHoldingKeys(db: Db, keys: readonly string[], exceptId: string | null): Promise<{ id: string; inci: string; nameKeys: string[] }[]> {
  if (keys.length === 0) return [];
  let q = db.selectFrom('ingredients').select(['id', 'inci', 'name_keys']).where(sql<boolean>`name_keys && ${sql.val([...keys])}::text[]`);
  if (exceptId) q = q.where('id', '<>', exceptId);
  return (await q.execute()).map((r) => ({ id: r.id, inci: r.inci, nameKeys: r.name_keys }));
}

export async function findIngredientByCas(db: Db, cas: string, exceptId: string | null): Promise<{ id: string; inci: string } | null> {
  let q = db.selectFrom('ingredients').select(['id', 'inci']).where('cas', '=', cas);
  if (exceptId) q = q.where('id', '<>', exceptId);
  return (await q.executeTakeFirst()) ?? null;
}

export interface IngredientValues extends Ingredient {
  inciKey: string;
  nameKeys: string[];
}

function columnsOf(v: IngredientValues) {
  return { inci: v.inci, inci_key: v.inciKey, synonyms: [...v.synonyms], name_keys: v.nameKeys, cas: v.cas, allergen_group: v.group, trivial: v.trivial };
}

export async function insertIngredients(db: Db, values: readonly IngredientValues[], createdBy: string | null): Promise<IngredientRow[]> {
  if (values.length === 0) return [];
  const rows = await db
    .insertInto('ingredients')
    .values(values.map((v) => ({ ...columnsOf(v), created_by: createdBy })))
    .returning(['id', 'inci', 'synonyms', 'cas', 'allergen_group', 'trivial', 'version', 'updated_at'])
    .execute();
  return rows.map(toRow);
}

/** Writes an edit if the row is still at `version`; false when someone changed it first. */
export async function updateIngredientAtVersion(db: Db, id: string, v: IngredientValues, version: number): Promise<boolean> {
  const res = await db
    .updateTable('ingredients')
    .set({ ...columnsOf(v), version: sql`version + 1`, updated_at: sql`now()` })
    .where('id', '=', id)
    .where('version', '=', version)
    .executeTakeFirst();
  return Number(res.numUpdatedRows) === 1;
}

/**
 * The vocabulary entries a set of label names can match: those holding any of the names' matching
 * keys, or whose CAS number is written as a name. One query for the whole list.
 */
export async function findIngredientsForNames(db: Db, keys: readonly string[], names: readonly string[]): Promise<IngredientRow[]> {
  if (keys.length === 0 && names.length === 0) return [];
  const rows = await db
    .selectFrom('ingredients as i')
    .select(COLUMNS)
    .where(sql<boolean>`(i.name_keys && ${sql.val([...keys])}::text[] or i.cas = any(${sql.val(names.map((n) => n.trim()))}::text[]))`)
    .orderBy('i.created_at')
    .execute();
  return rows.map(toRow);
}

/** Label names of recorded formulations that the vocabulary did not know when they were saved. */
export async function listUnlinkedLabelNames(db: Db): Promise<{ formulationId: string; position: number; name: string }[]> {
  const rows = await db.selectFrom('formulation_ingredients').select(['formulation_id', 'position', 'label_name']).where('ingredient_id', 'is', null).execute();
  return rows.map((r) => ({ formulationId: r.formulation_id, position: r.position, name: r.label_name }));
}

/** Links label names to an entry the vocabulary now has. */
export async function linkLabelNames(db: Db, ingredientId: string, rows: readonly { formulationId: string; position: number }[]): Promise<void> {
  for (let i = 0; i < rows.length; i += 500) {
    const chunk = rows.slice(i, i + 500);
    await db
      .updateTable('formulation_ingredients')
      .set({ ingredient_id: ingredientId })
      .where('ingredient_id', 'is', null)
      .where((eb) => eb.or(chunk.map((r) => eb.and([eb('formulation_id', '=', r.formulationId), eb('position', '=', r.position)]))))
      .execute();
  }
}
