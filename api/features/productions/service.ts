import type { Request } from 'express';
import type { Actor } from '#shared/policy.ts';
import type { AddMembershipInput, CreateProductionInput, ProductionDetail, UpdateProductionInput } from '#shared/schemas/admin.ts';
import type { AppContext } from '../../context.ts';
import { writeAudit } from '../../http/audit.ts';
import { conflict, invalid, notFound } from '../../http/errors.ts';
import { findUserSummary } from '../users/index.ts';
import { sendLeadChangeToHeads, sendRoleNotice } from './notices.ts';
import {
  bumpProductionVersion,
  deleteMembership,
  displayNameOf,
  endLeadAppointment,
  endOpenLeadAppointment,
  findOpenLeadAppointment,
  findProduction,
  hasMembership,
  insertLeadAppointment,
  insertMembership,
  insertProduction,
  isProductionNameTaken,
  leadFitness,
  listLeadHistory,
  listMemberships,
  lockProduction,
  updateProduction,
} from './repo.ts';

export async function productionDetail(ctx: AppContext, id: string): Promise<ProductionDetail> {
  const production = await findProduction(ctx.db, id);
  if (!production) throw notFound('That production');
  const [memberships, leadHistory] = await Promise.all([listMemberships(ctx.db, id), listLeadHistory(ctx.db, id)]);
  return { ...production, memberships, leadHistory };
}

function staleProduction(version: number) {
  return conflict('Someone else changed this production since you opened it. Reload to see their change.', { currentVersion: version });
}

const nameTaken = () => invalid({ name: ['A production with this name already exists.'] });

export async function createProduction(ctx: AppContext, actor: Actor, input: CreateProductionInput, req: Request): Promise<ProductionDetail> {
  if (await isProductionNameTaken(ctx.db, input.name)) throw nameTaken();
  const id = await ctx.db.transaction().execute(async (trx) => {
    const newId = await insertProduction(trx, input);
    await writeAudit(trx, { actorUserId: actor.userId, action: 'production.create', entityType: 'production', entityId: newId, productionId: newId, req, details: { name: input.name } });
    return newId;
  });
  return productionDetail(ctx, id);
}

export async function editProduction(ctx: AppContext, actor: Actor, id: string, input: UpdateProductionInput, req: Request): Promise<ProductionDetail> {
  await ctx.db.transaction().execute(async (trx) => {
    const current = await lockProduction(trx, id);
    if (!current) throw notFound('That production');
    if (current.version !== input.version) throw staleProduction(current.version);
    if (await isProductionNameTaken(trx, input.name, id)) throw nameTaken();
    await updateProduction(trx, id, input);
    await writeAudit(trx, { actorUserId: actor.userId, action: 'production.update', entityType: 'production', entityId: id, productionId: id, req, details: { name: input.name } });
  });
  return productionDetail(ctx, id);
}

export async function addMembership(ctx: AppContext, actor: Actor, productionId: string, input: AddMembershipInput, req: Request): Promise<ProductionDetail> {
  const { user, productionName } = await ctx.db.transaction().execute(async (trx) => {
    const production = await lockProduction(trx, productionId);
    if (!production) throw notFound('That production');
    const user = await findUserSummary(trx, input.userId);
    if (!user) throw invalid({ userId: ['That user does not exist.'] });
    if (await hasMembership(trx, input.userId, productionId, input.role)) throw invalid({ role: ['This person already has that role here.'] });
    await insertMembership(trx, { userId: input.userId, productionId, role: input.role, createdBy: actor.userId });
    await bumpProductionVersion(trx, productionId);
    await writeAudit(trx, { actorUserId: actor.userId, action: 'membership.add', entityType: 'user', entityId: input.userId, productionId, req, details: { role: input.role } });
    return { user, productionName: production.name };
  });
  await sendRoleNotice(ctx, { email: user.email, displayName: user.displayName }, input.role, productionId, productionName);
  return productionDetail(ctx, productionId);
}

export async function removeMembership(ctx: AppContext, actor: Actor, productionId: string, membershipId: string, req: Request): Promise<ProductionDetail> {
  await ctx.db.transaction().execute(async (trx) => {
    if (!(await lockProduction(trx, productionId))) throw notFound('That production');
    const removed = await deleteMembership(trx, membershipId, productionId);
    if (!removed) throw notFound('That membership');
    await bumpProductionVersion(trx, productionId);
    await writeAudit(trx, { actorUserId: actor.userId, action: 'membership.remove', entityType: 'user', entityId: removed.userId, productionId, req, details: { role: removed.role } });
  });
  return productionDetail(ctx, productionId);
}

/** Appoints the designated lead: a staff member of the production, never a performer there, never oneself. */
export async function appointLead(ctx: AppContext, actor: Actor, productionId: string, input: { userId: string; version: number }, req: Request): Promise<ProductionDetail> {
  const { user, productionName } = await ctx.db.transaction().execute(async (trx) => {
    const production = await lockProduction(trx, productionId);
    if (!production) throw notFound('That production');
    if (production.version !== input.version) throw staleProduction(production.version);
    const user = await findUserSummary(trx, input.userId);
    if (!user) throw invalid({ userId: ['That user does not exist.'] });
    // Nobody holds the keys to every performer's health data alone: another administrator appoints you.
    if (input.userId === actor.userId) throw invalid({ userId: ['You cannot appoint yourself. Another administrator must make this appointment.'] });
    const fitness = await leadFitness(trx, input.userId, productionId);
    if (!fitness.staff) throw invalid({ userId: ['Give this person a staff role on the production first; the lead must be on the team.'] });
    if (fitness.performer) throw invalid({ userId: ['This person is a performer on this production; a performer cannot be the designated lead who reads performers’ health details.'] });
    const open = await findOpenLeadAppointment(trx, productionId);
    if (open?.userId === input.userId) throw invalid({ userId: ['This person is already the designated lead.'] });
    if (open) await endLeadAppointment(trx, open.id, actor.userId);
    await insertLeadAppointment(trx, productionId, input.userId, actor.userId);
    await bumpProductionVersion(trx, productionId);
    await writeAudit(trx, { actorUserId: actor.userId, action: 'lead.appoint', entityType: 'user', entityId: input.userId, productionId, req, details: { previousLead: open?.userId ?? null } });
    return { user, productionName: production.name };
  });
  await sendRoleNotice(ctx, { email: user.email, displayName: user.displayName }, 'lead', productionId, productionName);
  await sendLeadChangeToHeads(ctx, productionId, productionName, `${user.displayName} is now the designated lead on ${productionName}, appointed by ${await displayNameOf(ctx.db, actor.userId)}.`);
  return productionDetail(ctx, productionId);
}

export async function endLead(ctx: AppContext, actor: Actor, productionId: string, version: number, req: Request): Promise<ProductionDetail> {
  const ended = await ctx.db.transaction().execute(async (trx) => {
    const production = await lockProduction(trx, productionId);
    if (!production) throw notFound('That production');
    if (production.version !== version) throw staleProduction(production.version);
    const endedUser = await endOpenLeadAppointment(trx, productionId, actor.userId);
    if (!endedUser) throw notFound('A current lead appointment');
    await bumpProductionVersion(trx, productionId);
    await writeAudit(trx, { actorUserId: actor.userId, action: 'lead.end', entityType: 'user', entityId: endedUser, productionId, req });
    return { productionName: production.name, endedUser };
  });
  await sendLeadChangeToHeads(
    ctx,
    productionId,
    ended.productionName,
    `${await displayNameOf(ctx.db, ended.endedUser)} is no longer the designated lead on ${ended.productionName}; nobody holds the appointment now. Ended by ${await displayNameOf(ctx.db, actor.userId)}.`,
  );
  return productionDetail(ctx, productionId);
}
