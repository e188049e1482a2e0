import { z } from 'zod';
import { IdParamsSchema } from '#shared/schemas/common.ts';
import { CreateUserInputSchema, UpdateUserInputSchema, UserListQuerySchema, UserPageSchema, UserSchema } from '#shared/schemas/admin.ts';
import { type AnyRoute, defineRoute } from '../../http/route.ts';
import { listUsers } from './repo.ts';
import { createUser, editUser, endUserSessions, userById } from './service.ts';

export const userRoutes: AnyRoute[] = [
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
    handler: ({ ctx, params }) => userById(ctx, params.id),
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
    handler: ({ ctx, actor, body, req }) => createUser(ctx, actor, body, req),
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
    handler: ({ ctx, actor, params, body, req }) => editUser(ctx, actor, params.id, body, req),
  }),
  defineRoute({
    method: 'post',
    path: '/api/users/:id/sessions/end',
    summary: 'End every session of a user at once (their next request on any device gets 401)',
    tag: 'admin',
    auth: 'session',
    requires: 'users.manage',
    params: IdParamsSchema,
    response: z.object({ ended: z.number().int() }),
    errors: [403, 404],
    handler: ({ ctx, actor, params, req }) => endUserSessions(ctx, actor, params.id, req),
  }),
];
