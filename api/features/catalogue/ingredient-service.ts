import type { Request } from 'express';
import { buildVocabulary, candidateKeys, normaliseInciName, parseInciLabel, resolveIngredient, type Ingredient } from '#shared/domain/ingredients.ts';
import type { Actor } from '#shared/policy.ts';
import type { IngredientDetail, IngredientInput, LabelMatch, UpdateIngredientInput } from '#shared/schemas/catalogue.ts';
import type { AppContext } from '../../context.ts';
import type { Db } from '../../db/index.ts';
import { writeAudit } from '../../http/audit.ts';
import { conflict, invalid, notFound } from '../../http/errors.ts';
import {
  type IngredientRow,
  type IngredientValues,
  findIngredient,
  findIngredientByCas,
  findIngredientsForNames,
  findIngredientsHoldingKeys,
  insertIngredients,
  linkLabelNames,
  listProductsUsingIngredient,
  listUnlinkedLabelNames,
  lockIngredient,
  lockVocabulary,
  updateIngredientAtVersion,
} from './ingredient-repo.ts';

/** The stored form of an entry: its matching keys, and synonyms without repeats of the INCI name or of each other. */
export function ingredientValues(input: Ingredient): IngredientValues {
  const inciKey = normaliseInciName(input.inci);
  if (!inciKey) throw invalid({ inci: ['The INCI name needs at least one letter or digit'] });
  const keys = [inciKey];
  const synonyms: string[] = [];
  for (const s of input.synonyms) {
    const key = normaliseInciName(s);
    if (!key || keys.includes(key)) continue;
    keys.push(key);
    synonyms.push(s);
  }
  return { ...input, synonyms, inciKey, nameKeys: keys };
}

/** Every name of an entry belongs to it alone, and so does its CAS number: a second claim is a duplicate (409). */
async function assertNamesFree(db: Db, v: IngredientValues, exceptId: string | null): Promise<void> {
  const holders = await findIngredientsHoldingKeys(db, v.nameKeys, exceptId);
  const fields: Record<string, string[]> = {};
  for (const h of holders) {
    if (h.nameKeys.includes(v.inciKey)) {
      fields.inci = [`This name is already in the vocabulary, as ${h.inci}.`];
    }
    v.synonyms.forEach((s, i) => {
      if (h.nameKeys.includes(normaliseInciName(s))) fields[`synonyms.${i}`] = [`“${s}” already names ${h.inci}.`];
    });
  }
  if (v.cas) {
    const other = await findIngredientByCas(db, v.cas, exceptId);
    if (other) fields.cas = [`This CAS number already belongs to ${other.inci}.`];
  }
  if (Object.keys(fields).length) throw conflict(fields.inci ? 'That ingredient is already in the vocabulary.' : 'Another ingredient already has one of these names.', { fields });
}

/** Label names saved before the vocabulary knew them now point at the new or renamed entry. */
async function linkWaitingNames(db: Db, entry: Ingredient & { id: string }): Promise<number> {
  const vocab = buildVocabulary([entry]);
  const matches = (await listUnlinkedLabelNames(db)).filter((row) => resolveIngredient(row.name, vocab) !== null);
  await linkLabelNames(db, entry.id, matches);
  return matches.length;
}

export async function ingredientDetail(db: Db, id: string): Promise<IngredientDetail> {
  const row = await findIngredient(db, id);
  if (!row) throw notFound('That ingredient');
  return { ...row, products: await listProductsUsingIngredient(db, id) };
}

export async function createIngredient(ctx: AppContext, actor: Actor, req: Request, input: IngredientInput): Promise<IngredientDetail> {
  const values = ingredientValues(input);
  const id = await ctx.db.transaction().execute(async (trx) => {
    await lockVocabulary(trx);
    await assertNamesFree(trx, values, null);
    const [row] = await insertIngredients(trx, [values], actor.userId);
    const linked = await linkWaitingNames(trx, row!);
    await writeAudit(trx, { actorUserId: actor.userId, action: 'ingredient.create', entityType: 'ingredient', entityId: row!.id, req, details: { inci: values.inci, group: values.group, trivial: values.trivial, linkedLabelNames: linked } });
    return row!.id;
  });
  return ingredientDetail(ctx.db, id);
}

export async function updateIngredient(ctx: AppContext, actor: Actor, req: Request, id: string, body: UpdateIngredientInput): Promise<IngredientDetail> {
  const values = ingredientValues(body.ingredient);
  await ctx.db.transaction().execute(async (trx) => {
    await lockVocabulary(trx);
    const current = await lockIngredient(trx, id);
    if (!current) throw notFound('That ingredient');
    if (current.version !== body.version) {
      throw conflict('Someone else changed this ingredient since you opened it. Reload to see their change.', { currentVersion: current.version });
    }
    await assertNamesFree(trx, values, id);
    await updateIngredientAtVersion(trx, id, values, body.version);
    const linked = await linkWaitingNames(trx, { ...values, id });
    await writeAudit(trx, { actorUserId: actor.userId, action: 'ingredient.update', entityType: 'ingredient', entityId: id, req, details: { changed: changedFields(current, values), linkedLabelNames: linked } });
  });
  return ingredientDetail(ctx.db, id);
}

function changedFields(before: IngredientRow, after: Ingredient): string[] {
  const out: string[] = [];
  if (before.inci !== after.inci) out.push('inci');
  if (before.synonyms.join('\n') !== after.synonyms.join('\n')) out.push('synonyms');
  if (before.cas !== after.cas) out.push('cas');
  if (before.group !== after.group) out.push('group');
  if (before.trivial !== after.trivial) out.push('trivial');
  return out;
}

/** A resolved label entry: the vocabulary row it names, if any. */
export interface ResolvedEntry {
  name: string;
  mayContain: boolean;
  ingredient: IngredientRow | null;
  duplicate: boolean;
}

/**
 * A pasted ingredient list matched to the vocabulary with the same rules the clearance check uses,
 * from one query for the whole list. A name listed twice (or two names of one ingredient) is marked,
 * so it is stored once.
 */
export async function resolveLabel(db: Db, label: string): Promise<ResolvedEntry[]> {
  const entries = parseInciLabel(label);
  const keys = [...new Set(entries.flatMap((e) => candidateKeys(e.name)))];
  const rows = await findIngredientsForNames(db, keys, entries.map((e) => e.name));
  const vocab = buildVocabulary(rows);
  const byInci = new Map(rows.map((r) => [r.inci, r]));
  const seen = new Set<string>();
  return entries.map((e) => {
    const hit = resolveIngredient(e.name, vocab);
    const key = hit ? `i:${normaliseInciName(hit.inci)}` : `n:${normaliseInciName(e.name)}`;
    const duplicate = seen.has(key);
    seen.add(key);
    return { name: e.name, mayContain: e.mayContain, ingredient: hit ? (byInci.get(hit.inci) ?? null) : null, duplicate };
  });
}

/** The reply of the label-matching route. */
export function labelMatches(entries: readonly ResolvedEntry[]): { entries: LabelMatch[] } {
  return {
    entries: entries.map((e) => ({
      name: e.name,
      mayContain: e.mayContain,
      duplicate: e.duplicate,
      ingredient: e.ingredient ? { id: e.ingredient.id, inci: e.ingredient.inci, group: e.ingredient.group, trivial: e.ingredient.trivial } : null,
    })),
  };
}
