import { sql } from 'kysely';
import type { ConsentKind } from '#shared/domain/consent.ts';
import { type Question, QuestionsSchema } from '#shared/domain/questionnaire.ts';
import type { Template, TemplateVersionList } from '#shared/schemas/consents.ts';
import type { Db } from '../../db/index.ts';

export interface TemplateVersionRow {
  versionId: string;
  templateId: string;
  kind: ConsentKind;
  version: number;
  title: string;
  body: string;
  questions: Question[];
  validityDays: number | null;
}

/** The questionnaire column, read back through its schema: what was stored is what the form defines. */
function questionsOf(raw: unknown): Question[] {
  return QuestionsSchema.parse(raw);
}

export async function findTemplateVersion(db: Db, versionId: string): Promise<TemplateVersionRow | undefined> {
  const r = await db
    .selectFrom('consent_template_versions as v')
    .innerJoin('consent_templates as t', 't.id', 'v.template_id')
    .select(['v.id', 'v.template_id', 't.kind', 'v.version', 'v.title', 'v.body', 'v.questions', 'v.validity_days'])
    .where('v.id', '=', versionId)
    .executeTakeFirst();
  return r
    ? { versionId: r.id, templateId: r.template_id, kind: r.kind, version: r.version, title: r.title, body: r.body, questions: questionsOf(r.questions), validityDays: r.validity_days }
    : undefined;
}

export async function findCurrentTemplateVersion(db: Db, templateId: string): Promise<TemplateVersionRow | undefined> {
  const r = await db
    .selectFrom('consent_templates as t')
    .innerJoin('consent_template_versions as v', (j) => j.onRef('v.template_id', '=', 't.id').onRef('v.version', '=', 't.current_version'))
    .select('v.id')
    .where('t.id', '=', templateId)
    .executeTakeFirst();
  return r ? findTemplateVersion(db, r.id) : undefined;
}

function templateQuery(db: Db) {
  return db
    .selectFrom('consent_templates as t')
    .innerJoin('consent_template_versions as v', (j) => j.onRef('v.template_id', '=', 't.id').onRef('v.version', '=', 't.current_version'))
    .select([
      't.id',
      'v.id as version_id',
      't.kind',
      't.current_version',
      'v.title',
      'v.body',
      'v.questions',
      'v.validity_days',
      't.archived',
      'v.created_at',
      sql<string>`(select count(*) from consents c join consent_template_versions cv on cv.id = c.template_version_id where cv.template_id = t.id)`.as('signed_count'),
    ]);
}
type TemplateRow = Awaited<ReturnType<ReturnType<typeof templateQuery>['executeTakeFirstOrThrow']>>;

function toTemplate(r: TemplateRow): Template {
  return {
    id: r.id,
    versionId: r.version_id,
    kind: r.kind,
    version: r.current_version,
    title: r.title,
    body: r.body,
    questions: questionsOf(r.questions),
    validityDays: r.validity_days,
    archived: r.archived,
    updatedAt: new Date(r.created_at).toISOString(),
    signedCount: Number(r.signed_count),
  };
}

export async function listTemplates(db: Db, includeArchived: boolean): Promise<Template[]> {
  let q = templateQuery(db);
  if (!includeArchived) q = q.where('t.archived', '=', false);
  return (await q.orderBy('t.kind').orderBy('v.title').execute()).map(toTemplate);
}

export async function findTemplate(db: Db, id: string): Promise<Template | undefined> {
  const r = await templateQuery(db).where('t.id', '=', id).executeTakeFirst();
  return r ? toTemplate(r) : undefined;
}

export async function listTemplateVersions(db: Db, templateId: string): Promise<TemplateVersionList['items']> {
  const rows = await db
    .selectFrom('consent_template_versions as v')
    .leftJoin('users as u', 'u.id', 'v.created_by')
    .select(['v.id', 'v.version', 'v.title', 'v.created_at', 'u.display_name'])
    .where('v.template_id', '=', templateId)
    .orderBy('v.version', 'desc')
    .execute();
  return rows.map((r) => ({ versionId: r.id, version: r.version, title: r.title, createdAt: new Date(r.created_at).toISOString(), createdBy: r.display_name }));
}

/** Whether a form may be sent now: it exists and is not archived. */
export async function isTemplateSendable(db: Db, templateId: string): Promise<boolean> {
  const t = await db.selectFrom('consent_templates').select('archived').where('id', '=', templateId).executeTakeFirst();
  return Boolean(t && !t.archived);
}

export async function lockTemplate(db: Db, id: string): Promise<{ id: string; kind: ConsentKind; currentVersion: number } | undefined> {
  const t = await db.selectFrom('consent_templates').select(['id', 'kind', 'current_version']).where('id', '=', id).forUpdate().executeTakeFirst();
  return t ? { id: t.id, kind: t.kind, currentVersion: t.current_version } : undefined;
}

export async function insertTemplate(db: Db, kind: ConsentKind): Promise<string> {
  return (await db.insertInto('consent_templates').values({ kind }).returning('id').executeTakeFirstOrThrow()).id;
}

export async function insertTemplateVersion(
  db: Db,
  v: { templateId: string; version: number; title: string; body: string; questions: readonly Question[]; validityDays: number | null; createdBy: string },
): Promise<void> {
  await db
    .insertInto('consent_template_versions')
    .values({ template_id: v.templateId, version: v.version, title: v.title, body: v.body, questions: JSON.stringify(v.questions), validity_days: v.validityDays, created_by: v.createdBy })
    .execute();
}

export async function setTemplateCurrentVersion(db: Db, id: string, version: number, kind: ConsentKind): Promise<void> {
  await db.updateTable('consent_templates').set({ current_version: version, kind }).where('id', '=', id).execute();
}

export async function setTemplateArchived(db: Db, id: string, archived: boolean): Promise<boolean> {
  const r = await db.updateTable('consent_templates').set({ archived }).where('id', '=', id).executeTakeFirst();
  return Number(r.numUpdatedRows) === 1;
}

/** Productions that have sent or signed this form: those whose lead may loosen its health questions. */
export async function productionsUsingTemplate(db: Db, templateId: string): Promise<string[]> {
  const rows = await db
    .selectFrom('signing_requests')
    .select('production_id')
    .where('template_id', '=', templateId)
    .where('production_id', 'is not', null)
    .union(
      db
        .selectFrom('consents as c')
        .innerJoin('consent_template_versions as v', 'v.id', 'c.template_version_id')
        .select('c.production_id')
        .where('v.template_id', '=', templateId)
        .where('c.production_id', 'is not', null),
    )
    .execute();
  return rows.flatMap((r) => (r.production_id ? [r.production_id] : []));
}
