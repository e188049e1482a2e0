import { sql } from 'kysely';
import { IdParamsSchema } from '#shared/schemas/common.ts';
import { CreateUserInputSchema, UpdateUserInputSchema, UserListQuerySchema, UserPageSchema, UserSchema } from '#shared/schemas/admin.ts';
import { writeAudit } from '../../http/audit.ts';
import { conflict, invalid, notFound } from '../../http/errors.ts';
import { defineRoute } from '../../http/route.ts';
import { countAdmins, findUserById, insertUser, listUsers, updateUserAtVersion } from './repo.ts';

export const userRoutes = [
  defineRoute({
    method: 'get',
    path: '/api/users',
    summary: 'List users (search, filter, sort, page)',
    tag: 'admin',
    auth: 'session',
    requires: 'users.manage',
    query: UserListQuerySchema,
    response: UserPageSchema,
    errors: [403],
    async handler({ ctx, query }) {
      const { items, total } = await listUsers(ctx.db, query);
      return { items, total, page: query.page, pageSize: query.pageSize };
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/users/:id',
    summary: 'One user',
    tag: 'admin',
    auth: 'session',
    requires: 'users.manage',
    params: IdParamsSchema,
    response: UserSchema,
    errors: [403, 404],
    async handler({ ctx, params }) {
      const user = await findUserById(ctx.db, params.id);
      if (!user) throw notFound('That user');
      return user;
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/users',
    summary: 'Register a user by e-mail before their first sign-in',
    tag: 'admin',
    auth: 'session',
    requires: 'users.manage',
    body: CreateUserInputSchema,
    response: UserSchema,
    status: 201,
    errors: [403, 409],
    async handler({ ctx, actor, body, req }) {
      const exists = await ctx.db.selectFrom('users').select('id').where(sql`lower(email)`, '=', body.email).executeTakeFirst();
      if (exists) throw invalid({ email: ['A user with this e-mail already exists.'] });
      const id = await ctx.db.transaction().execute(async (trx) => {
        const newId = await insertUser(trx, body);
        await writeAudit(trx, { actorUserId: actor.userId, action: 'user.create', entityType: 'user', entityId: newId, req, details: { email: body.email, isAdmin: body.isAdmin } });
        return newId;
      });
      return (await findUserById(ctx.db, id))!;
    },
  }),
  defineRoute({
    method: 'patch',
    path: '/api/users/:id',
    summary: 'Rename a user or change the studio-admin flag (optimistic lock on version)',
    tag: 'admin',
    auth: 'session',
    requires: 'users.manage',
    params: IdParamsSchema,
    body: UpdateUserInputSchema,
    response: UserSchema,
    errors: [403, 404, 409],
    async handler({ ctx, actor, params, body, req }) {
      await ctx.db.transaction().execute(async (trx) => {
        const current = await trx.selectFrom('users').select(['id', 'is_admin', 'version']).where('id', '=', params.id).forUpdate().executeTakeFirst();
        if (!current) throw notFound('That user');
        if (current.is_admin && !body.isAdmin && (await countAdmins(trx)) <= 1) {
          throw invalid({ isAdmin: ['This is the last studio administrator; appoint another first.'] });
        }
        if (!(await updateUserAtVersion(trx, params.id, body))) {
          throw conflict('Someone else changed this user since you opened it. Reload to see their change.', { currentVersion: current.version });
        }
        await writeAudit(trx, { actorUserId: actor.userId, action: 'user.update', entityType: 'user', entityId: params.id, req, details: { displayName: body.displayName, isAdmin: body.isAdmin } });
      });
      return (await findUserById(ctx.db, params.id))!;
    },
  }),
];
