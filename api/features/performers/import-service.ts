import { randomUUID } from 'node:crypto';
import type { Request } from 'express';
import type { Actor } from '#shared/policy.ts';
import type { CsvImportResult } from '#shared/schemas/performers.ts';
import type { AppContext } from '../../context.ts';
import type { Db } from '../../db/index.ts';
import { writeAudit } from '../../http/audit.ts';
import { ApiError, isUniqueViolation } from '../../http/errors.ts';
import type { OutgoingMail } from '../../mail/mailer.ts';
import { addPerformerMemberships } from '../productions/index.ts';
import { staffAddressesAmong } from '../users/index.ts';
import { productionsWhere } from './access.ts';
import { checkImportRows, readImportFile } from './csv.ts';
import { startConfirmations } from './identity-service.ts';
import { findPerformersByEmails, findPerformerUserIds, insertEngagements, insertPerformers } from './repo.ts';
import { auditMemberships } from './service.ts';

/** Import: everything the preview shows, computed the same way for the commit. */
async function planImport(db: Db, buf: Buffer, productionId: string, actor: Actor) {
  const parsed = readImportFile(buf);
  if (parsed.fileErrors.length) return { fileErrors: parsed.fileErrors, rows: [], plans: [] };
  const emails = parsed.lines.map((l) => l.values.email?.trim().toLowerCase()).filter((e): e is string => !!e);
  const unique = [...new Set(emails)];
  const existing = await findPerformersByEmails(db, unique);
  const staff = await staffAddressesAmong(db, unique);
  // A match on someone the importer does not manage is refused, never made an engagement.
  const managed = new Set(productionsWhere(actor, 'performers.manage'));
  return { fileErrors: [] as string[], ...checkImportRows(parsed.lines, productionId, existing, (ids) => ids.some((p) => managed.has(p)), staff) };
}

function importResult(plan: Awaited<ReturnType<typeof planImport>>, committed: boolean): CsvImportResult {
  const rowsWithErrors = plan.rows.filter((r) => Object.keys(r.errors).length > 0).length;
  return {
    committed,
    rows: plan.rows,
    // Rows with at least one problem, plus problems with the file as a whole.
    errorCount: rowsWithErrors + plan.fileErrors.length,
    fileErrors: plan.fileErrors,
    created: plan.plans.filter((p) => p.action === 'create').length,
    engaged: plan.plans.filter((p) => p.action === 'engage_existing').length,
  };
}

function importRefused(result: CsvImportResult, message: string): ApiError {
  // details.fields names the one input, the file; details.result is the full report, row by row.
  const problems = [...result.fileErrors];
  for (const r of result.rows) {
    for (const [column, messages] of Object.entries(r.errors)) problems.push(...messages.map((m) => `Line ${r.line}, ${column}: ${m}`));
  }
  return new ApiError('validation_failed', message, { fields: { file: problems }, result });
}

/** commit=false: the report, nothing written. */
export async function previewImport(ctx: AppContext, actor: Actor, buf: Buffer, productionId: string): Promise<CsvImportResult> {
  return importResult(await planImport(ctx.db, buf, productionId, actor), false);
}

/**
 * commit=true: checked again and written in one transaction, or, if anything is wrong, nothing.
 * Returns the confirmation requests for the new addresses, to send after the reply.
 */
export async function commitImport(ctx: AppContext, actor: Actor, buf: Buffer, productionId: string, req: Request): Promise<{ result: CsvImportResult; mails: OutgoingMail[] }> {
  const before = importResult(await planImport(ctx.db, buf, productionId, actor), false);
  if (before.errorCount > 0) throw importRefused(before, 'Nothing was imported: fix the rows listed and try again.');
  try {
    return await ctx.db.transaction().execute(async (trx) => {
      // Checked again inside the transaction: someone may have added one of these e-mails since the preview.
      const plan = await planImport(trx, buf, productionId, actor);
      const checked = importResult(plan, false);
      if (checked.errorCount > 0) throw importRefused(checked, 'Nothing was imported: the registry changed since the check. Review the rows listed.');
      const creates = plan.plans.flatMap((p) => (p.action === 'create' ? [{ ...p, id: randomUUID() }] : []));
      const engages = plan.plans.flatMap((p) => (p.action === 'engage_existing' ? [p] : []));
      await insertPerformers(trx, creates.map((c) => ({ id: c.id, ...c.fields })));
      await insertEngagements(trx, [
        ...creates.map((c) => ({ performerId: c.id, productionId, characterName: c.characterName, startsOn: null, endsOn: null })),
        ...engages.map((e) => ({ performerId: e.performerId, productionId, characterName: e.characterName, startsOn: null, endsOn: null })),
      ]);
      for (const c of creates) {
        await writeAudit(trx, { actorUserId: actor.userId, action: 'performer.create', entityType: 'performer', entityId: c.id, productionId, req, details: { via: 'import', line: c.line } });
      }
      const linked = await findPerformerUserIds(trx, engages.map((e) => e.performerId));
      for (const e of engages) {
        await writeAudit(trx, { actorUserId: actor.userId, action: 'engagement.add', entityType: 'performer', entityId: e.performerId, productionId, req, details: { via: 'import', line: e.line } });
        const userId = linked.get(e.performerId);
        if (userId) {
          const added = await addPerformerMemberships(trx, userId, [productionId], actor.userId);
          await auditMemberships(trx, req, actor, userId, added, [], e.performerId);
        }
      }
      await writeAudit(trx, {
        actorUserId: actor.userId,
        action: 'performer.import',
        entityType: 'production',
        entityId: productionId,
        productionId,
        req,
        details: { created: creates.length, engaged: engages.length, alreadyEngaged: plan.plans.length - creates.length - engages.length },
      });
      // Each imported address is unconfirmed: it gets its confirmation request, once committed.
      const toConfirm = creates.flatMap((c) => (c.fields.email ? [{ id: c.id, name: c.fields.preferredName ?? c.fields.legalName, email: c.fields.email }] : []));
      return { result: importResult(plan, true), mails: await startConfirmations(trx, ctx, toConfirm, actor.userId, [productionId]) };
    });
  } catch (err) {
    if (isUniqueViolation(err)) {
      throw importRefused({ ...before, fileErrors: ['Another change to the registry collided with this import. Nothing was imported; check the file again.'], errorCount: before.errorCount + 1 }, 'Nothing was imported.');
    }
    throw err;
  }
}
