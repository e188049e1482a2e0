import { sql } from 'kysely';
import type { LocationLevel, LocationNode } from '#shared/domain/archive-locations.ts';
import type { Db } from '../../db/index.ts';

/** A storage place as stored: the tree node plus its label and row version. */
export interface LocationRecord extends LocationNode {
  environment: string | null;
  labelCode: string;
  version: number;
}

function toRecord(r: { id: string; parent_id: string | null; level: LocationLevel; code: string; name: string; environment: string | null; label_code: string; version: number }): LocationRecord {
  return { id: r.id, parentId: r.parent_id, level: r.level, code: r.code, name: r.name, environment: r.environment, labelCode: r.label_code, version: r.version };
}

const COLUMNS = ['id', 'parent_id', 'level', 'code', 'name', 'environment', 'label_code', 'version'] as const;

/** Every storage place: the tree is small (a store has hundreds of places), so it is read whole. */
export async function listLocations(db: Db): Promise<LocationRecord[]> {
  const rows = await db.selectFrom('archive_locations').select(COLUMNS).orderBy('code').execute();
  return rows.map(toRecord);
}

export async function findLocation(db: Db, id: string): Promise<LocationRecord | undefined> {
  const row = await db.selectFrom('archive_locations').select(COLUMNS).where('id', '=', id).executeTakeFirst();
  return row ? toRecord(row) : undefined;
}

export async function lockLocation(db: Db, id: string): Promise<LocationRecord | undefined> {
  const row = await db.selectFrom('archive_locations').select(COLUMNS).where('id', '=', id).forUpdate().executeTakeFirst();
  return row ? toRecord(row) : undefined;
}

export async function findLocationByLabel(db: Db, labelCode: string): Promise<LocationRecord | undefined> {
  const row = await db.selectFrom('archive_locations').select(COLUMNS).where('label_code', '=', labelCode).executeTakeFirst();
  return row ? toRecord(row) : undefined;
}

export async function locationLabelTaken(db: Db, labelCode: string): Promise<boolean> {
  return Boolean(await db.selectFrom('archive_locations').select('id').where('label_code', '=', labelCode).executeTakeFirst());
}

/**
 * Serialises changes to the shape of the tree, so two moves made at once cannot together close a
 * loop that neither would alone. Held until the transaction ends.
 */
export async function lockTree(db: Db): Promise<void> {
  await sql`select pg_advisory_xact_lock(727011)`.execute(db);
}

export async function insertLocation(db: Db, v: { parentId: string | null; level: LocationLevel; code: string; name: string; environment: string | null; labelCode: string }): Promise<string> {
  const row = await db
    .insertInto('archive_locations')
    .values({ parent_id: v.parentId, level: v.level, code: v.code, name: v.name, environment: v.environment, label_code: v.labelCode })
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

export async function updateLocationAtVersion(db: Db, id: string, v: { parentId: string | null; code: string; name: string; environment: string | null }, version: number): Promise<boolean> {
  const r = await db
    .updateTable('archive_locations')
    .set({ parent_id: v.parentId, code: v.code, name: v.name, environment: v.environment, updated_at: new Date(), version: sql`version + 1` })
    .where('id', '=', id)
    .where('version', '=', version)
    .executeTakeFirst();
  return Number(r.numUpdatedRows) === 1;
}

export async function deleteLocationAtVersion(db: Db, id: string, version: number): Promise<boolean> {
  const r = await db.deleteFrom('archive_locations').where('id', '=', id).where('version', '=', version).executeTakeFirst();
  return Number(r.numDeletedRows) === 1;
}

/** What is inside a place: places, casts there now, casts that call it home (all casts, whoever may see them). */
export async function locationContents(db: Db, id: string): Promise<{ childCount: number; castsHere: number; castsHomedHere: number }> {
  const row = await db
    .selectNoFrom([
      sql<string>`(select count(*) from archive_locations where parent_id = ${id})`.as('children'),
      sql<string>`(select count(*) from casts where current_location_id = ${id})`.as('here'),
      sql<string>`(select count(*) from casts where normal_location_id = ${id})`.as('homed'),
    ])
    .executeTakeFirstOrThrow();
  return { childCount: Number(row.children), castsHere: Number(row.here), castsHomedHere: Number(row.homed) };
}
