import { sql } from 'kysely';
import type { LotForTest } from '#shared/domain/catalogue.ts';
import type { Db } from '../../db/index.ts';

export interface LotRow {
  id: string;
  productId: string;
  formulationId: string;
  formulationVersion: number;
  code: string;
  expiresOn: string;
  retiredAt: Date | null;
  version: number;
}

function lotQuery(db: Db) {
  return db
    .selectFrom('product_lots as l')
    .innerJoin('product_formulations as f', 'f.id', 'l.formulation_id')
    .select(['l.id', 'l.product_id', 'l.formulation_id', 'f.version as formulation_version', 'l.code', 'l.expires_on', 'l.retired_at', 'l.version']);
}
type LotSelected = Awaited<ReturnType<ReturnType<typeof lotQuery>['executeTakeFirstOrThrow']>>;

function toLot(r: LotSelected): LotRow {
  return {
    id: r.id,
    productId: r.product_id,
    formulationId: r.formulation_id,
    formulationVersion: r.formulation_version,
    code: r.code,
    expiresOn: r.expires_on,
    retiredAt: r.retired_at,
    version: r.version,
  };
}

/** A product's lots: in use first, soonest last day first; retired ones after. */
export async function listLots(db: Db, productId: string): Promise<LotRow[]> {
  const rows = await lotQuery(db)
    .where('l.product_id', '=', productId)
    .orderBy(sql`l.retired_at is not null`)
    .orderBy('l.expires_on')
    .orderBy(sql`lower(l.code)`)
    .execute();
  return rows.map(toLot);
}

export async function lockLot(db: Db, productId: string, lotId: string): Promise<LotRow | null> {
  const r = await lotQuery(db).where('l.id', '=', lotId).where('l.product_id', '=', productId).forUpdate('l').executeTakeFirst();
  return r ? toLot(r) : null;
}

/** Another lot of the same product with this code (codes are unique per product, whatever their case). */
export async function findLotByCode(db: Db, productId: string, code: string, exceptId: string | null): Promise<{ id: string } | null> {
  let q = db.selectFrom('product_lots').select('id').where('product_id', '=', productId).where(sql<boolean>`lower(code) = lower(${code})`);
  if (exceptId) q = q.where('id', '<>', exceptId);
  return (await q.executeTakeFirst()) ?? null;
}

export async function insertLot(db: Db, lot: { productId: string; formulationId: string; code: string; expiresOn: string; createdBy: string | null }): Promise<string> {
  const r = await db
    .insertInto('product_lots')
    .values({ product_id: lot.productId, formulation_id: lot.formulationId, code: lot.code, expires_on: lot.expiresOn, created_by: lot.createdBy })
    .returning('id')
    .executeTakeFirstOrThrow();
  return r.id;
}

export async function insertLots(db: Db, lots: readonly { productId: string; formulationId: string; code: string; expiresOn: string; createdBy: string | null }[]): Promise<void> {
  if (lots.length === 0) return;
  await db
    .insertInto('product_lots')
    .values(lots.map((l) => ({ product_id: l.productId, formulation_id: l.formulationId, code: l.code, expires_on: l.expiresOn, created_by: l.createdBy })))
    .execute();
}

export async function updateLotAtVersion(db: Db, lotId: string, lot: { code: string; expiresOn: string; formulationId: string }, version: number): Promise<boolean> {
  const res = await db
    .updateTable('product_lots')
    .set({ code: lot.code, expires_on: lot.expiresOn, formulation_id: lot.formulationId, version: sql`version + 1`, updated_at: sql`now()` })
    .where('id', '=', lotId)
    .where('version', '=', version)
    .executeTakeFirst();
  return Number(res.numUpdatedRows) === 1;
}

export async function setLotRetiredAtVersion(db: Db, lotId: string, retiredBy: string | null, version: number): Promise<boolean> {
  const res = await db
    .updateTable('product_lots')
    .set({ retired_at: retiredBy ? sql`now()` : null, retired_by: retiredBy, version: sql`version + 1`, updated_at: sql`now()` })
    .where('id', '=', lotId)
    .where('version', '=', version)
    .executeTakeFirst();
  return Number(res.numUpdatedRows) === 1;
}

/** A lot as a booking checks it, with the names a refusal or a screen needs. */
export interface LotForTestRow extends LotForTest {
  productName: string;
  formulationVersion: number;
  /** The product's current formulation, to tell a booking that an older formulation's lot is chosen. */
  currentFormulationId: string | null;
}

/**
 * The lots a test names, with product, formulation and expiry, from one query. Check each against the
 * product it is booked for with `lotRefusal` (shared/domain/catalogue.ts): a missing id, a lot of another
 * product, a retired or an expired lot is refused. Store the lot's `formulationId` on the test, since
 * clearance keys on the formulation.
 */
export async function findLotsForTest(db: Db, lotIds: readonly string[]): Promise<Map<string, LotForTestRow>> {
  const out = new Map<string, LotForTestRow>();
  const ids = [...new Set(lotIds)];
  if (ids.length === 0) return out;
  const rows = await db
    .selectFrom('product_lots as l')
    .innerJoin('products as p', 'p.id', 'l.product_id')
    .innerJoin('product_formulations as f', 'f.id', 'l.formulation_id')
    .select(['l.id', 'l.code', 'l.product_id', 'p.name', 'l.formulation_id', 'f.version', 'p.current_formulation_id', 'l.expires_on', 'l.retired_at'])
    .where('l.id', 'in', ids)
    .execute();
  for (const r of rows) {
    out.set(r.id, {
      lotId: r.id,
      code: r.code,
      productId: r.product_id,
      productName: r.name,
      formulationId: r.formulation_id,
      formulationVersion: r.version,
      currentFormulationId: r.current_formulation_id,
      expiresOn: r.expires_on,
      retiredAt: r.retired_at,
    });
  }
  return out;
}
