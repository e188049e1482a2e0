import { type RawBuilder, sql } from 'kysely';
import type { ConsentForGate } from '#shared/domain/bookings.ts';
import { type ConsentKind, type ConsentState, consentState } from '#shared/domain/consent.ts';
import type { ConsentSummary } from '#shared/schemas/consents.ts';
import { openJson, sealJson } from '../../crypto/medical.ts';
import type { Db } from '../../db/index.ts';

// ---- the consent rules in SQL, mirroring consentState() and coversMoment() in shared/domain/consent.ts
// (tests/api/consent-sql.test.ts checks both agree on every seeded consent).

/** The state of consent row `alias` at a moment: withdrawn beats expired beats active. */
export function consentStateSql(alias: string, at: Date): RawBuilder<ConsentState> {
  const c = sql.table(alias);
  return sql<ConsentState>`(case when ${c}.withdrawn_at is not null and ${c}.withdrawn_at <= ${at} then 'withdrawn' when ${c}.expires_at is not null and ${c}.expires_at <= ${at} then 'expired' else 'active' end)`;
}

/** Whether consent row `alias` covers a moment: signed by then, and neither withdrawn nor expired. */
export function consentCoversSql(alias: string, at: Date): RawBuilder<boolean> {
  const c = sql.table(alias);
  return sql<boolean>`(${c}.signed_at <= ${at} and ${consentStateSql(alias, at)} = 'active')`;
}

// ---- summaries

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

/** A performer's signed consents, newest first. */
export async function listConsentSummaries(db: Db, performerId: string, now = new Date()): Promise<ConsentSummary[]> {
  const rows = await consentSummaryQuery(db).where('c.performer_id', '=', performerId).orderBy('c.signed_at', 'desc').orderBy('c.id').execute();
  return rows.map((r) => toConsentSummary(r, now));
}

export async function findConsentSummary(db: Db, id: string): Promise<ConsentSummary | undefined> {
  const r = await consentSummaryQuery(db).where('c.id', '=', id).executeTakeFirst();
  return r ? toConsentSummary(r) : undefined;
}

export async function findConsentSummaryByPdfHash(db: Db, sha256: string): Promise<ConsentSummary | undefined> {
  const r = await consentSummaryQuery(db).where('c.pdf_sha256', '=', sha256).executeTakeFirst();
  return r ? toConsentSummary(r) : undefined;
}

/** The consent whose full copy or staff-safe copy has this SHA-256, and which copy it is. */
export async function findConsentByAnyPdfHash(db: Db, sha256: string): Promise<{ summary: ConsentSummary; copy: 'full' | 'staff' } | undefined> {
  const r = await consentSummaryQuery(db)
    .select(sql<boolean>`c.staff_pdf_sha256 = ${sha256}`.as('is_staff'))
    .where((eb) => eb.or([eb('c.pdf_sha256', '=', sha256), eb('c.staff_pdf_sha256', '=', sha256)]))
    .executeTakeFirst();
  return r ? { summary: toConsentSummary(r), copy: r.is_staff ? 'staff' : 'full' } : undefined;
}

/** Locks the consent row; true when it still has no staff copy to keep. */
export async function lockStaffCopySlot(db: Db, consentId: string): Promise<boolean> {
  const r = await db.selectFrom('consents').select('staff_pdf_file_id').where('id', '=', consentId).forUpdate().executeTakeFirst();
  return Boolean(r && r.staff_pdf_file_id === null);
}

export async function setStaffCopy(db: Db, consentId: string, file: { id: string; sha256: string }): Promise<void> {
  await db.updateTable('consents').set({ staff_pdf_file_id: file.id, staff_pdf_sha256: file.sha256 }).where('id', '=', consentId).execute();
}

/** Everything a consent's staff-safe copy is rendered from, for a consent signed before staff copies were made. */
export async function findConsentForRendering(db: Db, id: string) {
  return db
    .selectFrom('consents as c')
    .innerJoin('consent_template_versions as v', 'v.id', 'c.template_version_id')
    .innerJoin('performers as p', 'p.id', 'c.performer_id')
    .leftJoin('productions as pr', 'pr.id', 'c.production_id')
    .select([
      'c.id',
      'c.kind',
      'v.title',
      'v.version',
      'v.body',
      'v.questions',
      sql<string>`coalesce(p.preferred_name, p.legal_name)`.as('performer_name'),
      'pr.name as production_name',
      'c.signer_name',
      'c.signed_at',
      'c.signing_method',
      'c.ip',
      'c.user_agent',
      'c.signature_file_id',
      'c.content_sha256',
      'c.staff_pdf_file_id',
    ])
    .where('c.id', '=', id)
    .executeTakeFirst();
}

/** One consent with what its detail view needs beyond the summary. */
export async function findConsentDetailRow(db: Db, id: string) {
  const r = await consentSummaryQuery(db)
    .select(['v.body', 'c.withdrawal_reason', 'c.withdrawn_via', 'c.pdf_sha256', 'c.content_sha256', 'c.pdf_file_id'])
    .where('c.id', '=', id)
    .executeTakeFirst();
  if (!r) return undefined;
  return {
    summary: toConsentSummary(r),
    body: r.body,
    withdrawalReason: r.withdrawal_reason === null ? null : openJson<string>(r.withdrawal_reason),
    withdrawnVia: r.withdrawn_via,
    pdfSha256: r.pdf_sha256,
    contentSha256: r.content_sha256,
    pdfFileId: r.pdf_file_id,
  };
}

export async function listConsentAnswers(db: Db, consentId: string): Promise<{ questionId: string; label: string; medical: boolean; answer: boolean | string | null }[]> {
  // In the form's order: each answer's place among the signed version's questions (ids are random).
  const rows = await db
    .selectFrom('consent_answers as a')
    .innerJoin('consents as c', 'c.id', 'a.consent_id')
    .innerJoin('consent_template_versions as v', 'v.id', 'c.template_version_id')
    .select(['a.question_id', 'a.question_label', 'a.medical', 'a.answer'])
    .where('a.consent_id', '=', consentId)
    .orderBy(sql`(select q.ord from jsonb_array_elements(v.questions) with ordinality as q(item, ord) where q.item->>'id' = a.question_id)`, (ob) => ob.asc().nullsLast())
    .orderBy('a.id')
    .execute();
  return rows.map((a) => {
    const answer = openJson(a.answer);
    return { questionId: a.question_id, label: a.question_label, medical: a.medical, answer: typeof answer === 'boolean' || typeof answer === 'string' ? answer : null };
  });
}

/** Consents of these performers in the shape the session gates read: one query for any number of performers. */
export async function listConsentsForGate(db: Db, performerIds: readonly string[]): Promise<ConsentForGate[]> {
  if (performerIds.length === 0) return [];
  const rows = await db.selectFrom('consents').select(['performer_id', 'production_id', 'kind', 'signed_at', 'expires_at', 'withdrawn_at']).where('performer_id', 'in', [...performerIds]).execute();
  return rows.map(gateConsentOf);
}

/** A consent row (or its JSON) in the shape the session gates read. */
function gateConsentOf(c: Omit<GateConsentJson, 'id' | 'signed_at' | 'expires_at' | 'withdrawn_at'> & { signed_at: string | Date; expires_at: string | Date | null; withdrawn_at: string | Date | null }): ConsentForGate {
  return {
    performerId: c.performer_id,
    productionId: c.production_id,
    kind: c.kind,
    signedAt: new Date(c.signed_at),
    expiresAt: c.expires_at ? new Date(c.expires_at) : null,
    withdrawnAt: c.withdrawn_at ? new Date(c.withdrawn_at) : null,
  };
}

/**
 * Active consents of a production's performers (given to it or to none) whose expiry falls in the
 * window, counted as a one-column query (`n`) for a counts statement to select.
 */
export function expiringForProductionCount(db: Db, productionId: string, now: Date, until: Date) {
  return db
    .selectFrom('consents as c')
    .innerJoin('engagements as e', (j) => j.onRef('e.performer_id', '=', 'c.performer_id').on('e.production_id', '=', productionId))
    .select((eb) => eb.fn.count<string>('c.id').distinct().as('n'))
    .where((eb) => eb.or([eb('c.production_id', '=', productionId), eb('c.production_id', 'is', null)]))
    .where(consentCoversSql('c', now))
    .where('c.expires_at', '<=', until);
}

/** How many of a performer's consents are in force now. */
export async function countActiveConsents(db: Db, performerId: string, now: Date): Promise<number> {
  const row = await db.selectFrom('consents as c').select((eb) => eb.fn.countAll<string>().as('n')).where('c.performer_id', '=', performerId).where(consentCoversSql('c', now)).executeTakeFirstOrThrow();
  return Number(row.n);
}

// ---- withdrawal

export async function lockConsentForWithdrawal(db: Db, id: string) {
  const c = await db
    .selectFrom('consents')
    .select(['id', 'performer_id', 'production_id', 'kind', 'version', 'withdrawn_at', 'signed_at', 'expires_at'])
    .where('id', '=', id)
    .forUpdate()
    .executeTakeFirst();
  if (!c) return undefined;
  return {
    id: c.id,
    performerId: c.performer_id,
    productionId: c.production_id,
    kind: c.kind as ConsentKind,
    version: c.version,
    signedAt: new Date(c.signed_at),
    expiresAt: c.expires_at ? new Date(c.expires_at) : null,
    withdrawnAt: c.withdrawn_at ? new Date(c.withdrawn_at) : null,
  };
}

export async function markConsentWithdrawn(db: Db, id: string, v: { by: string | null; via: 'performer' | 'lead' | 'link'; reason: string | null }): Promise<void> {
  await db
    .updateTable('consents')
    // A reason may speak of health: sealed at rest like the answers.
    .set({ withdrawn_at: new Date(), withdrawn_by_user_id: v.by, withdrawn_via: v.via, withdrawal_reason: v.reason === null ? null : sealJson(v.reason), version: sql`version + 1` })
    .where('id', '=', id)
    .execute();
}

export async function findConsentPerformer(db: Db, id: string): Promise<string | undefined> {
  return (await db.selectFrom('consents').select('performer_id').where('id', '=', id).executeTakeFirst())?.performer_id;
}

// ---- signing writes

export async function findConsentByIdempotencyKey(db: Db, key: string): Promise<{ id: string; signedAt: Date; requestId: string | null } | undefined> {
  const r = await db.selectFrom('consents').select(['id', 'signed_at', 'request_id']).where('idempotency_key', '=', key).executeTakeFirst();
  return r ? { id: r.id, signedAt: new Date(r.signed_at), requestId: r.request_id } : undefined;
}

export async function insertConsent(
  db: Db,
  v: {
    id: string;
    performerId: string;
    productionId: string | null;
    templateVersionId: string;
    kind: ConsentKind;
    requestId: string | null;
    idempotencyKey: string;
    signerName: string;
    signedAt: Date;
    expiresAt: Date | null;
    signingMethod: 'tablet' | 'link';
    ip: string | null;
    userAgent: string | null;
    staffUserId: string | null;
    signatureFileId: string;
    pdfFileId: string;
    pdfSha256: string;
    contentSha256: string;
  },
  answers: readonly { questionId: string; label: string; medical: boolean; answer: boolean | string | null }[],
): Promise<void> {
  await db
    .insertInto('consents')
    .values({
      id: v.id,
      performer_id: v.performerId,
      production_id: v.productionId,
      template_version_id: v.templateVersionId,
      kind: v.kind,
      request_id: v.requestId,
      idempotency_key: v.idempotencyKey,
      signer_name: v.signerName,
      signed_at: v.signedAt,
      expires_at: v.expiresAt,
      signing_method: v.signingMethod,
      ip: v.ip,
      user_agent: v.userAgent,
      staff_user_id: v.staffUserId,
      signature_file_id: v.signatureFileId,
      pdf_file_id: v.pdfFileId,
      pdf_sha256: v.pdfSha256,
      content_sha256: v.contentSha256,
    })
    .execute();
  if (answers.length) {
    await db
      .insertInto('consent_answers')
      // Health answers are sealed at rest; the others stay readable to the database.
      .values(answers.map((a) => ({ consent_id: v.id, question_id: a.questionId, question_label: a.label, medical: a.medical, answer: JSON.stringify(a.medical ? sealJson(a.answer) : a.answer) })))
      .execute();
  }
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

// ---- a performer's consents as one JSON column, for reads that gather a whole record in one statement

/** A consent as the JSON fragment below returns it. */
export interface ConsentJsonRow {
  id: string;
  production_id: string | null;
  kind: ConsentKind;
  title: string;
  template_version: number;
  signed_at: string;
  expires_at: string | null;
  withdrawn_at: string | null;
  signer_name: string;
  signing_method: 'tablet' | 'link';
  version: number;
}

/** A consent as the session gate reads it, in a listed row's JSON column. */
export interface GateConsentJson {
  id: string;
  performer_id: string;
  production_id: string | null;
  kind: ConsentKind;
  signed_at: string;
  expires_at: string | null;
  withdrawn_at: string | null;
}

/**
 * The consents that can cover a session of performer `performerId` on production `productionId` (both
 * column references): those given to that production or naming none. A JSON column of the statement that
 * lists the sessions, so the gate needs no read of its own.
 */
export function gateConsentsJsonSql(performerId: RawBuilder<string>, productionId: RawBuilder<string>): RawBuilder<GateConsentJson[]> {
  return sql<GateConsentJson[]>`coalesce((
    select json_agg(json_build_object(
      'id', c.id, 'performer_id', c.performer_id, 'production_id', c.production_id, 'kind', c.kind,
      'signed_at', c.signed_at, 'expires_at', c.expires_at, 'withdrawn_at', c.withdrawn_at
    ))
    from consents c
    where c.performer_id = ${performerId} and (c.production_id = ${productionId} or c.production_id is null)
  ), '[]'::json)`;
}

/**
 * Whether a list of sessions brings the gate's consents along (`gateConsentsJsonSql`): a list across
 * performers does; one performer's list reads that performer's consents once instead, since a copy on
 * each of their rows costs more than the read.
 */
export function bringsGateConsents(where: { performerId?: string }): boolean {
  return !where.performerId;
}

/**
 * The gate's consents for listed rows: from their JSON columns, each consent once, when every row brought
 * them; otherwise one read for the rows' performers.
 */
export async function gateConsentsOfRows(db: Db, rows: readonly { performerId: string; gateConsents: readonly GateConsentJson[] | null }[]): Promise<ConsentForGate[]> {
  if (!rows.every((r) => r.gateConsents !== null)) return listConsentsForGate(db, [...new Set(rows.map((r) => r.performerId))]);
  const byId = new Map<string, ConsentForGate>();
  for (const r of rows) {
    for (const c of r.gateConsents!) {
      if (!byId.has(c.id)) byId.set(c.id, gateConsentOf(c));
    }
  }
  return [...byId.values()];
}

/** The consents of the performer whose id is `performerId` (a column reference), newest first, as a JSON array. */
export function consentsJsonSql(performerId: RawBuilder<string>): RawBuilder<ConsentJsonRow[]> {
  return sql<ConsentJsonRow[]>`coalesce((
    select json_agg(json_build_object(
      'id', c.id, 'production_id', c.production_id, 'kind', c.kind, 'title', v.title, 'template_version', v.version,
      'signed_at', c.signed_at, 'expires_at', c.expires_at, 'withdrawn_at', c.withdrawn_at,
      'signer_name', c.signer_name, 'signing_method', c.signing_method, 'version', c.version
    ) order by c.signed_at desc, c.id)
    from consents c join consent_template_versions v on v.id = c.template_version_id
    where c.performer_id = ${performerId}
  ), '[]'::json)`;
}

export function consentFromJson(r: ConsentJsonRow, performer: { id: string; name: string }, now = new Date()): { summary: ConsentSummary; gate: ConsentForGate } {
  const signedAt = new Date(r.signed_at);
  const expiresAt = r.expires_at ? new Date(r.expires_at) : null;
  const withdrawnAt = r.withdrawn_at ? new Date(r.withdrawn_at) : null;
  return {
    summary: {
      id: r.id,
      performerId: performer.id,
      performerName: performer.name,
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
    },
    gate: { performerId: performer.id, productionId: r.production_id, kind: r.kind, signedAt, expiresAt, withdrawnAt },
  };
}
