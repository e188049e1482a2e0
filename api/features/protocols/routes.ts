import { ProtocolHistorySchema, ProtocolListSchema, ProtocolParamsSchema, ProtocolVersionSchema, UpdateProtocolInputSchema } from '#shared/schemas/protocols.ts';
import { defineRoute } from '../../http/route.ts';
import { listCurrentProtocols } from './repo.ts';
import { currentProtocol, protocolHistory, updateProtocol } from './service.ts';

const TAG = 'protocols';

/** Test protocols as data: studio-wide, read by all staff, edited by heads and leads; every edit is a new version. */
export const protocolRoutes = [
  defineRoute({
    method: 'get',
    path: '/api/protocols',
    summary: 'Every test protocol at its current version',
    tag: TAG,
    auth: 'session',
    requires: 'catalogue.read',
    response: ProtocolListSchema,
    errors: [403],
    async handler({ ctx }) {
      return { items: await listCurrentProtocols(ctx.db) };
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/protocols/:id',
    summary: 'One protocol at its current version (with the version id a booking stores)',
    tag: TAG,
    auth: 'session',
    requires: 'catalogue.read',
    params: ProtocolParamsSchema,
    response: ProtocolVersionSchema,
    errors: [403, 404],
    async handler({ ctx, params }) {
      return currentProtocol(ctx.db, params.id);
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/protocols/:id/versions',
    summary: 'Every published version of a protocol, newest first',
    tag: TAG,
    auth: 'session',
    requires: 'catalogue.read',
    params: ProtocolParamsSchema,
    response: ProtocolHistorySchema,
    errors: [403, 404],
    async handler({ ctx, params }) {
      return protocolHistory(ctx.db, params.id);
    },
  }),
  defineRoute({
    method: 'put',
    path: '/api/protocols/:id',
    summary: 'Publish an edit as the next version (409 when based on an older one); tests already booked keep the version they were booked with',
    tag: TAG,
    auth: 'session',
    requires: 'protocols.manage',
    params: ProtocolParamsSchema,
    body: UpdateProtocolInputSchema,
    response: ProtocolVersionSchema,
    errors: [403, 404, 409],
    async handler({ ctx, actor, params, body, req }) {
      return updateProtocol(ctx, actor, req, params.id, body);
    },
  }),
];
