import { sql } from 'kysely';
import type { Protocol } from '#shared/domain/protocols.ts';
import type { ProtocolVersion } from '#shared/schemas/protocols.ts';
import type { Db } from '../../db/index.ts';

/*
 * Protocols as data. A protocol is a slug and a current version number; its content lives in
 * protocol_versions, one row per published version, never changed afterwards. A booked test stores
 * the version row's id (`versionId`) and so keeps the readings it was booked with.
 */

function versionQuery(db: Db) {
  return db
    .selectFrom('protocol_versions as v')
    .leftJoin('users as u', 'u.id', 'v.created_by')
    .select(['v.id', 'v.protocol_id', 'v.version', 'v.name', 'v.kind', 'v.description', 'v.occlusion_minutes', 'v.applications', 'v.readings', 'v.created_at', 'u.display_name']);
}
type VersionSelected = Awaited<ReturnType<ReturnType<typeof versionQuery>['executeTakeFirstOrThrow']>>;

/** The protocol a `protocol_versions` row holds, for a query of another feature that joins the row. */
export function protocolOfRow(r: Pick<VersionSelected, 'protocol_id' | 'name' | 'kind' | 'description' | 'occlusion_minutes' | 'applications' | 'readings'>): Protocol {
  return {
    id: r.protocol_id,
    name: r.name,
    kind: r.kind,
    description: r.description,
    occlusionMinutes: r.occlusion_minutes,
    applications: r.applications as Protocol['applications'],
    readings: r.readings as Protocol['readings'],
  };
}

function toVersion(r: VersionSelected): ProtocolVersion {
  return {
    versionId: r.id,
    version: r.version,
    protocol: protocolOfRow(r),
    createdAt: new Date(r.created_at).toISOString(),
    createdBy: r.display_name,
  };
}

/** Every protocol at its current version, by name. */
export async function listCurrentProtocols(db: Db): Promise<ProtocolVersion[]> {
  const rows = await versionQuery(db)
    .innerJoin('protocols as p', (j) => j.onRef('p.id', '=', 'v.protocol_id').onRef('p.current_version', '=', 'v.version'))
    .orderBy(sql`lower(v.name)`)
    .execute();
  return rows.map(toVersion);
}

/** One protocol at its current version; null when there is no such protocol. */
export async function findCurrentProtocolVersion(db: Db, protocolId: string): Promise<ProtocolVersion | null> {
  const r = await versionQuery(db)
    .innerJoin('protocols as p', (j) => j.onRef('p.id', '=', 'v.protocol_id').onRef('p.current_version', '=', 'v.version'))
    .where('v.protocol_id', '=', protocolId)
    .executeTakeFirst();
  return r ? toVersion(r) : null;
}

/** Every published version of a protocol, newest first. */
export async function listProtocolVersions(db: Db, protocolId: string): Promise<ProtocolVersion[]> {
  const rows = await versionQuery(db).where('v.protocol_id', '=', protocolId).orderBy('v.version', 'desc').execute();
  return rows.map(toVersion);
}

/**
 * The protocol versions booked tests name, by version id, from one query: a test reads its schedule
 * from the version it was booked with, whatever the protocol says today.
 */
export async function findProtocolVersions(db: Db, versionIds: readonly string[]): Promise<Map<string, ProtocolVersion>> {
  const ids = [...new Set(versionIds)];
  if (ids.length === 0) return new Map();
  const rows = await versionQuery(db).where('v.id', 'in', ids).execute();
  return new Map(rows.map((r) => [r.id, toVersion(r)]));
}

export async function lockProtocol(db: Db, protocolId: string): Promise<{ id: string; currentVersion: number } | null> {
  const r = await db.selectFrom('protocols').select(['id', 'current_version']).where('id', '=', protocolId).forUpdate().executeTakeFirst();
  return r ? { id: r.id, currentVersion: r.current_version } : null;
}

function versionColumns(p: Protocol) {
  return {
    name: p.name,
    kind: p.kind,
    description: p.description,
    occlusion_minutes: p.occlusionMinutes,
    applications: JSON.stringify(p.applications),
    readings: JSON.stringify(p.readings),
  };
}

/** Publishes the next version and makes it current. */
export async function insertProtocolVersion(db: Db, protocolId: string, version: number, p: Protocol, createdBy: string | null): Promise<string> {
  const r = await db
    .insertInto('protocol_versions')
    .values({ protocol_id: protocolId, version, ...versionColumns(p), created_by: createdBy })
    .returning('id')
    .executeTakeFirstOrThrow();
  await db.updateTable('protocols').set({ current_version: version, updated_at: sql`now()` }).where('id', '=', protocolId).execute();
  return r.id;
}

/** Adds the protocols a studio starts with, each at version 1, leaving any that exist alone; returns the ids added. */
export async function insertMissingProtocols(db: Db, protocols: readonly Protocol[]): Promise<string[]> {
  if (protocols.length === 0) return [];
  const added = await db
    .insertInto('protocols')
    .values(protocols.map((p) => ({ id: p.id, current_version: 1 })))
    .onConflict((oc) => oc.column('id').doNothing())
    .returning('id')
    .execute();
  const ids = new Set(added.map((a) => a.id));
  const fresh = protocols.filter((p) => ids.has(p.id));
  if (fresh.length) await db.insertInto('protocol_versions').values(fresh.map((p) => ({ protocol_id: p.id, version: 1, ...versionColumns(p), created_by: null }))).execute();
  return [...ids];
}
