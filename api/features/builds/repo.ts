import { sql } from 'kysely';
import type { BuildMaterialRole } from '#shared/domain/builds.ts';
import { CoatingInputSchema, MixInputSchema, type CoatingInput, type MixInput } from '#shared/schemas/appliance-calc.ts';
import { CoatingVolumesSchema, MixPlanSchema, WeighedSchema, type MixPlanOut, type Weighed } from '#shared/schemas/builds.ts';
import type { Db } from '../../db/index.ts';

/*
 * Appliance builds and their materials. JSON columns are read back through their schemas, so a row
 * that no longer parses fails loudly rather than reaching a screen half-understood.
 */

export interface BuildRow {
  id: string;
  productionId: string;
  performerId: string;
  moldId: string;
  madeOn: string;
  madeBy: string;
  mix: MixInput;
  plan: MixPlanOut;
  weighed: Weighed;
  coating: CoatingInput | null;
  coatingVolumes: { capMl: number; solventMl: number; totalMl: number } | null;
  cureMinutes: number;
  notes: string | null;
  photoFileId: string | null;
  photoThumbFileId: string | null;
  createdAt: Date;
  updatedAt: Date;
  version: number;
}

/** A build's own fields as written; materials and pieces are written beside it. */
export interface BuildValues {
  madeOn: string;
  madeBy: string;
  mix: MixInput;
  plan: MixPlanOut;
  weighed: Weighed;
  coating: CoatingInput | null;
  coatingVolumes: { capMl: number; solventMl: number; totalMl: number } | null;
  cureMinutes: number;
  notes: string | null;
}

export interface MaterialRow {
  buildId: string;
  position: number;
  role: BuildMaterialRole;
  productId: string;
  lotId: string;
  formulationId: string;
}

function buildQuery(db: Db) {
  return db
    .selectFrom('appliance_builds as b')
    .select([
      'b.id',
      'b.production_id',
      'b.performer_id',
      'b.mold_id',
      'b.made_on',
      'b.made_by',
      'b.mix_input',
      'b.mix_plan',
      'b.weighed',
      'b.coating_input',
      'b.coating_volumes',
      'b.cure_minutes',
      'b.notes',
      'b.photo_file_id',
      'b.photo_thumb_file_id',
      'b.created_at',
      'b.updated_at',
      'b.version',
    ]);
}
type Selected = Awaited<ReturnType<ReturnType<typeof buildQuery>['executeTakeFirstOrThrow']>>;

function toBuild(r: Selected): BuildRow {
  return {
    id: r.id,
    productionId: r.production_id,
    performerId: r.performer_id,
    moldId: r.mold_id,
    madeOn: r.made_on,
    madeBy: r.made_by,
    mix: MixInputSchema.parse(r.mix_input),
    plan: MixPlanSchema.parse(r.mix_plan),
    weighed: WeighedSchema.parse(r.weighed),
    coating: r.coating_input === null ? null : CoatingInputSchema.parse(r.coating_input),
    coatingVolumes: r.coating_volumes === null ? null : CoatingVolumesSchema.parse(r.coating_volumes),
    cureMinutes: r.cure_minutes,
    notes: r.notes,
    photoFileId: r.photo_file_id,
    photoThumbFileId: r.photo_thumb_file_id,
    createdAt: new Date(r.created_at),
    updatedAt: new Date(r.updated_at),
    version: r.version,
  };
}

export async function findBuild(db: Db, id: string): Promise<BuildRow | undefined> {
  const r = await buildQuery(db).where('b.id', '=', id).executeTakeFirst();
  return r ? toBuild(r) : undefined;
}

/** Takes the build's row lock for a change to it, its materials or its pieces. */
export async function lockBuild(db: Db, id: string): Promise<BuildRow | undefined> {
  const r = await buildQuery(db).where('b.id', '=', id).forUpdate().executeTakeFirst();
  return r ? toBuild(r) : undefined;
}

export interface BuildFilter {
  productionIds: readonly string[];
  performerId?: string;
  moldId?: string;
}

/** One page of builds on these productions, newest first unless asked otherwise, and how many match. */
export async function listBuilds(db: Db, f: BuildFilter, page: { page: number; pageSize: number; dir: 'asc' | 'desc' }): Promise<{ rows: BuildRow[]; total: number }> {
  if (f.productionIds.length === 0) return { rows: [], total: 0 };
  let q = buildQuery(db).where('b.production_id', 'in', [...f.productionIds]);
  if (f.performerId) q = q.where('b.performer_id', '=', f.performerId);
  if (f.moldId) q = q.where('b.mold_id', '=', f.moldId);
  const rows = await q
    .orderBy('b.made_on', page.dir)
    .orderBy('b.created_at', page.dir)
    .limit(page.pageSize)
    .offset((page.page - 1) * page.pageSize)
    .execute();
  let c = db.selectFrom('appliance_builds as b').select((eb) => eb.fn.countAll<string>().as('n')).where('b.production_id', 'in', [...f.productionIds]);
  if (f.performerId) c = c.where('b.performer_id', '=', f.performerId);
  if (f.moldId) c = c.where('b.mold_id', '=', f.moldId);
  const count = await c.executeTakeFirstOrThrow();
  return { rows: rows.map(toBuild), total: Number(count.n) };
}

/** Every build of one performer (on these productions, when named), newest first: a performer's record. */
export async function listBuildsOfPerformer(db: Db, performerId: string, productionIds: readonly string[] | null): Promise<BuildRow[]> {
  if (productionIds?.length === 0) return [];
  let q = buildQuery(db).where('b.performer_id', '=', performerId);
  if (productionIds) q = q.where('b.production_id', 'in', [...productionIds]);
  const rows = await q
    .orderBy('b.made_on', 'desc')
    .orderBy('b.created_at', 'desc')
    .limit(500)
    .execute();
  return rows.map(toBuild);
}

function columns(v: BuildValues) {
  return {
    made_on: v.madeOn,
    made_by: v.madeBy,
    mix_input: JSON.stringify(v.mix),
    mix_plan: JSON.stringify(v.plan),
    weighed: JSON.stringify(v.weighed),
    coating_input: v.coating ? JSON.stringify(v.coating) : null,
    coating_volumes: v.coatingVolumes ? JSON.stringify(v.coatingVolumes) : null,
    cure_minutes: v.cureMinutes,
    notes: v.notes,
  };
}

export async function insertBuild(db: Db, b: BuildValues & { productionId: string; performerId: string; moldId: string; createdBy: string | null }): Promise<string> {
  const r = await db
    .insertInto('appliance_builds')
    .values({ ...columns(b), production_id: b.productionId, performer_id: b.performerId, mold_id: b.moldId, created_by: b.createdBy })
    .returning('id')
    .executeTakeFirstOrThrow();
  return r.id;
}

/** Writes the build's fields if it is still at `version`, moving it to the next. */
export async function updateBuildAtVersion(db: Db, id: string, v: BuildValues, version: number): Promise<boolean> {
  const res = await db
    .updateTable('appliance_builds')
    .set({ ...columns(v), updated_at: sql`now()`, version: sql`version + 1` })
    .where('id', '=', id)
    .where('version', '=', version)
    .executeTakeFirst();
  return Number(res.numUpdatedRows) === 1;
}

/** Points the build at a new photo and its thumbnail; answers the files it pointed at before. */
export async function setBuildPhoto(db: Db, id: string, fileId: string, thumbFileId: string): Promise<string[]> {
  const before = await db.selectFrom('appliance_builds').select(['photo_file_id', 'photo_thumb_file_id']).where('id', '=', id).executeTakeFirstOrThrow();
  await db.updateTable('appliance_builds').set({ photo_file_id: fileId, photo_thumb_file_id: thumbFileId, updated_at: sql`now()` }).where('id', '=', id).execute();
  return [before.photo_file_id, before.photo_thumb_file_id].filter((f): f is string => f !== null);
}

/** Deletes file rows nobody points at any more; answers where their bytes are, to discard once committed. */
export async function deleteFileRows(db: Db, ids: readonly string[]): Promise<{ storagePath: string }[]> {
  if (ids.length === 0) return [];
  const rows = await db.deleteFrom('files').where('id', 'in', [...ids]).returning('storage_path').execute();
  return rows.map((r) => ({ storagePath: r.storage_path }));
}

// ---- materials

/** The materials of many builds in listed order, from one query. */
export async function listMaterials(db: Db, buildIds: readonly string[]): Promise<Map<string, MaterialRow[]>> {
  const out = new Map<string, MaterialRow[]>();
  if (buildIds.length === 0) return out;
  const rows = await db
    .selectFrom('appliance_build_materials')
    .select(['build_id', 'position', 'role', 'product_id', 'lot_id', 'formulation_id'])
    .where('build_id', 'in', [...new Set(buildIds)])
    .orderBy('build_id')
    .orderBy('position')
    .execute();
  for (const r of rows) {
    const list = out.get(r.build_id) ?? out.set(r.build_id, []).get(r.build_id)!;
    list.push({ buildId: r.build_id, position: r.position, role: r.role, productId: r.product_id, lotId: r.lot_id, formulationId: r.formulation_id });
  }
  return out;
}

/** Replaces a build's materials with these, in this order. */
export async function replaceMaterials(db: Db, buildId: string, materials: readonly Omit<MaterialRow, 'buildId' | 'position'>[]): Promise<void> {
  await db.deleteFrom('appliance_build_materials').where('build_id', '=', buildId).execute();
  if (materials.length === 0) return;
  await db
    .insertInto('appliance_build_materials')
    .values(materials.map((m, position) => ({ build_id: buildId, position, role: m.role, product_id: m.productId, lot_id: m.lotId, formulation_id: m.formulationId })))
    .execute();
}

/** What the artist's check needs of appliance pieces and builds: their materials, as ids only. */
export interface MaterialUseRow {
  buildId: string;
  productionId: string;
  performerId: string;
  /** Of the pieces asked about, those of this build. */
  pieceIds: string[];
  role: BuildMaterialRole;
  productId: string;
  lotId: string;
  formulationId: string;
}

/** Materials of the builds named, and of the builds of the pieces named: one query. */
export async function findMaterialUses(db: Db, pieceIds: readonly string[], buildIds: readonly string[]): Promise<MaterialUseRow[]> {
  if (pieceIds.length === 0 && buildIds.length === 0) return [];
  const pieces = sql`${[...new Set(pieceIds)]}::uuid[]`;
  const builds = sql`${[...new Set(buildIds)]}::uuid[]`;
  const rows = await db
    .selectFrom('appliance_builds as b')
    .innerJoin('appliance_build_materials as m', 'm.build_id', 'b.id')
    .select([
      'b.id',
      'b.production_id',
      'b.performer_id',
      'm.role',
      'm.product_id',
      'm.lot_id',
      'm.formulation_id',
      sql<string[]>`coalesce((select array_agg(ap.id::text order by ap.number) from appliance_pieces ap where ap.build_id = b.id and ap.id = any(${pieces})), '{}'::text[])`.as('piece_ids'),
    ])
    .where(sql<boolean>`b.id = any(${builds}) or b.id in (select ap.build_id from appliance_pieces ap where ap.id = any(${pieces}))`)
    .orderBy('b.id')
    .orderBy('m.position')
    .execute();
  return rows.map((r) => ({
    buildId: r.id,
    productionId: r.production_id,
    performerId: r.performer_id,
    pieceIds: r.piece_ids,
    role: r.role,
    productId: r.product_id,
    lotId: r.lot_id,
    formulationId: r.formulation_id,
  }));
}
