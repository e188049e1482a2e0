import type { Request } from 'express';
import type { Actor } from '#shared/policy.ts';
import type { CreateUserInput, UpdateUserInput, User } from '#shared/schemas/admin.ts';
import type { AppContext } from '../../context.ts';
import { writeAudit } from '../../http/audit.ts';
import { endSessionsOf } from '../../http/session.ts';
import { conflict, invalid, notFound } from '../../http/errors.ts';
import { countAdmins, findUserById, insertUser, isEmailTaken, lockUser, updateUserAtVersion } from './repo.ts';

export async function userById(ctx: AppContext, id: string): Promise<User> {
  const user = await findUserById(ctx.db, id);
  if (!user) throw notFound('That user');
  return user;
}

export async function createUser(ctx: AppContext, actor: Actor, input: CreateUserInput, req: Request): Promise<User> {
  if (await isEmailTaken(ctx.db, input.email)) throw invalid({ email: ['A user with this e-mail already exists.'] });
  const id = await ctx.db.transaction().execute(async (trx) => {
    const newId = await insertUser(trx, input);
    await writeAudit(trx, { actorUserId: actor.userId, action: 'user.create', entityType: 'user', entityId: newId, req, details: { email: input.email, isAdmin: input.isAdmin } });
    return newId;
  });
  return userById(ctx, id);
}

export async function editUser(ctx: AppContext, actor: Actor, id: string, input: UpdateUserInput, req: Request): Promise<User> {
  await ctx.db.transaction().execute(async (trx) => {
    const current = await lockUser(trx, id);
    if (!current) throw notFound('That user');
    if (current.isAdmin && !input.isAdmin && (await countAdmins(trx)) <= 1) {
      throw invalid({ isAdmin: ['This is the last studio administrator; appoint another first.'] });
    }
    if (!(await updateUserAtVersion(trx, id, input))) {
      throw conflict('Someone else changed this user since you opened it. Reload to see their change.', { currentVersion: current.version });
    }
    await writeAudit(trx, { actorUserId: actor.userId, action: 'user.update', entityType: 'user', entityId: id, req, details: { displayName: input.displayName, isAdmin: input.isAdmin } });
  });
  return userById(ctx, id);
}

/** Ends every session of a user at once: their next request, on any device, must sign in again. */
export async function endUserSessions(ctx: AppContext, actor: Actor, id: string, req: Request): Promise<{ ended: number }> {
  await userById(ctx, id);
  const ended = await ctx.db.transaction().execute(async (trx) => {
    const n = await endSessionsOf(trx, id);
    await writeAudit(trx, { actorUserId: actor.userId, action: 'user.sessions_end', entityType: 'user', entityId: id, req, details: { ended: n } });
    return n;
  });
  return { ended };
}
