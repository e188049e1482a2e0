import type { Db } from '../../db/index.ts';

export interface BundleRecord {
  id: string;
  performerId: string;
  productionId: string | null;
  mode: 'tablet' | 'link';
  expiresAt: Date;
}

function toBundle(r: { id: string; performer_id: string; production_id: string | null; mode: 'tablet' | 'link'; expires_at: Date | string }): BundleRecord {
  return { id: r.id, performerId: r.performer_id, productionId: r.production_id, mode: r.mode, expiresAt: new Date(r.expires_at) };
}

export async function insertBundle(
  db: Db,
  v: { performerId: string; productionId: string; mode: 'tablet' | 'link'; tokenHash: string | null; expiresAt: Date; createdBy: string },
): Promise<string> {
  const r = await db
    .insertInto('signing_bundles')
    .values({ performer_id: v.performerId, production_id: v.productionId, mode: v.mode, token_hash: v.tokenHash, expires_at: v.expiresAt, created_by: v.createdBy })
    .returning('id')
    .executeTakeFirstOrThrow();
  return r.id;
}

export async function findBundle(db: Db, id: string): Promise<BundleRecord | undefined> {
  const r = await db.selectFrom('signing_bundles').select(['id', 'performer_id', 'production_id', 'mode', 'expires_at']).where('id', '=', id).executeTakeFirst();
  return r ? toBundle(r) : undefined;
}

export async function findBundleByTokenHash(db: Db, tokenHash: string): Promise<BundleRecord | undefined> {
  const r = await db
    .selectFrom('signing_bundles')
    .select(['id', 'performer_id', 'production_id', 'mode', 'expires_at'])
    .where('token_hash', '=', tokenHash)
    .where('mode', '=', 'link')
    .executeTakeFirst();
  return r ? toBundle(r) : undefined;
}
