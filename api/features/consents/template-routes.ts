import { z } from 'zod';
import { canSomewhere } from '#shared/policy.ts';
import { IdParamsSchema } from '#shared/schemas/common.ts';
import { CreateTemplateInputSchema, TemplateListSchema, TemplateSchema, TemplateVersionListSchema, UpdateTemplateInputSchema } from '#shared/schemas/consents.ts';
import { writeAudit } from '../../http/audit.ts';
import { conflict, forbidden, notFound } from '../../http/errors.ts';
import { defineRoute } from '../../http/route.ts';
import { findCurrentTemplateVersion, findTemplate, listTemplates, productionsUsingTemplate } from './repo.ts';
import { questionsLosingMedicalFlag, withMedicalFlags } from '#shared/domain/questionnaire.ts';
import type { Actor } from '#shared/policy.ts';
import type { Db } from '../../db/index.ts';

/** The designated lead of a production that has used the form (or, for a form never used, any lead). */
async function mayLowerMedicalFlag(db: Db, actor: Actor, templateId: string): Promise<boolean> {
  const used = await productionsUsingTemplate(db, templateId);
  return used.length ? used.some((p) => actor.leadOf.includes(p)) : actor.leadOf.length > 0;
}

export const templateRoutes = [
  defineRoute({
    method: 'get',
    path: '/api/consent-templates',
    summary: 'Consent templates at their current version (for editing, and for choosing what to send)',
    tag: 'consents',
    auth: 'session',
    query: z.object({ archived: z.enum(['true', 'false']).default('false') }),
    response: TemplateListSchema,
    errors: [403],
    async handler({ ctx, actor, query }) {
      if (!canSomewhere(actor, 'consents.request') && !actor.isAdmin) throw forbidden('see consent templates');
      return { items: await listTemplates(ctx.db, query.archived === 'true') };
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/consent-templates/:id',
    summary: 'One template at its current version',
    tag: 'consents',
    auth: 'session',
    params: IdParamsSchema,
    response: TemplateSchema,
    errors: [403, 404],
    async handler({ ctx, actor, params }) {
      if (!canSomewhere(actor, 'consents.request') && !actor.isAdmin) throw forbidden('see consent templates');
      const t = await findTemplate(ctx.db, params.id);
      if (!t) throw notFound('That template');
      return t;
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/consent-templates/:id/versions',
    summary: 'Every published version of a template, newest first',
    tag: 'consents',
    auth: 'session',
    params: IdParamsSchema,
    response: TemplateVersionListSchema,
    errors: [403, 404],
    async handler({ ctx, actor, params }) {
      if (!canSomewhere(actor, 'consents.request') && !actor.isAdmin) throw forbidden('see consent templates');
      const rows = await ctx.db
        .selectFrom('consent_template_versions as v')
        .leftJoin('users as u', 'u.id', 'v.created_by')
        .select(['v.id', 'v.version', 'v.title', 'v.created_at', 'u.display_name'])
        .where('v.template_id', '=', params.id)
        .orderBy('v.version', 'desc')
        .execute();
      if (!rows.length) throw notFound('That template');
      return { items: rows.map((r) => ({ versionId: r.id, version: r.version, title: r.title, createdAt: new Date(r.created_at).toISOString(), createdBy: r.display_name })) };
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/consent-templates',
    summary: 'Create a consent template (version 1)',
    tag: 'consents',
    auth: 'session',
    requires: 'templates.manage',
    body: CreateTemplateInputSchema,
    response: TemplateSchema,
    status: 201,
    errors: [403],
    async handler({ ctx, actor, body, req }) {
      const id = await ctx.db.transaction().execute(async (trx) => {
        const t = await trx.insertInto('consent_templates').values({ kind: body.kind }).returning('id').executeTakeFirstOrThrow();
        await trx
          .insertInto('consent_template_versions')
          .values({ template_id: t.id, version: 1, title: body.title, body: body.body, questions: JSON.stringify(withMedicalFlags(body.kind, body.questions)), validity_days: body.validityDays, created_by: actor.userId })
          .execute();
        await writeAudit(trx, { actorUserId: actor.userId, action: 'template.create', entityType: 'consent_template', entityId: t.id, req, details: { kind: body.kind, title: body.title } });
        return t.id;
      });
      return (await findTemplate(ctx.db, id))!;
    },
  }),
  defineRoute({
    method: 'put',
    path: '/api/consent-templates/:id',
    summary: 'Publish a new version of a template; signed consents keep the version they were signed on',
    tag: 'consents',
    auth: 'session',
    requires: 'templates.manage',
    params: IdParamsSchema,
    body: UpdateTemplateInputSchema,
    response: TemplateSchema,
    errors: [403, 404, 409],
    async handler({ ctx, actor, params, body, req }) {
      await ctx.db.transaction().execute(async (trx) => {
        const t = await trx.selectFrom('consent_templates').select(['id', 'kind', 'current_version']).where('id', '=', params.id).forUpdate().executeTakeFirst();
        if (!t) throw notFound('That template');
        if (t.current_version !== body.version) {
          throw conflict(`Someone published version ${t.current_version} of this form since you opened it. Reload to see it.`, { currentVersion: t.current_version });
        }
        const questions = withMedicalFlags(body.kind, body.questions);
        const previous = await findCurrentTemplateVersion(trx, t.id);
        const lowered = previous ? questionsLosingMedicalFlag(previous.questions, questions) : [];
        // Making a health question non-medical opens its answers to all staff: only a lead decides that.
        if (lowered.length && !(await mayLowerMedicalFlag(trx, actor, t.id))) {
          throw forbidden('mark a health question as not medical; only the designated lead of a production that uses this form may do that');
        }
        const next = t.current_version + 1;
        await trx
          .insertInto('consent_template_versions')
          .values({ template_id: t.id, version: next, title: body.title, body: body.body, questions: JSON.stringify(questions), validity_days: body.validityDays, created_by: actor.userId })
          .execute();
        await trx.updateTable('consent_templates').set({ current_version: next, kind: body.kind }).where('id', '=', t.id).execute();
        await writeAudit(trx, { actorUserId: actor.userId, action: 'template.publish', entityType: 'consent_template', entityId: t.id, req, details: { version: next, ...(lowered.length ? { madeNonMedical: lowered } : {}) } });
      });
      return (await findTemplate(ctx.db, params.id))!;
    },
  }),
  defineRoute({
    method: 'put',
    path: '/api/consent-templates/:id/archived',
    summary: 'Archive or restore a template (archived ones cannot be sent; signed consents are untouched)',
    tag: 'consents',
    auth: 'session',
    requires: 'templates.manage',
    params: IdParamsSchema,
    body: z.object({ archived: z.boolean() }),
    response: TemplateSchema,
    errors: [403, 404],
    async handler({ ctx, actor, params, body, req }) {
      const res = await ctx.db.transaction().execute(async (trx) => {
        const r = await trx.updateTable('consent_templates').set({ archived: body.archived }).where('id', '=', params.id).executeTakeFirst();
        if (Number(r.numUpdatedRows) === 1) {
          await writeAudit(trx, { actorUserId: actor.userId, action: body.archived ? 'template.archive' : 'template.restore', entityType: 'consent_template', entityId: params.id, req });
        }
        return r;
      });
      if (Number(res.numUpdatedRows) !== 1) throw notFound('That template');
      return (await findTemplate(ctx.db, params.id))!;
    },
  }),
];
