import { z } from 'zod';
import {
  AddMembershipInputSchema,
  AppointLeadInputSchema,
  CreateProductionInputSchema,
  MembershipParamsSchema,
  ProductionDetailSchema,
  ProductionListQuerySchema,
  ProductionPageSchema,
  UpdateProductionInputSchema,
} from '#shared/schemas/admin.ts';
import { IdParamsSchema, VersionSchema } from '#shared/schemas/common.ts';
import type { AppContext } from '../../context.ts';
import { writeAudit } from '../../http/audit.ts';
import { conflict, invalid, notFound } from '../../http/errors.ts';
import { defineRoute } from '../../http/route.ts';
import { sendLeadChangeToHeads, sendRoleNotice } from './notices.ts';
import { bumpProductionVersion, displayNameOf, findProduction, leadFitness, listLeadHistory, listMemberships, listProductions, lockProduction } from './repo.ts';
import { sql } from 'kysely';

async function detail(ctx: AppContext, id: string) {
  const production = await findProduction(ctx.db, id);
  if (!production) throw notFound('That production');
  const [memberships, leadHistory] = await Promise.all([listMemberships(ctx.db, id), listLeadHistory(ctx.db, id)]);
  return { ...production, memberships, leadHistory };
}

function staleProduction(version: number) {
  return conflict('Someone else changed this production since you opened it. Reload to see their change.', { currentVersion: version });
}

export const productionRoutes = [
  defineRoute({
    method: 'get',
    path: '/api/productions',
    summary: 'List productions (search, sort, page)',
    tag: 'admin',
    auth: 'session',
    requires: 'productions.manage',
    query: ProductionListQuerySchema,
    response: ProductionPageSchema,
    errors: [403],
    async handler({ ctx, query }) {
      const { items, total } = await listProductions(ctx.db, query);
      return { items, total, page: query.page, pageSize: query.pageSize };
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/productions/:id',
    summary: 'One production with its memberships and the designated-lead history',
    tag: 'admin',
    auth: 'session',
    requires: 'productions.manage',
    params: IdParamsSchema,
    response: ProductionDetailSchema,
    errors: [403, 404],
    async handler({ ctx, params }) {
      return detail(ctx, params.id);
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/productions',
    summary: 'Create a production',
    tag: 'admin',
    auth: 'session',
    requires: 'productions.manage',
    body: CreateProductionInputSchema,
    response: ProductionDetailSchema,
    status: 201,
    errors: [403, 409],
    async handler({ ctx, actor, body, req }) {
      const taken = await ctx.db.selectFrom('productions').select('id').where(sql`lower(name)`, '=', body.name.toLowerCase()).executeTakeFirst();
      if (taken) throw invalid({ name: ['A production with this name already exists.'] });
      const id = await ctx.db.transaction().execute(async (trx) => {
        const row = await trx
          .insertInto('productions')
          .values({ name: body.name, kind: body.kind, starts_on: body.startsOn, ends_on: body.endsOn })
          .returning('id')
          .executeTakeFirstOrThrow();
        await writeAudit(trx, { actorUserId: actor.userId, action: 'production.create', entityType: 'production', entityId: row.id, productionId: row.id, req, details: { name: body.name } });
        return row.id;
      });
      return detail(ctx, id);
    },
  }),
  defineRoute({
    method: 'patch',
    path: '/api/productions/:id',
    summary: 'Edit a production (optimistic lock on version)',
    tag: 'admin',
    auth: 'session',
    requires: 'productions.manage',
    params: IdParamsSchema,
    body: UpdateProductionInputSchema,
    response: ProductionDetailSchema,
    errors: [403, 404, 409],
    async handler({ ctx, actor, params, body, req }) {
      await ctx.db.transaction().execute(async (trx) => {
        const current = await lockProduction(trx, params.id);
        if (!current) throw notFound('That production');
        if (current.version !== body.version) throw staleProduction(current.version);
        const clash = await trx.selectFrom('productions').select('id').where(sql`lower(name)`, '=', body.name.toLowerCase()).where('id', '!=', params.id).executeTakeFirst();
        if (clash) throw invalid({ name: ['A production with this name already exists.'] });
        await trx
          .updateTable('productions')
          .set({ name: body.name, kind: body.kind, starts_on: body.startsOn, ends_on: body.endsOn, version: sql`version + 1`, updated_at: sql`now()` })
          .where('id', '=', params.id)
          .execute();
        await writeAudit(trx, { actorUserId: actor.userId, action: 'production.update', entityType: 'production', entityId: params.id, productionId: params.id, req, details: { name: body.name } });
      });
      return detail(ctx, params.id);
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/productions/:id/memberships',
    summary: 'Give a user a role on a production (e-mails them a notice)',
    tag: 'admin',
    auth: 'session',
    requires: 'memberships.manage',
    params: IdParamsSchema,
    body: AddMembershipInputSchema,
    response: ProductionDetailSchema,
    status: 201,
    errors: [403, 404, 409],
    async handler({ ctx, actor, params, body, req }) {
      const { user, productionName } = await ctx.db.transaction().execute(async (trx) => {
        const production = await lockProduction(trx, params.id);
        if (!production) throw notFound('That production');
        const user = await trx.selectFrom('users').select(['id', 'email', 'display_name']).where('id', '=', body.userId).executeTakeFirst();
        if (!user) throw invalid({ userId: ['That user does not exist.'] });
        const existing = await trx
          .selectFrom('memberships')
          .select('id')
          .where('user_id', '=', body.userId)
          .where('production_id', '=', params.id)
          .where('role', '=', body.role)
          .executeTakeFirst();
        if (existing) throw invalid({ role: ['This person already has that role here.'] });
        await trx.insertInto('memberships').values({ user_id: body.userId, production_id: params.id, role: body.role, created_by: actor.userId }).execute();
        await bumpProductionVersion(trx, params.id);
        await writeAudit(trx, { actorUserId: actor.userId, action: 'membership.add', entityType: 'user', entityId: body.userId, productionId: params.id, req, details: { role: body.role } });
        return { user, productionName: production.name };
      });
      await sendRoleNotice(ctx, { email: user.email, displayName: user.display_name }, body.role, productionName);
      return detail(ctx, params.id);
    },
  }),
  defineRoute({
    method: 'delete',
    path: '/api/productions/:id/memberships/:membershipId',
    summary: 'Take a role on a production away from a user',
    tag: 'admin',
    auth: 'session',
    requires: 'memberships.manage',
    params: MembershipParamsSchema,
    response: ProductionDetailSchema,
    errors: [403, 404],
    async handler({ ctx, actor, params, req }) {
      await ctx.db.transaction().execute(async (trx) => {
        const production = await lockProduction(trx, params.id);
        if (!production) throw notFound('That production');
        const removed = await trx
          .deleteFrom('memberships')
          .where('id', '=', params.membershipId)
          .where('production_id', '=', params.id)
          .returning(['user_id', 'role'])
          .executeTakeFirst();
        if (!removed) throw notFound('That membership');
        await bumpProductionVersion(trx, params.id);
        await writeAudit(trx, { actorUserId: actor.userId, action: 'membership.remove', entityType: 'user', entityId: removed.user_id, productionId: params.id, req, details: { role: removed.role } });
      });
      return detail(ctx, params.id);
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/productions/:id/lead',
    summary: 'Appoint the designated lead; the previous appointment ends now (history kept)',
    tag: 'admin',
    auth: 'session',
    requires: 'lead.appoint',
    params: IdParamsSchema,
    body: AppointLeadInputSchema,
    response: ProductionDetailSchema,
    status: 201,
    errors: [403, 404, 409],
    async handler({ ctx, actor, params, body, req }) {
      const { user, productionName } = await ctx.db.transaction().execute(async (trx) => {
        const production = await lockProduction(trx, params.id);
        if (!production) throw notFound('That production');
        if (production.version !== body.version) throw staleProduction(production.version);
        const user = await trx.selectFrom('users').select(['id', 'email', 'display_name']).where('id', '=', body.userId).executeTakeFirst();
        if (!user) throw invalid({ userId: ['That user does not exist.'] });
        // Nobody holds the keys to every performer's health data alone: another administrator appoints you.
        if (body.userId === actor.userId) throw invalid({ userId: ['You cannot appoint yourself. Another administrator must make this appointment.'] });
        const fitness = await leadFitness(trx, body.userId, params.id);
        if (!fitness.staff) throw invalid({ userId: ['Give this person a staff role on the production first; the lead must be on the team.'] });
        if (fitness.performer) throw invalid({ userId: ['This person is a performer on this production; a performer cannot be the designated lead who reads performers’ health details.'] });
        const open = await trx.selectFrom('lead_appointments').select(['id', 'user_id']).where('production_id', '=', params.id).where('ends_at', 'is', null).executeTakeFirst();
        if (open?.user_id === body.userId) throw invalid({ userId: ['This person is already the designated lead.'] });
        if (open) {
          await trx.updateTable('lead_appointments').set({ ends_at: sql`now()`, ended_by: actor.userId }).where('id', '=', open.id).execute();
        }
        await trx.insertInto('lead_appointments').values({ production_id: params.id, user_id: body.userId, appointed_by: actor.userId }).execute();
        await bumpProductionVersion(trx, params.id);
        await writeAudit(trx, { actorUserId: actor.userId, action: 'lead.appoint', entityType: 'user', entityId: body.userId, productionId: params.id, req, details: { previousLead: open?.user_id ?? null } });
        return { user, productionName: production.name };
      });
      await sendRoleNotice(ctx, { email: user.email, displayName: user.display_name }, 'lead', productionName);
      await sendLeadChangeToHeads(ctx, params.id, productionName, `${user.display_name} is now the designated lead on ${productionName}, appointed by ${await displayNameOf(ctx.db, actor.userId)}.`);
      return detail(ctx, params.id);
    },
  }),
  defineRoute({
    method: 'delete',
    path: '/api/productions/:id/lead',
    summary: 'End the current designated-lead appointment without naming a successor',
    tag: 'admin',
    auth: 'session',
    requires: 'lead.appoint',
    params: IdParamsSchema,
    query: z.object({ version: z.coerce.number().pipe(VersionSchema) }),
    response: ProductionDetailSchema,
    errors: [403, 404, 409],
    async handler({ ctx, actor, params, query, req }) {
      const endedInfo = await ctx.db.transaction().execute(async (trx) => {
        const production = await lockProduction(trx, params.id);
        if (!production) throw notFound('That production');
        if (production.version !== query.version) throw staleProduction(production.version);
        const ended = await trx
          .updateTable('lead_appointments')
          .set({ ends_at: sql`now()`, ended_by: actor.userId })
          .where('production_id', '=', params.id)
          .where('ends_at', 'is', null)
          .returning('user_id')
          .executeTakeFirst();
        if (!ended) throw notFound('A current lead appointment');
        await bumpProductionVersion(trx, params.id);
        await writeAudit(trx, { actorUserId: actor.userId, action: 'lead.end', entityType: 'user', entityId: ended.user_id, productionId: params.id, req });
        return { productionName: production.name, endedUser: ended.user_id };
      });
      await sendLeadChangeToHeads(ctx, params.id, endedInfo.productionName, `${await displayNameOf(ctx.db, endedInfo.endedUser)} is no longer the designated lead on ${endedInfo.productionName}; nobody holds the appointment now. Ended by ${await displayNameOf(ctx.db, actor.userId)}.`);
      return detail(ctx, params.id);
    },
  }),
];
