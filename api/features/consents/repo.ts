import { sql } from 'kysely';
import { consentState, type ConsentKind } from '#shared/domain/consent.ts';
import type { Question } from '#shared/domain/questionnaire.ts';
import type { ConsentSummary, Template } from '#shared/schemas/consents.ts';
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

export async function findTemplateVersion(db: Db, versionId: string): Promise<TemplateVersionRow | undefined> {
  const r = await db
    .selectFrom('consent_template_versions as v')
    .innerJoin('consent_templates as t', 't.id', 'v.template_id')
    .select(['v.id', 'v.template_id', 't.kind', 'v.version', 'v.title', 'v.body', 'v.questions', 'v.validity_days'])
    .where('v.id', '=', versionId)
    .executeTakeFirst();
  return r
    ? { versionId: r.id, templateId: r.template_id, kind: r.kind, version: r.version, title: r.title, body: r.body, questions: r.questions as Question[], validityDays: r.validity_days }
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
    questions: r.questions as Question[],
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

export function consentSummaryQuery(db: Db) {
  return db
    .selectFrom('consents as c')
    .innerJoin('consent_template_versions as v', 'v.id', 'c.template_version_id')
    .innerJoin('performers as p', 'p.id', 'c.performer_id')
    .select([
      'c.id',
      'c.performer_id',
      sql<string>`coalesce(p.preferred_name, p.legal_name)`.as('performer_name'),
      'c.production_id',
      'c.kind',
      'v.title',
      'v.version as template_version',
      'c.signed_at',
      'c.expires_at',
      'c.withdrawn_at',
      'c.signer_name',
      'c.signing_method',
      'c.version',
    ]);
}
export type ConsentSummaryRow = Awaited<ReturnType<ReturnType<typeof consentSummaryQuery>['executeTakeFirstOrThrow']>>;

export function toConsentSummary(r: ConsentSummaryRow, now = new Date()): ConsentSummary {
  const signedAt = new Date(r.signed_at);
  const expiresAt = r.expires_at ? new Date(r.expires_at) : null;
  const withdrawnAt = r.withdrawn_at ? new Date(r.withdrawn_at) : null;
  return {
    id: r.id,
    performerId: r.performer_id,
    performerName: r.performer_name,
    productionId: r.production_id,
    kind: r.kind,
    title: r.title,
    templateVersion: r.template_version,
    signedAt: signedAt.toISOString(),
    expiresAt: expiresAt?.toISOString() ?? null,
    state: consentState({ signedAt, expiresAt, withdrawnAt }, now),
    signerName: r.signer_name,
    signingMethod: r.signing_method,
    withdrawnAt: withdrawnAt?.toISOString() ?? null,
    version: r.version,
  };
}

/** Productions a performer is engaged on: the scope every permission question about them uses. */
export async function performerScope(
  db: Db,
  performerId: string,
): Promise<{ id: string; name: string; email: string | null; emailUnconfirmed: boolean; productionIds: string[] } | undefined> {
  const p = await db
    .selectFrom('performers')
    .select(['id', sql<string>`coalesce(preferred_name, legal_name)`.as('name'), 'email', 'email_confirmed_at'])
    .where('id', '=', performerId)
    .executeTakeFirst();
  if (!p) return undefined;
  const e = await db.selectFrom('engagements').select('production_id').where('performer_id', '=', performerId).execute();
  // `email` is the address mail may go to: only one the performer confirmed.
  const confirmed = p.email !== null && p.email_confirmed_at !== null;
  return { id: p.id, name: p.name, email: confirmed ? p.email : null, emailUnconfirmed: p.email !== null && !confirmed, productionIds: e.map((x) => x.production_id) };
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
  return rows.map((r) => r.production_id!).filter(Boolean);
}

/** Cast-storage consents of these performers, each with the production it was given to (null: none named). */
export async function storageConsentTimes(
  db: Db,
  performerIds: readonly string[],
): Promise<{ performerId: string; productionId: string | null; signedAt: Date; expiresAt: Date | null; withdrawnAt: Date | null }[]> {
  if (performerIds.length === 0) return [];
  const rows = await db
    .selectFrom('consents')
    .select(['performer_id', 'production_id', 'signed_at', 'expires_at', 'withdrawn_at'])
    .where('kind', '=', 'cast_storage')
    .where('performer_id', 'in', [...new Set(performerIds)])
    .execute();
  return rows.map((r) => ({
    performerId: r.performer_id,
    productionId: r.production_id,
    signedAt: new Date(r.signed_at),
    expiresAt: r.expires_at ? new Date(r.expires_at) : null,
    withdrawnAt: r.withdrawn_at ? new Date(r.withdrawn_at) : null,
  }));
}
