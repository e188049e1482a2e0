import type { Request } from 'express';
import { questionsLosingMedicalFlag, withMedicalFlags } from '#shared/domain/questionnaire.ts';
import type { Actor } from '#shared/policy.ts';
import type { CreateTemplateInput, Template, TemplateVersionList, UpdateTemplateInput } from '#shared/schemas/consents.ts';
import type { AppContext } from '../../context.ts';
import type { Db } from '../../db/index.ts';
import { writeAudit } from '../../http/audit.ts';
import { authorize } from '../../http/authorize.ts';
import { conflict, forbidden, notFound } from '../../http/errors.ts';
import {
  findCurrentTemplateVersion,
  findTemplate,
  insertTemplate,
  insertTemplateVersion,
  listTemplates,
  listTemplateVersions,
  lockTemplate,
  productionsUsingTemplate,
  setTemplateArchived,
  setTemplateCurrentVersion,
} from './template-repo.ts';

export async function templatesFor(ctx: AppContext, actor: Actor, includeArchived: boolean): Promise<Template[]> {
  authorize(actor, 'templates.read');
  return listTemplates(ctx.db, includeArchived);
}

export async function templateFor(ctx: AppContext, actor: Actor, id: string): Promise<Template> {
  authorize(actor, 'templates.read');
  const t = await findTemplate(ctx.db, id);
  if (!t) throw notFound('That template');
  return t;
}

export async function templateVersionsFor(ctx: AppContext, actor: Actor, id: string): Promise<TemplateVersionList> {
  authorize(actor, 'templates.read');
  const items = await listTemplateVersions(ctx.db, id);
  if (!items.length) throw notFound('That template');
  return { items };
}

export async function createTemplate(ctx: AppContext, actor: Actor, input: CreateTemplateInput, req: Request): Promise<Template> {
  const id = await ctx.db.transaction().execute(async (trx) => {
    const newId = await insertTemplate(trx, input.kind);
    await insertTemplateVersion(trx, { templateId: newId, version: 1, title: input.title, body: input.body, questions: withMedicalFlags(input.kind, input.questions), validityDays: input.validityDays, createdBy: actor.userId });
    await writeAudit(trx, { actorUserId: actor.userId, action: 'template.create', entityType: 'consent_template', entityId: newId, req, details: { kind: input.kind, title: input.title } });
    return newId;
  });
  return (await findTemplate(ctx.db, id))!;
}

/** The designated lead of a production that has used the form (or, for a form never used, any lead). */
async function mayLowerMedicalFlag(db: Db, actor: Actor, templateId: string): Promise<boolean> {
  const used = await productionsUsingTemplate(db, templateId);
  return used.length ? used.some((p) => actor.leadOf.includes(p)) : actor.leadOf.length > 0;
}

/** Publishes the next version; signed consents keep the version they were signed on. */
export async function publishTemplate(ctx: AppContext, actor: Actor, id: string, input: UpdateTemplateInput, req: Request): Promise<Template> {
  await ctx.db.transaction().execute(async (trx) => {
    const t = await lockTemplate(trx, id);
    if (!t) throw notFound('That template');
    if (t.currentVersion !== input.version) {
      throw conflict(`Someone published version ${t.currentVersion} of this form since you opened it. Reload to see it.`, { currentVersion: t.currentVersion });
    }
    const questions = withMedicalFlags(input.kind, input.questions);
    const previous = await findCurrentTemplateVersion(trx, t.id);
    const lowered = previous ? questionsLosingMedicalFlag(previous.questions, questions) : [];
    // Making a health question non-medical opens its answers to all staff: only a lead decides that.
    if (lowered.length && !(await mayLowerMedicalFlag(trx, actor, t.id))) {
      throw forbidden('mark a health question as not medical; only the designated lead of a production that uses this form may do that');
    }
    const next = t.currentVersion + 1;
    await insertTemplateVersion(trx, { templateId: t.id, version: next, title: input.title, body: input.body, questions, validityDays: input.validityDays, createdBy: actor.userId });
    await setTemplateCurrentVersion(trx, t.id, next, input.kind);
    await writeAudit(trx, { actorUserId: actor.userId, action: 'template.publish', entityType: 'consent_template', entityId: t.id, req, details: { version: next, ...(lowered.length ? { madeNonMedical: lowered } : {}) } });
  });
  return (await findTemplate(ctx.db, id))!;
}

export async function archiveTemplate(ctx: AppContext, actor: Actor, id: string, archived: boolean, req: Request): Promise<Template> {
  const found = await ctx.db.transaction().execute(async (trx) => {
    if (!(await setTemplateArchived(trx, id, archived))) return false;
    await writeAudit(trx, { actorUserId: actor.userId, action: archived ? 'template.archive' : 'template.restore', entityType: 'consent_template', entityId: id, req });
    return true;
  });
  if (!found) throw notFound('That template');
  return (await findTemplate(ctx.db, id))!;
}
