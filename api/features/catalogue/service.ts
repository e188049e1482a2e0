import type { Request } from 'express';
import { lotState, needsSolventCaution } from '#shared/domain/catalogue.ts';
import type { Actor } from '#shared/policy.ts';
import type {
  CreateLotInputSchema,
  CreateProductInputSchema,
  NewFormulationInputSchema,
  ProductDetail,
  ProductListItem,
  ProductListQuery,
  RecordIngredientsInputSchema,
  RetireLotInputSchema,
  UpdateLotInputSchema,
  UpdateProductInputSchema,
} from '#shared/schemas/catalogue.ts';
import type { z } from 'zod';
import type { AppContext } from '../../context.ts';
import type { Db } from '../../db/index.ts';
import { writeAudit } from '../../http/audit.ts';
import { conflict, invalid, isUniqueViolation, notFound } from '../../http/errors.ts';
import { resolveLabel } from './ingredient-service.ts';
import { findLotByCode, insertLot, listLots, lockLot, setLotRetiredAtVersion, updateLotAtVersion } from './lot-repo.ts';
import {
  type ProductRow,
  findProduct,
  insertFormulation,
  insertFormulationIngredients,
  insertProduct,
  listFormulationIngredients,
  listFormulations,
  listProducts,
  lockProduct,
  nextFormulationVersion,
  setFirstFormulation,
  setFormulationLabelIfUnrecorded,
  touchProductAtVersion,
  updateProductAtVersion,
} from './repo.ts';

type CreateProduct = z.output<typeof CreateProductInputSchema>;
type UpdateProduct = z.output<typeof UpdateProductInputSchema>;
type NewFormulation = z.output<typeof NewFormulationInputSchema>;
type RecordIngredients = z.output<typeof RecordIngredientsInputSchema>;
type CreateLot = z.output<typeof CreateLotInputSchema>;
type UpdateLot = z.output<typeof UpdateLotInputSchema>;
type RetireLot = z.output<typeof RetireLotInputSchema>;

const staleProduct = (version: number) => conflict('Someone else changed this product since you opened it. Reload to see their change.', { currentVersion: version });
const staleLot = (version: number) => conflict('Someone else changed this lot since you opened it. Reload to see their change.', { currentVersion: version });
const nameTaken = () => conflict('Another product already has this name.', { fields: { name: ['Another product already has this name.'] } });
const codeTaken = () => conflict('This product already has a lot with this code.', { fields: { code: ['This product already has a lot with this code.'] } });

/** A duplicate name that got past the check (two saves at once): the same answer the check gives. */
function duplicateToConflict(err: unknown): never {
  if (isUniqueViolation(err, 'products_name_key')) throw nameTaken();
  if (isUniqueViolation(err, 'product_lots_code_key')) throw codeTaken();
  throw err;
}

function groupsOf(ingredients: readonly { group: string | null }[]): ProductListItem['groups'] {
  const out = new Set<ProductListItem['groups'][number]>();
  for (const i of ingredients) if (i.group) out.add(i.group as ProductListItem['groups'][number]);
  return [...out];
}

export async function productPage(db: Db, q: ProductListQuery): Promise<{ items: ProductListItem[]; total: number; page: number; pageSize: number }> {
  const { items, total } = await listProducts(db, q);
  return {
    total,
    page: q.page,
    pageSize: q.pageSize,
    items: items.map((r) => ({
      id: r.id,
      name: r.name,
      maker: r.maker,
      category: r.category,
      exposure: r.exposure,
      formulationVersion: r.formulationVersion,
      ingredientCount: r.recorded ? r.ingredients.length : null,
      groups: groupsOf(r.ingredients),
      usableLots: r.usableLots,
      expiredLots: r.expiredLots,
      nextExpiry: r.nextExpiry,
      hasSafetySheet: r.hasSafetySheet,
      solventCaution: needsSolventCaution(r.category, r.recorded ? r.ingredients : null),
    })),
  };
}

/** A product with every formulation (newest first, each with its ingredients), its lots and its safety data sheet. */
export async function productDetail(db: Db, id: string, now = new Date()): Promise<ProductDetail> {
  const p = await findProduct(db, id);
  if (!p) throw notFound('That product');
  const formulations = await listFormulations(db, id);
  const rows = await listFormulationIngredients(db, formulations.map((f) => f.id));
  const lots = await listLots(db, id);
  const current = formulations.find((f) => f.id === p.currentFormulationId);
  const currentIngredients = current && current.inciLabel !== null ? (rows.get(current.id) ?? []).map((r) => ({ group: r.ingredient?.group ?? null, trivial: r.ingredient?.trivial ?? false })) : null;
  return {
    id: p.id,
    name: p.name,
    maker: p.maker,
    category: p.category,
    exposure: p.exposure,
    densityGPerCm3: p.densityGPerCm3,
    mixRatio: p.mixRatio,
    makerMaxSoftenerPercent: p.makerMaxSoftenerPercent,
    currentFormulationId: p.currentFormulationId,
    formulations: formulations.map((f) => ({
      id: f.id,
      version: f.version,
      current: f.id === p.currentFormulationId,
      note: f.note,
      inciLabel: f.inciLabel,
      ingredients: f.inciLabel === null ? null : (rows.get(f.id) ?? []),
      createdAt: f.createdAt,
      createdBy: f.createdBy,
    })),
    lots: lots.map((l) => ({
      id: l.id,
      code: l.code,
      expiresOn: l.expiresOn,
      formulationId: l.formulationId,
      formulationVersion: l.formulationVersion,
      state: lotState(l, now),
      retiredAt: l.retiredAt ? new Date(l.retiredAt).toISOString() : null,
      version: l.version,
    })),
    safetySheet:
      p.sdsFileId && p.sdsUploadedAt
        ? { fileName: p.sdsFileName ?? 'safety-data-sheet.pdf', byteSize: p.sdsByteSize ?? 0, uploadedAt: new Date(p.sdsUploadedAt).toISOString(), uploadedBy: p.sdsUploadedBy, url: `/api/products/${p.id}/safety-data-sheet` }
        : null,
    solventCaution: needsSolventCaution(p.category, currentIngredients),
    version: p.version,
    updatedAt: p.updatedAt,
  };
}

/** Parses and matches a label, then writes its names in label order, each ingredient once; counts names and unknown names. */
export async function writeIngredients(trx: Db, formulationId: string, label: string | null): Promise<{ names: number; unknown: number }> {
  if (label === null) return { names: 0, unknown: 0 };
  const entries = (await resolveLabel(trx, label)).filter((e) => !e.duplicate);
  await insertFormulationIngredients(trx, formulationId, entries.map((e) => ({ name: e.name, mayContain: e.mayContain, ingredientId: e.ingredient?.id ?? null })));
  return { names: entries.length, unknown: entries.filter((e) => e.ingredient === null).length };
}

async function lockOr404(trx: Db, id: string): Promise<ProductRow> {
  const p = await lockProduct(trx, id);
  if (!p) throw notFound('That product');
  return p;
}

export async function createProduct(ctx: AppContext, actor: Actor, req: Request, body: CreateProduct): Promise<ProductDetail> {
  const { inciLabel, formulationNote, ...fields } = body;
  const id = await ctx.db
    .transaction()
    .execute(async (trx) => {
      const productId = await insertProduct(trx, fields, actor.userId);
      const formulationId = await insertFormulation(trx, { productId, version: 1, inciLabel, note: formulationNote, createdBy: actor.userId });
      await setFirstFormulation(trx, productId, formulationId);
      const counts = await writeIngredients(trx, formulationId, inciLabel);
      await writeAudit(trx, { actorUserId: actor.userId, action: 'product.create', entityType: 'product', entityId: productId, req, details: { name: fields.name, category: fields.category, formulationId, ingredients: counts } });
      return productId;
    })
    .catch(duplicateToConflict);
  return productDetail(ctx.db, id);
}

export async function updateProduct(ctx: AppContext, actor: Actor, req: Request, id: string, body: UpdateProduct): Promise<ProductDetail> {
  const { version, ...fields } = body;
  await ctx.db
    .transaction()
    .execute(async (trx) => {
      const current = await lockOr404(trx, id);
      if (current.version !== version || !(await updateProductAtVersion(trx, id, fields, version))) throw staleProduct(current.version);
      const changed = (Object.keys(fields) as (keyof typeof fields)[]).filter((k) => JSON.stringify(current[k]) !== JSON.stringify(fields[k]));
      await writeAudit(trx, { actorUserId: actor.userId, action: 'product.update', entityType: 'product', entityId: id, req, details: { changed } });
    })
    .catch(duplicateToConflict);
  return productDetail(ctx.db, id);
}

/** A new formulation becomes current; earlier tests stay with the formulation they tested, and lots keep theirs. */
export async function addFormulation(ctx: AppContext, actor: Actor, req: Request, id: string, body: NewFormulation): Promise<ProductDetail> {
  await ctx.db.transaction().execute(async (trx) => {
    const current = await lockOr404(trx, id);
    if (current.version !== body.version) throw staleProduct(current.version);
    const version = await nextFormulationVersion(trx, id);
    const formulationId = await insertFormulation(trx, { productId: id, version, inciLabel: body.inciLabel, note: body.note, createdBy: actor.userId });
    const counts = await writeIngredients(trx, formulationId, body.inciLabel);
    if (!(await touchProductAtVersion(trx, id, body.version, { current_formulation_id: formulationId }))) throw staleProduct(current.version);
    await writeAudit(trx, { actorUserId: actor.userId, action: 'formulation.create', entityType: 'product', entityId: id, req, details: { formulationId, version, previous: current.currentFormulationId, ingredients: counts } });
  });
  return productDetail(ctx.db, id);
}

/** Records the ingredients of a formulation that had none; a recorded list is never rewritten (a change is a new formulation). */
export async function recordIngredients(ctx: AppContext, actor: Actor, req: Request, id: string, formulationId: string, body: RecordIngredients): Promise<ProductDetail> {
  await ctx.db.transaction().execute(async (trx) => {
    const current = await lockOr404(trx, id);
    const formulation = (await listFormulations(trx, id)).find((f) => f.id === formulationId);
    if (!formulation) throw notFound('That formulation');
    if (current.version !== body.version) throw staleProduct(current.version);
    const label = body.inciLabel!;
    if (!(await setFormulationLabelIfUnrecorded(trx, formulationId, id, label))) {
      throw conflict('This formulation’s ingredients are already recorded. A changed list is a new formulation.');
    }
    const counts = await writeIngredients(trx, formulationId, label);
    if (!(await touchProductAtVersion(trx, id, body.version))) throw staleProduct(current.version);
    await writeAudit(trx, { actorUserId: actor.userId, action: 'formulation.record_ingredients', entityType: 'product', entityId: id, req, details: { formulationId, ingredients: counts } });
  });
  return productDetail(ctx.db, id);
}

async function formulationOf(trx: Db, product: ProductRow, formulationId: string | undefined): Promise<string> {
  if (!formulationId) {
    if (!product.currentFormulationId) throw invalid({ formulationId: ['Choose the formulation of this lot'] });
    return product.currentFormulationId;
  }
  const known = (await listFormulations(trx, product.id)).some((f) => f.id === formulationId);
  if (!known) throw invalid({ formulationId: ['That is not a formulation of this product'] });
  return formulationId;
}

export async function addLot(ctx: AppContext, actor: Actor, req: Request, id: string, body: CreateLot): Promise<ProductDetail> {
  await ctx.db
    .transaction()
    .execute(async (trx) => {
      const product = await lockOr404(trx, id);
      const formulationId = await formulationOf(trx, product, body.formulationId);
      if (await findLotByCode(trx, id, body.code, null)) throw codeTaken();
      const lotId = await insertLot(trx, { productId: id, formulationId, code: body.code, expiresOn: body.expiresOn, createdBy: actor.userId });
      await writeAudit(trx, { actorUserId: actor.userId, action: 'lot.create', entityType: 'product_lot', entityId: lotId, req, details: { productId: id, code: body.code, expiresOn: body.expiresOn, formulationId } });
    })
    .catch(duplicateToConflict);
  return productDetail(ctx.db, id);
}

export async function updateLot(ctx: AppContext, actor: Actor, req: Request, id: string, lotId: string, body: UpdateLot): Promise<ProductDetail> {
  await ctx.db
    .transaction()
    .execute(async (trx) => {
      const product = await lockOr404(trx, id);
      const lot = await lockLot(trx, id, lotId);
      if (!lot) throw notFound('That lot');
      if (lot.version !== body.version) throw staleLot(lot.version);
      const formulationId = await formulationOf(trx, product, body.formulationId ?? lot.formulationId);
      if (await findLotByCode(trx, id, body.code, lotId)) throw codeTaken();
      if (!(await updateLotAtVersion(trx, lotId, { code: body.code, expiresOn: body.expiresOn, formulationId }, body.version))) throw staleLot(lot.version);
      await writeAudit(trx, {
        actorUserId: actor.userId,
        action: 'lot.update',
        entityType: 'product_lot',
        entityId: lotId,
        req,
        details: { productId: id, before: { code: lot.code, expiresOn: lot.expiresOn, formulationId: lot.formulationId }, after: { code: body.code, expiresOn: body.expiresOn, formulationId } },
      });
    })
    .catch(duplicateToConflict);
  return productDetail(ctx.db, id);
}

/** A retired lot is kept for the record (tests name it) but cannot be chosen again until restored. */
export async function setLotRetired(ctx: AppContext, actor: Actor, req: Request, id: string, lotId: string, body: RetireLot): Promise<ProductDetail> {
  await ctx.db.transaction().execute(async (trx) => {
    await lockOr404(trx, id);
    const lot = await lockLot(trx, id, lotId);
    if (!lot) throw notFound('That lot');
    if (lot.version !== body.version) throw staleLot(lot.version);
    if ((lot.retiredAt !== null) === body.retired) return;
    if (!(await setLotRetiredAtVersion(trx, lotId, body.retired ? actor.userId : null, body.version))) throw staleLot(lot.version);
    await writeAudit(trx, { actorUserId: actor.userId, action: body.retired ? 'lot.retire' : 'lot.restore', entityType: 'product_lot', entityId: lotId, req, details: { productId: id, code: lot.code } });
  });
  return productDetail(ctx.db, id);
}
