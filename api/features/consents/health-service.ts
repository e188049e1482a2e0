import type { Request } from 'express';
import { isNewSince, needsLeadLook } from '#shared/domain/health-review.ts';
import { formatAnswer, isMedicalAnswer } from '#shared/domain/questionnaire.ts';
import { can, type Actor } from '#shared/policy.ts';
import type { HealthAnswer, HealthSummary, HealthWorklist } from '#shared/schemas/consent-notices.ts';
import type { AppContext } from '../../context.ts';
import { recordEvent, writeAudit } from '../../http/audit.ts';
import { authorize } from '../../http/authorize.ts';
import { invalid, notFound } from '../../http/errors.ts';
import { findPerformerScope, isEngagedOn } from '../performers/index.ts';
import { type HealthAnswerRow, listHealthReviews, listStandingAnswers, upsertHealthReview } from './health-repo.ts';

function toAnswer(r: HealthAnswerRow): HealthAnswer {
  return {
    consentId: r.consentId,
    title: r.title,
    kind: r.kind,
    signedAt: r.signedAt.toISOString(),
    questionId: r.questionId,
    label: r.label,
    answer: formatAnswer(r.question ?? { type: typeof r.answer === 'boolean' ? 'yes_no' : 'short_text' }, r.answer ?? undefined),
  };
}

/** The lead's look at a production: health answers that need it, per performer, since the lead last confirmed each. */
export async function healthWorklist(ctx: AppContext, actor: Actor, productionId: string, req: Request): Promise<HealthWorklist> {
  // The lead's own look at the production: asked of the production alone, so no one passes "as the performer".
  authorize(actor, 'medical.read', { productionId });
  const readAt = new Date();
  const [rows, reviews] = await Promise.all([listStandingAnswers(ctx.db, { productionId }), listHealthReviews(ctx.db, productionId)]);
  const byPerformer = new Map<string, { performerId: string; performerName: string; reviewedAt: string | null; answers: HealthAnswer[] }>();
  for (const r of rows) {
    if (!r.question || !needsLeadLook(r.kind, r.question, r.answer)) continue;
    const reviewedAt = reviews.get(r.performerId) ?? null;
    if (!isNewSince(r.signedAt, reviewedAt)) continue;
    const entry = byPerformer.get(r.performerId) ?? { performerId: r.performerId, performerName: r.performerName, reviewedAt: reviewedAt?.toISOString() ?? null, answers: [] };
    entry.answers.push(toAnswer(r));
    byPerformer.set(r.performerId, entry);
  }
  const items = [...byPerformer.values()].sort((a, b) => a.performerName.localeCompare(b.performerName));
  for (const i of items) {
    await recordEvent(ctx.db, { actorUserId: actor.userId, action: 'medical.read', performerId: i.performerId, entityType: 'performer', entityId: i.performerId, productionId, req, details: { performerId: i.performerId, fields: i.answers.map((a) => a.questionId) } });
  }
  return { readAt: readAt.toISOString(), items };
}

/** The lead confirms having looked at a performer's answers up to a moment; later answers are new again. */
export async function confirmHealthReview(ctx: AppContext, actor: Actor, input: { performerId: string; productionId: string; reviewedAt: string }, req: Request): Promise<{ ok: true }> {
  // Only the lead confirms: the performer reading their own answers is not the department's review.
  authorize(actor, 'medical.read', { productionId: input.productionId });
  if (!(await isEngagedOn(ctx.db, input.performerId, input.productionId))) throw invalid({ performerId: ['This performer is not engaged on this production.'] });
  const at = new Date(input.reviewedAt);
  if (at.getTime() > Date.now() + 60_000) throw invalid({ reviewedAt: ['This moment has not come yet'] });
  await ctx.db.transaction().execute(async (trx) => {
    await upsertHealthReview(trx, { performerId: input.performerId, productionId: input.productionId, userId: actor.userId, at });
    await writeAudit(trx, { actorUserId: actor.userId, action: 'health_review.confirm', entityType: 'performer', entityId: input.performerId, performerId: input.performerId, productionId: input.productionId, req });
  });
  return { ok: true };
}

/** Every health answer of a performer from all the consents this reader may see them in; each such read is audited. */
export async function healthSummary(ctx: AppContext, actor: Actor, performerId: string, req: Request): Promise<HealthSummary> {
  const performer = await findPerformerScope(ctx.db, performerId);
  if (!performer) throw notFound('That performer');
  authorize(actor, 'medical.read', { performerId, performerProductionIds: performer.productionIds });
  const rows = (await listStandingAnswers(ctx.db, { performerId })).filter(
    (r) => isMedicalAnswer(r.kind, r.medical) && can(actor, 'medical.read', { performerId, performerProductionIds: r.productionId ? [r.productionId] : performer.productionIds }),
  );
  await recordEvent(ctx.db, { actorUserId: actor.userId, action: 'medical.read', performerId, entityType: 'performer', entityId: performerId, req, details: { performerId, fields: [...new Set(rows.map((r) => r.questionId))] } });
  return { performerId, answers: rows.map(toAnswer) };
}
