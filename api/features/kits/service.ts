import type { Request } from 'express';
import { can, type Actor } from '#shared/policy.ts';
import type { CreateKitInput, Kit, UpdateKitInput } from '#shared/schemas/kits.ts';
import type { AppContext } from '../../context.ts';
import type { Db } from '../../db/index.ts';
import { writeAudit } from '../../http/audit.ts';
import { authorize } from '../../http/authorize.ts';
import { conflict, duplicateAsFields, invalid, notFound } from '../../http/errors.ts';
import { existingProductIds, findKitProduction, insertKit, listKitRows, lockKit, replaceKitProducts, updateKitAtVersion, type KitRow } from './repo.ts';

const nameTaken = duplicateAsFields({ kits_name_key: { name: ['This production already has a kit of that name.'] } });

function view(actor: Actor, k: KitRow): Kit {
  return { ...k, updatedAt: k.updatedAt.toISOString(), canManage: can(actor, 'kits.manage', { productionId: k.productionId }) };
}

export async function listKits(ctx: AppContext, actor: Actor, productionId: string): Promise<{ items: Kit[]; canManage: boolean }> {
  authorize(actor, 'clearance.check', { productionId });
  const rows = await listKitRows(ctx.db, { productionId });
  return { items: rows.map((k) => view(actor, k)), canManage: can(actor, 'kits.manage', { productionId }) };
}

export async function kitById(ctx: AppContext, actor: Actor, id: string): Promise<Kit> {
  const [k] = await listKitRows(ctx.db, { ids: [id] });
  if (!k) throw notFound('That kit');
  authorize(actor, 'clearance.check', { productionId: k.productionId });
  return view(actor, k);
}

async function assertProducts(db: Db, productIds: readonly string[]): Promise<void> {
  const known = await existingProductIds(db, productIds);
  const fields: Record<string, string[]> = {};
  productIds.forEach((id, i) => {
    if (!known.has(id)) fields[`productIds.${i}`] = ['No such product in the catalogue.'];
  });
  if (Object.keys(fields).length) throw invalid(fields);
}

export async function createKit(ctx: AppContext, actor: Actor, input: CreateKitInput, req: Request): Promise<Kit> {
  authorize(actor, 'kits.manage', { productionId: input.productionId });
  await assertProducts(ctx.db, input.productIds);
  const id = await ctx.db
    .transaction()
    .execute(async (trx) => {
      const kitId = await insertKit(trx, { productionId: input.productionId, name: input.name, userId: actor.userId });
      await replaceKitProducts(trx, kitId, input.productIds);
      await writeAudit(trx, { actorUserId: actor.userId, action: 'kit.create', entityType: 'kit', entityId: kitId, productionId: input.productionId, req, details: { products: input.productIds.length } });
      return kitId;
    })
    .catch(nameTaken);
  return kitById(ctx, actor, id);
}

export async function updateKit(ctx: AppContext, actor: Actor, id: string, input: UpdateKitInput, req: Request): Promise<Kit> {
  const productionId = await findKitProduction(ctx.db, id);
  if (!productionId) throw notFound('That kit');
  authorize(actor, 'kits.manage', { productionId });
  await assertProducts(ctx.db, input.productIds);
  await ctx.db
    .transaction()
    .execute(async (trx) => {
      const k = await lockKit(trx, id);
      if (!k) throw notFound('That kit');
      if (k.version !== input.version || !(await updateKitAtVersion(trx, id, { name: input.name, userId: actor.userId, version: input.version }))) {
        throw conflict('Someone else changed this kit since you opened it. Reload to see their change.', { currentVersion: k.version });
      }
      await replaceKitProducts(trx, id, input.productIds);
      await writeAudit(trx, { actorUserId: actor.userId, action: 'kit.update', entityType: 'kit', entityId: id, productionId, req, details: { products: input.productIds.length } });
    })
    .catch(nameTaken);
  return kitById(ctx, actor, id);
}
