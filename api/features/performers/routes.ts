import type { Request, Response } from 'express';
import { randomUUID } from 'node:crypto';
import { z } from 'zod';
import { type Actor, can } from '#shared/policy.ts';
import { IdParamsSchema } from '#shared/schemas/common.ts';
import {
  CreatePerformerInputSchema,
  CsvImportQuerySchema,
  CsvImportResultSchema,
  type CsvImportResult,
  LinkAccountInputSchema,
  PerformerDetailSchema,
  type PerformerDetail,
  PerformerListQuerySchema,
  PerformerPageSchema,
  UpdatePerformerInputSchema,
  PERFORMER_FIELD_KEYS,
} from '#shared/schemas/performers.ts';
import type { AppContext } from '../../context.ts';
import type { Db } from '../../db/index.ts';
import { discardFiles, readStoredFile, storeFile, type StoredFile } from '../../files/store.ts';
import { writeAudit } from '../../http/audit.ts';
import { authorize } from '../../http/authorize.ts';
import { ApiError, conflict, forbidden, invalid, notFound } from '../../http/errors.ts';
import { type AnyRoute, defineRoute } from '../../http/route.ts';
import { deliverAll } from '../../mail/deliver.ts';
import { staffAddressesAmong } from '../identity/repo.ts';
import { assertPerformerAddress, recordEmailChange, startConfirmation, startConfirmations, unlinkNotices } from '../identity/service.ts';
import { afterResponse } from '../../http/after-response.ts';
import { performerAccess, productionsWhere } from './access.ts';
import { IMPORT_MAX_BYTES, checkImportRows, performersCsv, readImportFile } from './csv.ts';
import { PORTRAIT_MAX_BYTES, processPortrait } from './portrait.ts';
import { receiveFile } from '../../http/upload.ts';
import {
  type EngagementValues,
  type PerformerFields,
  addPerformerMemberships,
  deleteEngagements,
  deleteFileRows,
  findPerformer,
  findPerformerIdByEmail,
  findPerformersByEmails,
  findUser,
  insertEngagements,
  insertPerformer,
  insertPerformers,
  listConsentSummaries,
  listEngagements,
  listPerformers,
  listPerformersForExport,
  listUpcomingBookings,
  lockPerformer,
  portraitUrl,
  removePerformerMemberships,
  setPerformerUserAtVersion,
  setPortraitFiles,
  thumbnailUrl,
  updateEngagement,
  updatePerformerAtVersion,
} from './repo.ts';

const TAG = 'performers';
const FIELD_KEYS: readonly (keyof PerformerFields)[] = PERFORMER_FIELD_KEYS;

function fieldsOf(body: PerformerFields): PerformerFields {
  return Object.fromEntries(FIELD_KEYS.map((k) => [k, body[k]])) as unknown as PerformerFields;
}

const emailTaken = () => invalid({ email: ['Another performer already has this e-mail address.'] });
const staleEdit = (version: number) => conflict('Someone else changed this performer since you opened it. Reload to see their change.', { currentVersion: version });

/** Duplicate-key races that get past the checks: the same reply the check would have given. */
function duplicateToField(err: unknown): never {
  const e = err as { code?: string; constraint?: string };
  if (e?.code === '23505' && e.constraint === 'performers_email_key') throw emailTaken();
  if (e?.code === '23505' && e.constraint === 'performers_user_id_key') throw invalid({ userId: ['This sign-in is already linked to another performer.'] });
  throw err;
}

/** Loads a performer and what the actor may do with them; 404 before any permission answer. */
async function loadForActor(db: Db, actor: Actor, id: string) {
  const performer = await findPerformer(db, id);
  if (!performer) throw notFound('That performer');
  const engagements = (await listEngagements(db, [id])).get(id) ?? [];
  const productionIds = engagements.map((e) => e.productionId);
  return { performer, engagements, productionIds, access: performerAccess(actor, id, productionIds) };
}
type Loaded = Awaited<ReturnType<typeof loadForActor>>;

/** The performer as this actor may see them: contact, linked sign-in, consents and bookings only where allowed. */
async function detailFor(db: Db, { performer: p, engagements, access }: Loaded): Promise<PerformerDetail> {
  const named = { id: p.id, name: p.preferredName ?? p.legalName };
  const all = access.canView ? await listConsentSummaries(db, named, new Date()) : { summaries: [], times: [] };
  // Staff see the consents given to productions they work on; the performer sees all of theirs.
  const consents = { ...all, summaries: all.summaries.filter((c) => c.productionId === null || access.showsProduction(c.productionId)) };
  const bookings = access.canView ? await listUpcomingBookings(db, named, consents.times, access.showsProduction) : [];
  const linkedUser = p.userId && access.canSeeLinkedUser ? ((await findUser(db, p.userId)) ?? null) : null;
  return {
    id: p.id,
    legalName: p.legalName,
    preferredName: p.preferredName,
    pronouns: p.pronouns,
    contact: access.canSeeContact
      ? {
          email: p.email,
          emailConfirmed: p.emailConfirmed,
          phone: p.phone,
          emergencyContactName: p.emergencyContactName,
          emergencyContactPhone: p.emergencyContactPhone,
          agentName: p.agentName,
          agentContact: p.agentContact,
          notes: p.notes,
        }
      : null,
    linkedUser,
    engagements: engagements.filter((e) => access.showsProduction(e.productionId)).map(({ performerId: _p, ...e }) => e),
    portraitUrl: portraitUrl(p.id, p.portraitFileId),
    thumbnailUrl: thumbnailUrl(p.id, p.portraitThumbFileId),
    consents: consents.summaries,
    bookings,
    version: p.version,
    canEdit: access.canManage,
    canSeeMedical: access.canSeeMedical,
  };
}

/** The detail after a change, as the actor who made it sees it. */
async function buildDetail(db: Db, actor: Actor, id: string): Promise<PerformerDetail> {
  return detailFor(db, await loadForActor(db, actor, id));
}

/** Scope of the list and the export: productions where the actor may view performers (permission checked here). */
function listScope(actor: Actor, productionId: string | undefined): { productionIds: string[]; viewable: Set<string> } {
  const viewable = productionsWhere(actor, 'performers.view');
  if (productionId) {
    authorize(actor, 'performers.view', { productionId });
    return { productionIds: [productionId], viewable: new Set(viewable) };
  }
  if (viewable.length === 0) throw forbidden('see the performer registry');
  return { productionIds: viewable, viewable: new Set(viewable) };
}

/** Locks a performer for a change and works out, inside the same transaction, what this actor may do with them. */
async function lockForChange(trx: Db, actor: Actor, id: string) {
  const current = await lockPerformer(trx, id);
  if (!current) throw notFound('That performer');
  const engagedOn = (await listEngagements(trx, [id])).get(id) ?? [];
  return { current, engagedOn, access: performerAccess(actor, id, engagedOn.map((e) => e.productionId)) };
}

function changedFields(before: PerformerFields, after: PerformerFields): string[] {
  return FIELD_KEYS.filter((k) => before[k] !== after[k]);
}

function duplicateProductions(engagements: readonly { productionId: string }[]): Record<string, string[]> {
  const seen = new Set<string>();
  const fields: Record<string, string[]> = {};
  engagements.forEach((e, i) => {
    if (seen.has(e.productionId)) fields[`engagements.${i}.productionId`] = ['This production is listed twice.'];
    seen.add(e.productionId);
  });
  return fields;
}

async function auditMemberships(db: Db, req: Request, actor: Actor, userId: string, added: readonly string[], removed: readonly string[], performerId: string) {
  for (const productionId of added) {
    await writeAudit(db, { actorUserId: actor.userId, action: 'membership.add', entityType: 'user', entityId: userId, productionId, req, details: { role: 'performer', performerId } });
  }
  for (const productionId of removed) {
    await writeAudit(db, { actorUserId: actor.userId, action: 'membership.remove', entityType: 'user', entityId: userId, productionId, req, details: { role: 'performer', performerId } });
  }
}

async function receiveFileOr400(req: Request, res: Response, field: string, maxBytes: number, missing: string) {
  const file = await receiveFile(req, res, { field, maxBytes });
  if (!file) throw invalid({ [field]: [missing] });
  return file;
}

const PortraitQuerySchema = z.object({ v: z.string().max(100).optional() });

async function sendPortrait(ctx: AppContext, actor: Actor, id: string, which: 'portrait' | 'thumbnail', v: string | undefined, res: Response) {
  const { performer, access } = await loadForActor(ctx.db, actor, id);
  if (!access.canView) throw forbidden('see this performer');
  const fileId = which === 'portrait' ? performer.portraitFileId : performer.portraitThumbFileId;
  if (!fileId) throw notFound(which === 'portrait' ? 'A portrait' : 'A thumbnail');
  const file = await readStoredFile(ctx.db, ctx.config.storageDir, fileId);
  if (!file) throw notFound(which === 'portrait' ? 'A portrait' : 'A thumbnail');
  // The URL carries the file id, so a matching ?v= names bytes that never change; private: it is a person's face.
  res.set('Cache-Control', v === fileId ? 'private, max-age=86400, immutable' : 'private, no-cache');
  res.set('ETag', `"${file.sha256}"`);
  res.type(file.contentType).send(file.bytes);
}

/** Import: everything the preview shows, computed the same way for the commit. */
async function planImport(db: Db, buf: Buffer, productionId: string, actor: Actor) {
  const parsed = readImportFile(buf);
  if (parsed.fileErrors.length) return { fileErrors: parsed.fileErrors, rows: [], plans: [] };
  const emails = parsed.lines.map((l) => l.values.email?.trim().toLowerCase()).filter((e): e is string => !!e);
  const unique = [...new Set(emails)];
  const existing = await findPerformersByEmails(db, unique);
  const staff = await staffAddressesAmong(db, unique);
  const managed = new Set(productionsWhere(actor, 'performers.manage'));
  return { fileErrors: [] as string[], ...checkImportRows(parsed.lines, productionId, existing, (ids) => ids.some((p) => managed.has(p)), staff) };
}

function importResult(plan: Awaited<ReturnType<typeof planImport>>, committed: boolean): CsvImportResult {
  const rowsWithErrors = plan.rows.filter((r) => Object.keys(r.errors).length > 0).length;
  return {
    committed,
    rows: plan.rows,
    // Rows with at least one problem, plus problems with the file as a whole.
    errorCount: rowsWithErrors + plan.fileErrors.length,
    fileErrors: plan.fileErrors,
    created: plan.plans.filter((p) => p.action === 'create').length,
    engaged: plan.plans.filter((p) => p.action === 'engage_existing').length,
  };
}

function importRefused(result: CsvImportResult, message: string): ApiError {
  // details.fields names the one input, the file; details.result is the full report, row by row.
  const problems = [...result.fileErrors];
  for (const r of result.rows) {
    for (const [column, messages] of Object.entries(r.errors)) problems.push(...messages.map((m) => `Line ${r.line}, ${column}: ${m}`));
  }
  return new ApiError('validation_failed', message, { fields: { file: problems }, result });
}

export const performerRoutes: AnyRoute[] = [
  defineRoute({
    method: 'get',
    path: '/api/performers',
    summary: 'The performer registry: performers engaged on productions where you may view performers (search, consent filter, sort, page)',
    tag: TAG,
    auth: 'session',
    query: PerformerListQuerySchema,
    response: PerformerPageSchema,
    errors: [403],
    async handler({ ctx, actor, query }) {
      const scope = listScope(actor, query.productionId);
      const { items, total } = await listPerformers(ctx.db, query, { productionIds: scope.productionIds, showsProduction: (p) => scope.viewable.has(p) });
      return { items, total, page: query.page, pageSize: query.pageSize };
    },
  }),
  // Before /api/performers/:id, so "export.csv" is never taken for an id.
  defineRoute({
    method: 'get',
    path: '/api/performers/export.csv',
    summary:
      'The registry as filtered, as CSV (no paging). Contact columns are left out unless you manage performers on every production the export covers',
    tag: TAG,
    auth: 'session',
    query: PerformerListQuerySchema.omit({ page: true, pageSize: true }),
    produces: 'text/csv',
    errors: [403],
    async handler({ ctx, actor, query, req, res }) {
      const scope = listScope(actor, query.productionId);
      const includeContact = scope.productionIds.every((productionId) => can(actor, 'performers.manage', { productionId }));
      const rows = await listPerformersForExport(ctx.db, query, { productionIds: scope.productionIds });
      const csv = performersCsv(rows, { includeContact, productionId: query.productionId, showsProduction: (p) => scope.viewable.has(p) });
      await writeAudit(ctx.db, {
        actorUserId: actor.userId,
        action: 'performer.export',
        entityType: 'performer',
        productionId: query.productionId ?? null,
        req,
        details: { rows: rows.length, contact: includeContact, q: query.q ?? null, consent: query.consent },
      });
      res.set('Content-Type', 'text/csv; charset=utf-8');
      res.set('Content-Disposition', 'attachment; filename="performers.csv"');
      res.send(csv);
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/performers/import',
    summary:
      'Import performers from CSV (multipart field "file", UTF-8, at most 2 MB and 2,000 rows) onto a production you manage. ' +
      'commit=false previews: 200 with every row checked and nothing written, problems included. ' +
      'commit=true checks again and writes everything in one transaction, or, if anything is wrong, nothing: a 400 whose details.result holds the same report',
    tag: TAG,
    auth: 'session',
    multipart: true,
    query: CsvImportQuerySchema,
    response: CsvImportResultSchema,
    errors: [403, 413],
    async handler({ ctx, actor, query, req, res }) {
      // Permission checked here, before a byte of the upload is read.
      authorize(actor, 'performers.manage', { productionId: query.productionId });
      const file = await receiveFileOr400(req, res, 'file', IMPORT_MAX_BYTES, 'Choose a CSV file to import.');
      const preview = await planImport(ctx.db, file.buffer, query.productionId, actor);
      if (!query.commit) return importResult(preview, false);
      const before = importResult(preview, false);
      if (before.errorCount > 0) throw importRefused(before, 'Nothing was imported: fix the rows listed and try again.');

      try {
        const result = await ctx.db.transaction().execute(async (trx) => {
          // Checked again inside the transaction: someone may have added one of these e-mails since the preview.
          const plan = await planImport(trx, file.buffer, query.productionId, actor);
          const checked = importResult(plan, false);
          if (checked.errorCount > 0) throw importRefused(checked, 'Nothing was imported: the registry changed since the check. Review the rows listed.');
          const creates = plan.plans.flatMap((p) => (p.action === 'create' ? [{ ...p, id: randomUUID() }] : []));
          const engages = plan.plans.flatMap((p) => (p.action === 'engage_existing' ? [p] : []));
          await insertPerformers(trx, creates.map((c) => ({ id: c.id, ...c.fields })));
          await insertEngagements(trx, [
            ...creates.map((c) => ({ performerId: c.id, productionId: query.productionId, characterName: c.characterName, startsOn: null, endsOn: null })),
            ...engages.map((e) => ({ performerId: e.performerId, productionId: query.productionId, characterName: e.characterName, startsOn: null, endsOn: null })),
          ]);
          for (const c of creates) {
            await writeAudit(trx, { actorUserId: actor.userId, action: 'performer.create', entityType: 'performer', entityId: c.id, productionId: query.productionId, req, details: { via: 'import', line: c.line } });
          }
          for (const e of engages) {
            await writeAudit(trx, { actorUserId: actor.userId, action: 'engagement.add', entityType: 'performer', entityId: e.performerId, productionId: query.productionId, req, details: { via: 'import', line: e.line } });
            const linked = await trx.selectFrom('performers').select('user_id').where('id', '=', e.performerId).executeTakeFirstOrThrow();
            if (linked.user_id) {
              const added = await addPerformerMemberships(trx, linked.user_id, [query.productionId], actor.userId);
              await auditMemberships(trx, req, actor, linked.user_id, added, [], e.performerId);
            }
          }
          await writeAudit(trx, {
            actorUserId: actor.userId,
            action: 'performer.import',
            entityType: 'production',
            entityId: query.productionId,
            productionId: query.productionId,
            req,
            details: { created: creates.length, engaged: engages.length, alreadyEngaged: plan.plans.length - creates.length - engages.length },
          });
          // Each imported address is unconfirmed: it gets its confirmation request, once committed.
          const toConfirm = creates.flatMap((c) => (c.fields.email ? [{ id: c.id, name: c.fields.preferredName ?? c.fields.legalName, email: c.fields.email }] : []));
          return { result: importResult(plan, true), mails: await startConfirmations(trx, ctx, toConfirm, actor.userId) };
        });
        // Possibly thousands of messages: sent after the reply, so the import answers at once.
        afterResponse(res, ctx.log, 'import confirmation requests', async () => void (await deliverAll(ctx, result.mails)));
        return result.result;
      } catch (err) {
        const e = err as { code?: string };
        if (e?.code === '23505') {
          throw importRefused({ ...before, fileErrors: ['Another change to the registry collided with this import. Nothing was imported; check the file again.'], errorCount: before.errorCount + 1 }, 'Nothing was imported.');
        }
        throw err;
      }
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/performers/:id',
    summary: 'One performer: contact details only for those who manage them and for the performer; never any health details',
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    response: PerformerDetailSchema,
    errors: [403, 404],
    async handler({ ctx, actor, params }) {
      const loaded = await loadForActor(ctx.db, actor, params.id);
      if (!loaded.access.canView) throw forbidden('see this performer');
      return detailFor(ctx.db, loaded);
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/performers',
    summary: 'Register a performer, engaged on one or more productions; you must manage performers on every one of them',
    tag: TAG,
    auth: 'session',
    body: CreatePerformerInputSchema,
    response: PerformerDetailSchema,
    status: 201,
    errors: [403],
    async handler({ ctx, actor, body, req }) {
      for (const e of body.engagements) authorize(actor, 'performers.manage', { productionId: e.productionId });
      const dupes = duplicateProductions(body.engagements);
      if (Object.keys(dupes).length) throw invalid(dupes);
      const fields = fieldsOf(body);
      if (fields.email && (await findPerformerIdByEmail(ctx.db, fields.email))) throw emailTaken();
      await assertPerformerAddress(ctx.db, fields.email);
      const { id, mails } = await ctx.db
        .transaction()
        .execute(async (trx) => {
          const newId = await insertPerformer(trx, fields);
          await insertEngagements(trx, body.engagements.map((e) => ({ ...e, performerId: newId })));
          await writeAudit(trx, { actorUserId: actor.userId, action: 'performer.create', entityType: 'performer', entityId: newId, productionId: body.engagements[0]!.productionId, req, details: { fields: FIELD_KEYS.filter((k) => fields[k] !== null) } });
          for (const e of body.engagements) {
            await writeAudit(trx, { actorUserId: actor.userId, action: 'engagement.add', entityType: 'performer', entityId: newId, productionId: e.productionId, req, details: { characterName: e.characterName } });
          }
          // An address staff entered is unconfirmed: it gets the confirmation request and nothing else.
          const confirm = fields.email ? [await startConfirmation(trx, ctx, { id: newId, name: fields.preferredName ?? fields.legalName }, fields.email, actor.userId)] : [];
          return { id: newId, mails: confirm };
        })
        .catch(duplicateToField);
      await deliverAll(ctx, mails);
      return buildDetail(ctx.db, actor, id);
    },
  }),
  defineRoute({
    method: 'patch',
    path: '/api/performers/:id',
    summary:
      "Edit a performer (optimistic lock on version). Engagements in the body replace the performer's engagements on productions you manage; those on other productions are kept as they are",
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    body: UpdatePerformerInputSchema,
    response: PerformerDetailSchema,
    errors: [403, 404, 409],
    async handler({ ctx, actor, params, body, req }) {
      await ctx.db
        .transaction()
        .execute(async (trx) => {
          const { current, engagedOn, access } = await lockForChange(trx, actor, params.id);
          if (!access.canManage) throw forbidden('edit this performer');
          if (current.version !== body.version) throw staleEdit(current.version);
          const dupes = duplicateProductions(body.engagements);
          if (Object.keys(dupes).length) throw invalid(dupes);
          const fields = fieldsOf(body);
          if (fields.email && (await findPerformerIdByEmail(trx, fields.email, params.id))) throw emailTaken();
          const emailChanged = (fields.email ?? null) !== (current.email?.toLowerCase() ?? null);
          if (emailChanged) await assertPerformerAddress(trx, fields.email);

          const managed = new Set(access.managedProductionIds);
          const existing = new Map(engagedOn.map((e) => [e.productionId, e]));
          const wanted = new Map(body.engagements.map((e) => [e.productionId, e]));
          const toAdd: EngagementValues[] = [];
          const toUpdate: EngagementValues[] = [];
          for (const e of body.engagements) {
            if (existing.has(e.productionId)) {
              // An engagement on a production the actor does not manage is left exactly as it is.
              if (managed.has(e.productionId)) toUpdate.push(e);
            } else {
              authorize(actor, 'performers.manage', { productionId: e.productionId });
              toAdd.push(e);
            }
          }
          const toRemove = [...managed].filter((p) => !wanted.has(p));

          if (!(await updatePerformerAtVersion(trx, params.id, emailChanged ? fields : { ...fields, email: current.email }, body.version))) throw staleEdit(current.version);
          const mails = emailChanged
            ? await recordEmailChange(trx, ctx, { performerId: params.id, before: { email: current.email, confirmed: current.emailConfirmed }, after: fields.email, actor, req })
            : [];
          for (const e of toUpdate) await updateEngagement(trx, params.id, e);
          await deleteEngagements(trx, params.id, toRemove);
          await insertEngagements(trx, toAdd.map((e) => ({ ...e, performerId: params.id })));

          await writeAudit(trx, { actorUserId: actor.userId, action: 'performer.update', entityType: 'performer', entityId: params.id, req, details: { fields: changedFields(current, fields) } });
          for (const e of toAdd) {
            await writeAudit(trx, { actorUserId: actor.userId, action: 'engagement.add', entityType: 'performer', entityId: params.id, productionId: e.productionId, req, details: { characterName: e.characterName } });
          }
          for (const productionId of toRemove) {
            await writeAudit(trx, { actorUserId: actor.userId, action: 'engagement.remove', entityType: 'performer', entityId: params.id, productionId, req });
          }
          // A linked sign-in follows the engagements: the performer role where engaged, and no longer where not.
          if (current.userId) {
            const added = await addPerformerMemberships(trx, current.userId, toAdd.map((e) => e.productionId), actor.userId);
            const removed = await removePerformerMemberships(trx, current.userId, toRemove);
            await auditMemberships(trx, req, actor, current.userId, added, removed, params.id);
          }
          return mails;
        })
        .catch(duplicateToField)
        .then((mails) => deliverAll(ctx, mails));
      return buildDetail(ctx.db, actor, params.id);
    },
  }),
  defineRoute({
    method: 'put',
    path: '/api/performers/:id/account',
    summary:
      "Unlink the performer's sign-in (userId null); its performer role goes on the productions you manage (every one, for the studio administrator). " +
      'Linking is the performer\'s own act (an invitation they accept, or signing in with the address they confirmed), never a staff action',
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    body: LinkAccountInputSchema,
    response: PerformerDetailSchema,
    errors: [403, 404, 409],
    async handler({ ctx, actor, params, body, req }) {
      const mails = await ctx.db.transaction().execute(async (trx) => {
        const { current, engagedOn, access } = await lockForChange(trx, actor, params.id);
        const productionIds = engagedOn.map((e) => e.productionId);
        if (!access.canManage && !actor.isAdmin) throw forbidden('unlink the sign-in of this performer');
        if (current.version !== body.version) throw staleEdit(current.version);
        const previous = current.userId;
        if (!previous) return [];
        // The administrator may take roles anywhere; a head or lead only where they manage performers.
        const where = actor.isAdmin ? productionIds : access.managedProductionIds;
        if (!(await setPerformerUserAtVersion(trx, params.id, null, body.version))) throw staleEdit(current.version);
        const removed = await removePerformerMemberships(trx, previous, where);
        await writeAudit(trx, { actorUserId: actor.userId, action: 'performer.account_unlink', entityType: 'performer', entityId: params.id, req, details: { before: previous, after: null } });
        await auditMemberships(trx, req, actor, previous, [], removed, params.id);
        const me = await findUser(trx, actor.userId);
        return unlinkNotices(trx, params.id, me?.displayName ?? 'A member of staff');
      });
      await deliverAll(ctx, mails);
      return buildDetail(ctx.db, actor, params.id);
    },
  }),
  defineRoute({
    method: 'put',
    path: '/api/performers/:id/portrait',
    summary:
      'Upload a portrait (multipart field "portrait", at most 10 MB; JPEG, PNG, WebP or AVIF, read from the content). Stored upright as a JPEG without any metadata, with a 256×256 thumbnail',
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    multipart: true,
    response: PerformerDetailSchema,
    errors: [403, 404, 413],
    async handler({ ctx, actor, params, req, res }) {
      const { access } = await loadForActor(ctx.db, actor, params.id);
      // Permission checked here, before a byte of the upload is read.
      if (!access.canManage) throw forbidden('change this performer’s portrait');
      const file = await receiveFileOr400(req, res, 'portrait', PORTRAIT_MAX_BYTES, 'Choose a photo to upload.');
      const { portrait, thumbnail } = await processPortrait(file.buffer);
      const storageDir = ctx.config.storageDir;
      const written: StoredFile[] = [];
      let replaced: { storagePath: string }[] = [];
      try {
        await ctx.db.transaction().execute(async (trx) => {
          if (!(await lockPerformer(trx, params.id))) throw notFound('That performer');
          const big = await storeFile(trx, storageDir, { purpose: 'portrait', contentType: 'image/jpeg', ext: 'jpg', bytes: portrait.bytes, width: portrait.width, height: portrait.height, createdBy: actor.userId });
          written.push(big);
          const small = await storeFile(trx, storageDir, { purpose: 'portrait_thumb', contentType: 'image/jpeg', ext: 'jpg', bytes: thumbnail.bytes, width: thumbnail.width, height: thumbnail.height, createdBy: actor.userId });
          written.push(small);
          const previous = await setPortraitFiles(trx, params.id, big.id, small.id);
          replaced = await deleteFileRows(trx, previous);
          await writeAudit(trx, { actorUserId: actor.userId, action: 'performer.portrait_set', entityType: 'performer', entityId: params.id, req, details: { fileId: big.id, width: portrait.width, height: portrait.height } });
        });
      } catch (err) {
        await discardFiles(storageDir, written);
        throw err;
      }
      // The old photo is personal data nobody points at any more: its bytes go once the change is committed.
      await discardFiles(storageDir, replaced);
      return buildDetail(ctx.db, actor, params.id);
    },
  }),
  defineRoute({
    method: 'delete',
    path: '/api/performers/:id/portrait',
    summary: 'Remove the portrait (and its thumbnail); their files are deleted',
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    status: 204,
    errors: [403, 404],
    async handler({ ctx, actor, params, req }) {
      const { access } = await loadForActor(ctx.db, actor, params.id);
      if (!access.canManage) throw forbidden('change this performer’s portrait');
      const removed = await ctx.db.transaction().execute(async (trx) => {
        if (!(await lockPerformer(trx, params.id))) throw notFound('That performer');
        const previous = await setPortraitFiles(trx, params.id, null, null);
        const rows = await deleteFileRows(trx, previous);
        if (previous.length) await writeAudit(trx, { actorUserId: actor.userId, action: 'performer.portrait_remove', entityType: 'performer', entityId: params.id, req });
        return rows;
      });
      await discardFiles(ctx.config.storageDir, removed);
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/performers/:id/portrait',
    summary: 'The portrait (JPEG, at most 1600 px) for anyone who may see the performer; ?v=<file id> makes it cacheable',
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    query: PortraitQuerySchema,
    produces: 'image/jpeg',
    errors: [403, 404],
    async handler({ ctx, actor, params, query, res }) {
      await sendPortrait(ctx, actor, params.id, 'portrait', query.v, res);
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/performers/:id/portrait/thumbnail',
    summary: 'The 256×256 portrait thumbnail for anyone who may see the performer; ?v=<file id> makes it cacheable',
    tag: TAG,
    auth: 'session',
    params: IdParamsSchema,
    query: PortraitQuerySchema,
    produces: 'image/jpeg',
    errors: [403, 404],
    async handler({ ctx, actor, params, query, res }) {
      await sendPortrait(ctx, actor, params.id, 'thumbnail', query.v, res);
    },
  }),
];
