import { sql } from 'kysely';
import type { Db } from '../../db/index.ts';
import { upcomingBookingsJsonSql } from '../bookings/index.ts';
import { consentsJsonSql } from '../consents/index.ts';
import { userSummaryJsonSql } from '../users/index.ts';

// ---- shapes

/** The editable fields, camelCase as in PerformerFieldsSchema. */
export interface PerformerFields {
  legalName: string;
  preferredName: string | null;
  pronouns: string | null;
  email: string | null;
  phone: string | null;
  emergencyContactName: string | null;
  emergencyContactPhone: string | null;
  agentName: string | null;
  agentContact: string | null;
  notes: string | null;
}

export interface PerformerRecord extends PerformerFields {
  id: string;
  userId: string | null;
  /** The performer confirmed `email` as theirs (only then does their mail go there). */
  emailConfirmed: boolean;
  portraitFileId: string | null;
  portraitThumbFileId: string | null;
  createdAt: string;
  version: number;
}

export interface EngagementRecord {
  performerId: string;
  productionId: string;
  productionName: string;
  characterName: string | null;
  startsOn: string | null;
  endsOn: string | null;
}

export interface EngagementValues {
  productionId: string;
  characterName: string | null;
  startsOn: string | null;
  endsOn: string | null;
}

export const PERFORMER_COLUMNS = [
  'performers.id',
  'performers.legal_name',
  'performers.preferred_name',
  'performers.pronouns',
  'performers.email',
  'performers.phone',
  'performers.emergency_contact_name',
  'performers.emergency_contact_phone',
  'performers.agent_name',
  'performers.agent_contact',
  'performers.notes',
  'performers.user_id',
  'performers.email_confirmed_at',
  'performers.portrait_file_id',
  'performers.portrait_thumb_file_id',
  'performers.created_at',
  'performers.version',
] as const;

// ---- one performer

function selectPerformer(db: Db) {
  return db.selectFrom('performers').select(PERFORMER_COLUMNS);
}
type PerformerDbRow = Awaited<ReturnType<ReturnType<typeof selectPerformer>['executeTakeFirstOrThrow']>>;

export function toRecord(r: PerformerDbRow): PerformerRecord {
  return {
    id: r.id,
    legalName: r.legal_name,
    preferredName: r.preferred_name,
    pronouns: r.pronouns,
    email: r.email,
    phone: r.phone,
    emergencyContactName: r.emergency_contact_name,
    emergencyContactPhone: r.emergency_contact_phone,
    agentName: r.agent_name,
    agentContact: r.agent_contact,
    notes: r.notes,
    userId: r.user_id,
    emailConfirmed: r.email !== null && r.email_confirmed_at !== null,
    portraitFileId: r.portrait_file_id,
    portraitThumbFileId: r.portrait_thumb_file_id,
    createdAt: new Date(r.created_at).toISOString(),
    version: r.version,
  };
}

export async function findPerformer(db: Db, id: string): Promise<PerformerRecord | undefined> {
  const row = await selectPerformer(db).where('performers.id', '=', id).executeTakeFirst();
  return row ? toRecord(row) : undefined;
}

/** Takes the performer's row lock, so two writers to one performer queue rather than race. */
export async function lockPerformer(db: Db, id: string): Promise<PerformerRecord | undefined> {
  const row = await selectPerformer(db).where('performers.id', '=', id).forUpdate().executeTakeFirst();
  return row ? toRecord(row) : undefined;
}

/** Engagements of these performers, by performer, each list ordered by production name. */
export async function listEngagements(db: Db, performerIds: readonly string[]): Promise<Map<string, EngagementRecord[]>> {
  const out = new Map<string, EngagementRecord[]>();
  if (performerIds.length === 0) return out;
  const rows = await db
    .selectFrom('engagements')
    .innerJoin('productions', 'productions.id', 'engagements.production_id')
    .select([
      'engagements.performer_id',
      'engagements.production_id',
      'productions.name as production_name',
      'engagements.character_name',
      'engagements.starts_on',
      'engagements.ends_on',
    ])
    .where('engagements.performer_id', 'in', [...performerIds])
    .orderBy('productions.name')
    .execute();
  for (const r of rows) {
    const list = out.get(r.performer_id) ?? [];
    list.push({
      performerId: r.performer_id,
      productionId: r.production_id,
      productionName: r.production_name,
      characterName: r.character_name,
      startsOn: r.starts_on ?? null,
      endsOn: r.ends_on ?? null,
    });
    out.set(r.performer_id, list);
  }
  return out;
}

export function portraitUrl(performerId: string, fileId: string | null): string | null {
  return fileId ? `/api/performers/${performerId}/portrait?v=${fileId}` : null;
}
export function thumbnailUrl(performerId: string, fileId: string | null): string | null {
  return fileId ? `/api/performers/${performerId}/portrait/thumbnail?v=${fileId}` : null;
}

/** Whether the performer is engaged on the production (a booking or a request needs it). */
export async function isEngagedOn(db: Db, performerId: string, productionId: string): Promise<boolean> {
  const row = await db.selectFrom('engagements').select('id').where('performer_id', '=', performerId).where('production_id', '=', productionId).executeTakeFirst();
  return Boolean(row);
}

/**
 * Who a performer is for permission questions and for mail: name, the address mail may go to
 * (only one they confirmed), the linked sign-in and the productions they are engaged on.
 */
export interface PerformerScope {
  id: string;
  name: string;
  email: string | null;
  emailUnconfirmed: boolean;
  userId: string | null;
  productionIds: string[];
}

export async function findPerformerScope(db: Db, performerId: string): Promise<PerformerScope | undefined> {
  const p = await db
    .selectFrom('performers')
    .select([
      'id',
      sql<string>`coalesce(preferred_name, legal_name)`.as('name'),
      'email',
      'email_confirmed_at',
      'user_id',
      sql<string[]>`array(select e.production_id::text from engagements e where e.performer_id = performers.id)`.as('production_ids'),
    ])
    .where('id', '=', performerId)
    .executeTakeFirst();
  if (!p) return undefined;
  const confirmed = p.email !== null && p.email_confirmed_at !== null;
  return { id: p.id, name: p.name, email: confirmed ? p.email : null, emailUnconfirmed: p.email !== null && !confirmed, userId: p.user_id, productionIds: p.production_ids };
}

export async function engagedProductionIds(db: Db, performerId: string): Promise<string[]> {
  const rows = await db.selectFrom('engagements').select('production_id').where('performer_id', '=', performerId).execute();
  return rows.map((r) => r.production_id);
}

// ---- writes

function fieldColumns(f: PerformerFields) {
  return {
    legal_name: f.legalName,
    preferred_name: f.preferredName,
    pronouns: f.pronouns,
    email: f.email,
    phone: f.phone,
    emergency_contact_name: f.emergencyContactName,
    emergency_contact_phone: f.emergencyContactPhone,
    agent_name: f.agentName,
    agent_contact: f.agentContact,
    notes: f.notes,
  };
}

/** Another performer already using this e-mail (compared case-insensitively, as the unique index does). */
export async function findPerformerIdByEmail(db: Db, email: string, exceptId?: string): Promise<string | undefined> {
  let q = db.selectFrom('performers').select('id').where(sql`lower(email)`, '=', email.toLowerCase());
  if (exceptId) q = q.where('id', '!=', exceptId);
  return (await q.executeTakeFirst())?.id;
}

/** Existing performers by lower-cased e-mail, with the productions each is engaged on. */
export async function findPerformersByEmails(db: Db, emails: readonly string[]): Promise<Map<string, { id: string; productionIds: string[] }>> {
  const out = new Map<string, { id: string; productionIds: string[] }>();
  if (emails.length === 0) return out;
  const rows = await db
    .selectFrom('performers')
    .select([
      'performers.id',
      sql<string>`lower(performers.email)`.as('email'),
      sql<string[]>`array(select e.production_id::text from engagements e where e.performer_id = performers.id)`.as('production_ids'),
    ])
    .where(sql`lower(performers.email)`, 'in', emails.map((e) => e.toLowerCase()))
    .execute();
  for (const r of rows) out.set(r.email, { id: r.id, productionIds: r.production_ids });
  return out;
}

export async function insertPerformer(db: Db, f: PerformerFields, id?: string): Promise<string> {
  const row = await db
    .insertInto('performers')
    .values({ ...(id ? { id } : {}), ...fieldColumns(f) })
    .returning('id')
    .executeTakeFirstOrThrow();
  return row.id;
}

/** Many new performers at once, ids chosen by the caller (an import). */
export async function insertPerformers(db: Db, rows: readonly (PerformerFields & { id: string })[]): Promise<void> {
  for (let i = 0; i < rows.length; i += 500) {
    const chunk = rows.slice(i, i + 500);
    await db.insertInto('performers').values(chunk.map((r) => ({ id: r.id, ...fieldColumns(r) }))).execute();
  }
}

/** Updates only if the row is still at the version the editor saw; returns false when it is not. */
export async function updatePerformerAtVersion(db: Db, id: string, f: PerformerFields, version: number): Promise<boolean> {
  const res = await db
    .updateTable('performers')
    .set({ ...fieldColumns(f), version: sql`version + 1`, updated_at: sql`now()` })
    .where('id', '=', id)
    .where('version', '=', version)
    .executeTakeFirst();
  return Number(res.numUpdatedRows) === 1;
}

export async function insertEngagements(db: Db, rows: readonly (EngagementValues & { performerId: string })[]): Promise<void> {
  for (let i = 0; i < rows.length; i += 500) {
    const chunk = rows.slice(i, i + 500);
    if (chunk.length === 0) continue;
    await db
      .insertInto('engagements')
      .values(
        chunk.map((e) => ({
          performer_id: e.performerId,
          production_id: e.productionId,
          character_name: e.characterName,
          starts_on: e.startsOn,
          ends_on: e.endsOn,
        })),
      )
      .execute();
  }
}

export async function updateEngagement(db: Db, performerId: string, e: EngagementValues): Promise<void> {
  await db
    .updateTable('engagements')
    .set({ character_name: e.characterName, starts_on: e.startsOn, ends_on: e.endsOn })
    .where('performer_id', '=', performerId)
    .where('production_id', '=', e.productionId)
    .execute();
}

export async function deleteEngagements(db: Db, performerId: string, productionIds: readonly string[]): Promise<void> {
  if (productionIds.length === 0) return;
  await db.deleteFrom('engagements').where('performer_id', '=', performerId).where('production_id', 'in', [...productionIds]).execute();
}

export async function findPerformerLinkedTo(db: Db, userId: string): Promise<{ id: string; legalName: string } | undefined> {
  const row = await db.selectFrom('performers').select(['id', 'legal_name']).where('user_id', '=', userId).executeTakeFirst();
  return row ? { id: row.id, legalName: row.legal_name } : undefined;
}

export async function setPerformerUserAtVersion(db: Db, id: string, userId: string | null, version: number): Promise<boolean> {
  const res = await db
    .updateTable('performers')
    .set({ user_id: userId, version: sql`version + 1`, updated_at: sql`now()` })
    .where('id', '=', id)
    .where('version', '=', version)
    .executeTakeFirst();
  return Number(res.numUpdatedRows) === 1;
}

/** Points the performer at a new portrait (or none); returns the files it pointed at before. */
export async function setPortraitFiles(db: Db, id: string, portraitFileId: string | null, thumbFileId: string | null): Promise<string[]> {
  const before = await db.selectFrom('performers').select(['portrait_file_id', 'portrait_thumb_file_id']).where('id', '=', id).forUpdate().executeTakeFirstOrThrow();
  await db.updateTable('performers').set({ portrait_file_id: portraitFileId, portrait_thumb_file_id: thumbFileId, updated_at: sql`now()` }).where('id', '=', id).execute();
  return [before.portrait_file_id, before.portrait_thumb_file_id].filter((f): f is string => f !== null);
}

/** Deletes file rows nothing points at any more; returns their storage paths so the bytes can go after commit. */
export async function deleteFileRows(db: Db, ids: readonly string[]): Promise<{ storagePath: string }[]> {
  if (ids.length === 0) return [];
  const rows = await db.deleteFrom('files').where('id', 'in', [...ids]).returning('storage_path').execute();
  return rows.map((r) => ({ storagePath: r.storage_path }));
}

/**
 * Performers whose engagement on the production has not ended by `today` (YYYY-MM-DD, the studio's day),
 * as a one-column query (`n`) for a counts statement.
 */
export function engagedNowCount(db: Db, productionId: string, today: string) {
  return db
    .selectFrom('engagements')
    .select((eb) => eb.fn.countAll<string>().as('n'))
    .where('production_id', '=', productionId)
    .where((eb) => eb.or([eb('ends_on', 'is', null), eb('ends_on', '>=', today)]));
}

/** Linked sign-ins of these performers (those without one are left out). */
export async function findPerformerUserIds(db: Db, performerIds: readonly string[]): Promise<Map<string, string>> {
  if (performerIds.length === 0) return new Map();
  const rows = await db.selectFrom('performers').select(['id', 'user_id']).where('id', 'in', [...performerIds]).where('user_id', 'is not', null).execute();
  return new Map(rows.map((r) => [r.id, r.user_id!]));
}

/**
 * One performer with everything their page shows, in one statement: engagements (ours), and the
 * consents, upcoming sessions and linked sign-in from the fragments their own features export.
 */
export async function findPerformerDetailRow(db: Db, id: string, now: Date) {
  const pid = sql.ref<string>('performers.id');
  const row = await selectPerformer(db)
    .select([
      sql<EngagementJsonRow[]>`coalesce((
        select json_agg(json_build_object('production_id', e.production_id, 'production_name', pr.name, 'character_name', e.character_name, 'starts_on', e.starts_on, 'ends_on', e.ends_on) order by pr.name)
        from engagements e join productions pr on pr.id = e.production_id where e.performer_id = performers.id
      ), '[]'::json)`.as('engagements_json'),
      consentsJsonSql(sql`${pid}`).as('consents_json'),
      upcomingBookingsJsonSql(sql`${pid}`, now).as('bookings_json'),
      userSummaryJsonSql(sql`performers.user_id`).as('linked_user_json'),
    ])
    .where('performers.id', '=', id)
    .executeTakeFirst();
  if (!row) return undefined;
  const performer = toRecord(row);
  const engagements: EngagementRecord[] = row.engagements_json.map((e) => ({
    performerId: id,
    productionId: e.production_id,
    productionName: e.production_name,
    characterName: e.character_name,
    startsOn: e.starts_on,
    endsOn: e.ends_on,
  }));
  return { performer, engagements, consents: row.consents_json, bookings: row.bookings_json, linkedUser: row.linked_user_json };
}

interface EngagementJsonRow {
  production_id: string;
  production_name: string;
  character_name: string | null;
  starts_on: string | null;
  ends_on: string | null;
}

/** One performer's engagements, by production name. */
export async function listEngagementsOf(db: Db, performerId: string): Promise<EngagementRecord[]> {
  return (await listEngagements(db, [performerId])).get(performerId) ?? [];
}
