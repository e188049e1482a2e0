import type { Request } from 'express';
import { DEFAULT_PROTOCOLS, type Protocol } from '#shared/domain/protocols.ts';
import type { Actor } from '#shared/policy.ts';
import type { ProtocolVersion, UpdateProtocolInputSchema } from '#shared/schemas/protocols.ts';
import type { z } from 'zod';
import type { Db } from '../../db/index.ts';
import type { AppContext } from '../../context.ts';
import { writeAudit } from '../../http/audit.ts';
import { conflict, invalid, notFound } from '../../http/errors.ts';
import { findCurrentProtocolVersion, insertMissingProtocols, insertProtocolVersion, listProtocolVersions, lockProtocol } from './repo.ts';

type UpdateProtocol = z.output<typeof UpdateProtocolInputSchema>;

/**
 * The protocols every studio starts with, added on first run (and in production, where no demo data
 * loads); an existing protocol, edited or not, is left as it is.
 */
export async function ensureDefaultProtocols(db: Db): Promise<string[]> {
  return insertMissingProtocols(db, DEFAULT_PROTOCOLS);
}

export async function currentProtocol(db: Db, id: string): Promise<ProtocolVersion> {
  const p = await findCurrentProtocolVersion(db, id);
  if (!p) throw notFound('That protocol');
  return p;
}

export async function protocolHistory(db: Db, id: string): Promise<{ items: ProtocolVersion[] }> {
  const items = await listProtocolVersions(db, id);
  if (items.length === 0) throw notFound('That protocol');
  return { items };
}

/**
 * Publishes an edit as the next version. Tests booked earlier keep the version they name, so changing
 * a reading window never moves a test already under way. The rules of `protocolProblems` were applied
 * by the schema; the id in the body must be the protocol's own.
 */
export async function updateProtocol(ctx: AppContext, actor: Actor, req: Request, id: string, body: UpdateProtocol): Promise<ProtocolVersion> {
  if (body.protocol.id !== id) throw invalid({ 'protocol.id': ['A protocol keeps its id'] });
  await ctx.db.transaction().execute(async (trx) => {
    const row = await lockProtocol(trx, id);
    if (!row) throw notFound('That protocol');
    if (row.currentVersion !== body.version) {
      throw conflict(`Someone published version ${row.currentVersion} of this protocol since you opened it. Reload to see it.`, { currentVersion: row.currentVersion });
    }
    const next = row.currentVersion + 1;
    const versionId = await insertProtocolVersion(trx, id, next, body.protocol as Protocol, actor.userId);
    await writeAudit(trx, { actorUserId: actor.userId, action: 'protocol.update', entityType: 'protocol', entityId: null, req, details: { protocolId: id, version: next, versionId } });
  });
  return currentProtocol(ctx.db, id);
}
