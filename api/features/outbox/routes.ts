import { promises as fs } from 'node:fs';
import path from 'node:path';
import { simpleParser, type AddressObject } from 'mailparser';
import { MailFailureListSchema, MailRetryResultSchema, OutboxMessageDetailSchema, OutboxPageSchema, OutboxParamsSchema, OutboxQuerySchema, type OutboxMessage } from '#shared/schemas/admin.ts';
import { IdParamsSchema } from '#shared/schemas/common.ts';
import { notFound } from '../../http/errors.ts';
import { listOpenMailFailures } from '../../mail/failures.ts';
import { retryMailFailure } from './service.ts';
import { type AnyRoute, defineRoute } from '../../http/route.ts';

function addresses(a: AddressObject | AddressObject[] | undefined): string[] {
  if (!a) return [];
  return (Array.isArray(a) ? a : [a]).flatMap((o) => o.value.map((v) => (v.name ? `${v.name} <${v.address}>` : (v.address ?? ''))));
}

async function listMailFiles(dir: string): Promise<string[]> {
  try {
    return (await fs.readdir(dir)).filter((f) => f.endsWith('.eml')).sort().toReversed();
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') return [];
    throw err;
  }
}

export async function readMessage(dir: string, id: string): Promise<OutboxMessage & { text: string }> {
  const parsed = await simpleParser(await fs.readFile(path.join(dir, id)));
  return {
    // One-time links (signing, withdrawal, address confirmation, sign-in invitation) are the performer's alone;
    // the Outbox shows that a link went out, never the link.
    text: (parsed.text ?? '').replace(/\/(sign|withdraw|confirm-email|join)\/[A-Za-z0-9_-]{20,}/g, '/$1/[link withheld]'),
    id,
    subject: parsed.subject ?? '(no subject)',
    from: addresses(parsed.from)[0] ?? '',
    to: [...addresses(parsed.to), ...addresses(parsed.cc)],
    date: parsed.date ? parsed.date.toISOString() : null,
    attachments: parsed.attachments.map((a) => ({ filename: a.filename ?? '(unnamed)', contentType: a.contentType, size: a.size })),
  };
}

export const outboxRoutes: AnyRoute[] = [
  defineRoute({
    method: 'get',
    path: '/api/outbox',
    summary: 'Messages caught by the local mail catcher, newest first',
    tag: 'admin',
    auth: 'session',
    requires: 'outbox.read',
    query: OutboxQuerySchema,
    response: OutboxPageSchema,
    errors: [403],
    async handler({ ctx, query }) {
      const files = await listMailFiles(ctx.config.mailDir);
      const pageFiles = files.slice((query.page - 1) * query.pageSize, query.page * query.pageSize);
      const items = await Promise.all(pageFiles.map(async (f) => {
        const { text: _text, ...meta } = await readMessage(ctx.config.mailDir, f);
        return meta;
      }));
      return { items, total: files.length, page: query.page, pageSize: query.pageSize };
    },
  }),
  // Before /api/outbox/:id, so "failures" is never taken for a message id.
  defineRoute({
    method: 'get',
    path: '/api/outbox/failures',
    summary: 'Messages Plinth could not send (recipients, subject, the error), still waiting to be sent',
    tag: 'admin',
    auth: 'session',
    requires: 'outbox.read',
    response: MailFailureListSchema,
    errors: [403],
    handler: async ({ ctx }) => ({ items: await listOpenMailFailures(ctx.db) }),
  }),
  defineRoute({
    method: 'post',
    path: '/api/outbox/failures/:id/retry',
    summary: 'Send a message that could not be sent, again, exactly as it was',
    tag: 'admin',
    auth: 'session',
    requires: 'outbox.read',
    params: IdParamsSchema,
    response: MailRetryResultSchema,
    errors: [403, 404],
    handler: ({ ctx, params }) => retryMailFailure(ctx, params.id),
  }),
  defineRoute({
    method: 'get',
    path: '/api/outbox/:id',
    summary: 'One caught message: headers, text and attachment names. Attachment contents are never served (a signed consent PDF carries health answers).',
    tag: 'admin',
    auth: 'session',
    requires: 'outbox.read',
    params: OutboxParamsSchema,
    response: OutboxMessageDetailSchema,
    errors: [403, 404],
    async handler({ ctx, params }) {
      const files = await listMailFiles(ctx.config.mailDir);
      if (!files.includes(params.id)) throw notFound('That message');
      return readMessage(ctx.config.mailDir, params.id);
    },
  }),
];
