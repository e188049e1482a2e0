import type { Db } from '../../db/index.ts';

export interface KitRow {
  id: string;
  productionId: string;
  name: string;
  /** In the kit's order. */
  products: { id: string; name: string; category: string }[];
  updatedAt: Date;
  updatedByName: string | null;
  version: number;
}

/** Kits of one production (or the given ids), by name, each with its products in order: one query. */
export async function listKitRows(db: Db, where: { productionId?: string; ids?: readonly string[] }): Promise<KitRow[]> {
  let q = db
    .selectFrom('kits as k')
    .leftJoin('users as u', 'u.id', 'k.updated_by')
    .leftJoin('kit_products as kp', 'kp.kit_id', 'k.id')
    .leftJoin('products as p', 'p.id', 'kp.product_id')
    .select(['k.id', 'k.production_id', 'k.name', 'k.updated_at', 'k.version', 'u.display_name', 'kp.position', 'p.id as product_id', 'p.name as product_name', 'p.category']);
  if (where.productionId) q = q.where('k.production_id', '=', where.productionId);
  if (where.ids) {
    if (where.ids.length === 0) return [];
    q = q.where('k.id', 'in', [...where.ids]);
  }
  const rows = await q.orderBy('k.name').orderBy('k.id').orderBy('kp.position').execute();
  const out = new Map<string, KitRow>();
  for (const r of rows) {
    let kit = out.get(r.id);
    if (!kit) {
      kit = { id: r.id, productionId: r.production_id, name: r.name, products: [], updatedAt: new Date(r.updated_at), updatedByName: r.display_name ?? null, version: r.version };
      out.set(r.id, kit);
    }
    if (r.product_id) kit.products.push({ id: r.product_id, name: r.product_name!, category: r.category! });
  }
  return [...out.values()];
}

export async function findKitProduction(db: Db, id: string): Promise<string | undefined> {
  return (await db.selectFrom('kits').select('production_id').where('id', '=', id).executeTakeFirst())?.production_id;
}

export async function lockKit(db: Db, id: string): Promise<{ productionId: string; version: number } | undefined> {
  const r = await db.selectFrom('kits').select(['production_id', 'version']).where('id', '=', id).forUpdate().executeTakeFirst();
  return r ? { productionId: r.production_id, version: r.version } : undefined;
}

/** Which of these ids are catalogue products. */
export async function existingProductIds(db: Db, ids: readonly string[]): Promise<Set<string>> {
  if (ids.length === 0) return new Set();
  const rows = await db.selectFrom('products').select('id').where('id', 'in', [...new Set(ids)]).execute();
  return new Set(rows.map((r) => r.id));
}

export async function insertKit(db: Db, v: { productionId: string; name: string; userId: string }): Promise<string> {
  const r = await db.insertInto('kits').values({ production_id: v.productionId, name: v.name, created_by: v.userId, updated_by: v.userId }).returning('id').executeTakeFirstOrThrow();
  return r.id;
}

export async function updateKitAtVersion(db: Db, id: string, v: { name: string; userId: string; version: number }): Promise<boolean> {
  const r = await db
    .updateTable('kits')
    .set((eb) => ({ name: v.name, updated_by: v.userId, updated_at: new Date(), version: eb('version', '+', 1) }))
    .where('id', '=', id)
    .where('version', '=', v.version)
    .executeTakeFirst();
  return Number(r.numUpdatedRows) === 1;
}

export async function replaceKitProducts(db: Db, kitId: string, productIds: readonly string[]): Promise<void> {
  await db.deleteFrom('kit_products').where('kit_id', '=', kitId).execute();
  if (productIds.length === 0) return;
  await db
    .insertInto('kit_products')
    .values(productIds.map((productId, position) => ({ kit_id: kitId, position, product_id: productId })))
    .execute();
}
