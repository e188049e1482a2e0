import type { Request } from 'express';
import type { Actor } from '#shared/policy.ts';
import type { Booking } from '#shared/schemas/bookings.ts';
import type { ConsentSummary } from '#shared/schemas/consents.ts';
import { type CreatePerformerInput, PERFORMER_FIELD_KEYS, type PerformerDetail, type UpdatePerformerInput } from '#shared/schemas/performers.ts';
import type { AppContext } from '../../context.ts';
import type { Db } from '../../db/index.ts';
import { discardFiles, readStoredFile, type StoredFile, storeFile } from '../../files/store.ts';
import { type Trx, writeAudit } from '../../http/audit.ts';
import { authorize } from '../../http/authorize.ts';
import { conflict, duplicateAsFields, forbidden, invalid, notFound } from '../../http/errors.ts';
import { deliverAll } from '../../mail/deliver.ts';
import { bookingsFromJson } from '../bookings/index.ts';
import { consentFromJson } from '../consents/index.ts';
import { addPerformerMemberships, removePerformerMemberships } from '../productions/index.ts';
import { findUserSummary } from '../users/index.ts';
import { performerAccess, productionsWhere } from './access.ts';
import { assertPerformerAddress, recordEmailChange, startConfirmation, unlinkNotices } from './identity-service.ts';
import { processPortrait } from './portrait.ts';
import {
  deleteEngagements,
  deleteFileRows,
  type EngagementValues,
  findPerformer,
  findPerformerDetailRow,
  findPerformerIdByEmail,
  insertEngagements,
  insertPerformer,
  listEngagements,
  lockPerformer,
  type PerformerFields,
  portraitUrl,
  setPerformerUserAtVersion,
  setPortraitFiles,
  thumbnailUrl,
  updateEngagement,
  updatePerformerAtVersion,
} from './repo.ts';

const FIELD_KEYS: readonly (keyof PerformerFields)[] = PERFORMER_FIELD_KEYS;

function fieldsOf(body: PerformerFields): PerformerFields {
  const out = {} as Record<keyof PerformerFields, string | null>;
  for (const k of FIELD_KEYS) out[k] = body[k];
  return out as PerformerFields;
}

const emailTaken = () => invalid({ email: ['Another performer already has this e-mail address.'] });
const staleEdit = (version: number) => conflict('Someone else changed this performer since you opened it. Reload to see their change.', { currentVersion: version });

/** Duplicate-key races that get past the checks: the same reply the check would have given. */
const duplicateToField = duplicateAsFields({
  performers_email_key: { email: ['Another performer already has this e-mail address.'] },
  performers_user_id_key: { userId: ['This sign-in is already linked to another performer.'] },
});

/** Loads a performer and what the actor may do with them; 404 before any permission answer. */
export async function loadForActor(db: Db, actor: Actor, id: string) {
  const performer = await findPerformer(db, id);
  if (!performer) throw notFound('That performer');
  const engagements = (await listEngagements(db, [id])).get(id) ?? [];
  const productionIds = engagements.map((e) => e.productionId);
  return { performer, engagements, productionIds, access: performerAccess(actor, id, productionIds) };
}
type Loaded = Awaited<ReturnType<typeof loadForActor>>;

/** What of a performer this actor sees: contact, linked sign-in, consents and sessions only where allowed. */
function shapeDetail(
  { performer: p, engagements, access }: Loaded,
  data: { consents: ConsentSummary[]; bookings: Booking[]; linkedUser: { id: string; email: string; displayName: string } | undefined },
): PerformerDetail {
  const linkedUser = access.canSeeLinkedUser ? data.linkedUser : undefined;
  const all = access.canView ? data.consents : [];
  const bookings = access.canView ? data.bookings : [];
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
    linkedUser: linkedUser ? { id: linkedUser.id, email: linkedUser.email, displayName: linkedUser.displayName } : null,
    engagements: engagements.filter((e) => access.showsProduction(e.productionId)).map(({ performerId: _p, ...e }) => e),
    portraitUrl: portraitUrl(p.id, p.portraitFileId),
    thumbnailUrl: thumbnailUrl(p.id, p.portraitThumbFileId),
    // Staff see the consents given to productions they work on; the performer sees all of theirs.
    consents: all.filter((c) => c.productionId === null || access.showsProduction(c.productionId)),
    bookings,
    version: p.version,
    canEdit: access.canManage,
    canSeeMedical: access.canSeeMedical,
  };
}

/**
 * One performer as this actor may see them, read in one statement: a page opened before every
 * application must not wait on a query per section.
 */
export async function performerDetail(ctx: AppContext, actor: Actor, id: string): Promise<PerformerDetail> {
  return readDetail(ctx.db, actor, id, { check: true });
}

async function readDetail(db: Db, actor: Actor, id: string, opts: { check: boolean }): Promise<PerformerDetail> {
  const now = new Date();
  const row = await findPerformerDetailRow(db, id, now);
  if (!row) throw notFound('That performer');
  const productionIds = row.engagements.map((e) => e.productionId);
  const access = performerAccess(actor, id, productionIds);
  if (opts.check) authorize(actor, 'performer.view', { performerId: id, performerProductionIds: productionIds });
  const p = row.performer;
  const named = { id: p.id, name: p.preferredName ?? p.legalName };
  const consents = row.consents.map((c) => consentFromJson(c, named, now));
  return shapeDetail(
    { performer: p, engagements: row.engagements, productionIds, access },
    {
      consents: consents.map((c) => c.summary),
      bookings: bookingsFromJson(row.bookings, named, consents.map((c) => c.gate), access.showsProduction),
      linkedUser: row.linkedUser ? { id: row.linkedUser.id, email: row.linkedUser.email, displayName: row.linkedUser.display_name } : undefined,
    },
  );
}

/** The detail after a change, as the actor who made it sees it. */
function freshDetail(db: Db, actor: Actor, id: string): Promise<PerformerDetail> {
  return readDetail(db, actor, id, { check: false });
}

/** Scope of the list and the export: productions where the actor may view performers (permission checked here). */
export function listScope(actor: Actor, productionId: string | undefined): { productionIds: string[]; viewable: Set<string> } {
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
  const productionIds = engagedOn.map((e) => e.productionId);
  return { current, engagedOn, productionIds, access: performerAccess(actor, id, productionIds) };
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

/** The performer role of a linked sign-in, audited as it follows the engagements. */
export async function auditMemberships(trx: Trx, req: Request, actor: Actor, userId: string, added: readonly string[], removed: readonly string[], performerId: string) {
  for (const productionId of added) {
    await writeAudit(trx, { actorUserId: actor.userId, action: 'membership.add', entityType: 'user', entityId: userId, productionId, req, details: { role: 'performer', performerId } });
  }
  for (const productionId of removed) {
    await writeAudit(trx, { actorUserId: actor.userId, action: 'membership.remove', entityType: 'user', entityId: userId, productionId, req, details: { role: 'performer', performerId } });
  }
}

/** Registers a performer, engaged on productions the actor manages; an address given gets its confirmation request. */
export async function createPerformer(ctx: AppContext, actor: Actor, body: CreatePerformerInput, req: Request): Promise<PerformerDetail> {
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
  return freshDetail(ctx.db, actor, id);
}

/**
 * Edits a performer at the version the editor saw. Engagements in the body replace those on
 * productions the actor manages; others are left exactly as they are. A linked sign-in's performer
 * role follows the engagements.
 */
export async function updatePerformer(ctx: AppContext, actor: Actor, id: string, body: UpdatePerformerInput, req: Request): Promise<PerformerDetail> {
  const mails = await ctx.db
    .transaction()
    .execute(async (trx) => {
      const { current, engagedOn, productionIds, access } = await lockForChange(trx, actor, id);
      authorize(actor, 'performers.manage', { performerId: id, performerProductionIds: productionIds });
      if (current.version !== body.version) throw staleEdit(current.version);
      const dupes = duplicateProductions(body.engagements);
      if (Object.keys(dupes).length) throw invalid(dupes);
      const fields = fieldsOf(body);
      if (fields.email && (await findPerformerIdByEmail(trx, fields.email, id))) throw emailTaken();
      const emailChanged = (fields.email ?? null) !== (current.email?.toLowerCase() ?? null);
      if (emailChanged) await assertPerformerAddress(trx, fields.email);

      const managed = new Set(access.managedProductionIds);
      const existing = new Map(engagedOn.map((e) => [e.productionId, e]));
      const wanted = new Map(body.engagements.map((e) => [e.productionId, e]));
      const toAdd: EngagementValues[] = [];
      const toUpdate: EngagementValues[] = [];
      for (const e of body.engagements) {
        if (existing.has(e.productionId)) {
          if (managed.has(e.productionId)) toUpdate.push(e);
        } else {
          authorize(actor, 'performers.manage', { productionId: e.productionId });
          toAdd.push(e);
        }
      }
      const toRemove = [...managed].filter((p) => !wanted.has(p));

      if (!(await updatePerformerAtVersion(trx, id, emailChanged ? fields : { ...fields, email: current.email }, body.version))) throw staleEdit(current.version);
      const mails = emailChanged ? await recordEmailChange(trx, ctx, { performerId: id, before: { email: current.email, confirmed: current.emailConfirmed }, after: fields.email, actor, req }) : [];
      for (const e of toUpdate) await updateEngagement(trx, id, e);
      await deleteEngagements(trx, id, toRemove);
      await insertEngagements(trx, toAdd.map((e) => ({ ...e, performerId: id })));

      await writeAudit(trx, { actorUserId: actor.userId, action: 'performer.update', entityType: 'performer', entityId: id, req, details: { fields: FIELD_KEYS.filter((k) => current[k] !== fields[k]) } });
      for (const e of toAdd) {
        await writeAudit(trx, { actorUserId: actor.userId, action: 'engagement.add', entityType: 'performer', entityId: id, productionId: e.productionId, req, details: { characterName: e.characterName } });
      }
      for (const productionId of toRemove) {
        await writeAudit(trx, { actorUserId: actor.userId, action: 'engagement.remove', entityType: 'performer', entityId: id, productionId, req });
      }
      if (current.userId) {
        const added = await addPerformerMemberships(trx, current.userId, toAdd.map((e) => e.productionId), actor.userId);
        const removed = await removePerformerMemberships(trx, current.userId, toRemove);
        await auditMemberships(trx, req, actor, current.userId, added, removed, id);
      }
      return mails;
    })
    .catch(duplicateToField);
  await deliverAll(ctx, mails);
  return freshDetail(ctx.db, actor, id);
}

/** Unlinks the performer's sign-in (staff never link one); the performer and the lead are told. */
export async function unlinkAccount(ctx: AppContext, actor: Actor, id: string, version: number, req: Request): Promise<PerformerDetail> {
  const mails = await ctx.db.transaction().execute(async (trx) => {
    const { current, productionIds, access } = await lockForChange(trx, actor, id);
    authorize(actor, 'accounts.unlink', { performerId: id, performerProductionIds: productionIds });
    if (current.version !== version) throw staleEdit(current.version);
    const previous = current.userId;
    if (!previous) return [];
    // The administrator may take roles anywhere; a head or lead only where they manage performers.
    const where = actor.isAdmin ? productionIds : access.managedProductionIds;
    if (!(await setPerformerUserAtVersion(trx, id, null, version))) throw staleEdit(current.version);
    const removed = await removePerformerMemberships(trx, previous, where);
    await writeAudit(trx, { actorUserId: actor.userId, action: 'performer.account_unlink', entityType: 'performer', entityId: id, req, details: { before: previous, after: null } });
    await auditMemberships(trx, req, actor, previous, [], removed, id);
    const me = await findUserSummary(trx, actor.userId);
    return unlinkNotices(trx, ctx.config.timeZone, id, me?.displayName ?? 'A member of staff');
  });
  await deliverAll(ctx, mails);
  return freshDetail(ctx.db, actor, id);
}

/** Stores a portrait (upright JPEG without metadata) and its thumbnail; the old files go once committed. */
export async function setPortrait(ctx: AppContext, actor: Actor, id: string, bytes: Buffer, req: Request): Promise<PerformerDetail> {
  const { portrait, thumbnail } = await processPortrait(bytes);
  const store = ctx.files;
  const written: StoredFile[] = [];
  let replaced: { storagePath: string }[] = [];
  try {
    await ctx.db.transaction().execute(async (trx) => {
      if (!(await lockPerformer(trx, id))) throw notFound('That performer');
      const big = await storeFile(trx, store, { purpose: 'portrait', contentType: 'image/jpeg', ext: 'jpg', bytes: portrait.bytes, width: portrait.width, height: portrait.height, createdBy: actor.userId });
      written.push(big);
      const small = await storeFile(trx, store, { purpose: 'portrait_thumb', contentType: 'image/jpeg', ext: 'jpg', bytes: thumbnail.bytes, width: thumbnail.width, height: thumbnail.height, createdBy: actor.userId });
      written.push(small);
      const previous = await setPortraitFiles(trx, id, big.id, small.id);
      replaced = await deleteFileRows(trx, previous);
      await writeAudit(trx, { actorUserId: actor.userId, action: 'performer.portrait_set', entityType: 'performer', entityId: id, req, details: { fileId: big.id, width: portrait.width, height: portrait.height } });
    });
  } catch (err) {
    await discardFiles(store, written);
    throw err;
  }
  // The old photo is personal data nobody points at any more: its bytes go once the change is committed.
  await discardFiles(store, replaced);
  return freshDetail(ctx.db, actor, id);
}

export async function removePortrait(ctx: AppContext, actor: Actor, id: string, req: Request): Promise<void> {
  const removed = await ctx.db.transaction().execute(async (trx) => {
    if (!(await lockPerformer(trx, id))) throw notFound('That performer');
    const previous = await setPortraitFiles(trx, id, null, null);
    const rows = await deleteFileRows(trx, previous);
    if (previous.length) await writeAudit(trx, { actorUserId: actor.userId, action: 'performer.portrait_remove', entityType: 'performer', entityId: id, req });
    return rows;
  });
  await discardFiles(ctx.files, removed);
}

/** Checks who may change a performer's portrait, before a byte of an upload is read. */
export async function assertMayManage(ctx: AppContext, actor: Actor, id: string): Promise<void> {
  const { productionIds } = await loadForActor(ctx.db, actor, id);
  authorize(actor, 'performers.manage', { performerId: id, performerProductionIds: productionIds });
}

/** The stored portrait or thumbnail, for anyone who may see the performer. */
export async function portraitFile(ctx: AppContext, actor: Actor, id: string, which: 'portrait' | 'thumbnail') {
  const { performer, productionIds } = await loadForActor(ctx.db, actor, id);
  authorize(actor, 'performer.view', { performerId: id, performerProductionIds: productionIds });
  const fileId = which === 'portrait' ? performer.portraitFileId : performer.portraitThumbFileId;
  const what = which === 'portrait' ? 'A portrait' : 'A thumbnail';
  if (!fileId) throw notFound(what);
  const file = await readStoredFile(ctx.db, ctx.files, fileId);
  if (!file) throw notFound(what);
  return { fileId, file };
}
