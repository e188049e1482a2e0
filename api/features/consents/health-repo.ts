import { sql } from 'kysely';
import type { ConsentKind } from '#shared/domain/consent.ts';
import { type Question, QuestionsSchema } from '#shared/domain/questionnaire.ts';
import { openJson } from '../../crypto/medical.ts';
import type { Db } from '../../db/index.ts';

export interface HealthAnswerRow {
  consentId: string;
  performerId: string;
  performerName: string;
  productionId: string | null;
  kind: ConsentKind;
  title: string;
  signedAt: Date;
  questionId: string;
  label: string;
  medical: boolean;
  question: Pick<Question, 'type' | 'medical'> | null;
  answer: boolean | string | null;
}

/**
 * Answers of consents still standing (not withdrawn), with each question as its form version
 * defined it. Either every consent of one performer, or those on a production's record (given to
 * it, or naming none, of performers engaged on it). Health answers are opened here and only here.
 */
export async function listStandingAnswers(db: Db, where: { performerId: string } | { productionId: string }): Promise<HealthAnswerRow[]> {
  let q = db
    .selectFrom('consents as c')
    .innerJoin('consent_template_versions as v', 'v.id', 'c.template_version_id')
    .innerJoin('performers as p', 'p.id', 'c.performer_id')
    .innerJoin('consent_answers as a', 'a.consent_id', 'c.id')
    .select([
      'c.id',
      'c.performer_id',
      sql<string>`coalesce(p.preferred_name, p.legal_name)`.as('performer_name'),
      'c.production_id',
      'c.kind',
      'v.title',
      'v.questions',
      'c.signed_at',
      'a.question_id',
      'a.question_label',
      'a.medical',
      'a.answer',
    ])
    .where('c.withdrawn_at', 'is', null);
  if ('performerId' in where) q = q.where('c.performer_id', '=', where.performerId);
  else {
    const productionId = where.productionId;
    q = q.where((eb) =>
      eb.or([
        eb('c.production_id', '=', productionId),
        eb.and([eb('c.production_id', 'is', null), eb.exists(eb.selectFrom('engagements as e').select('e.id').whereRef('e.performer_id', '=', 'c.performer_id').where('e.production_id', '=', productionId))]),
      ]),
    );
  }
  const rows = await q.orderBy('c.signed_at', 'desc').orderBy('c.id').orderBy('a.id').limit(5000).execute();
  return rows.map((r) => {
    const questions = QuestionsSchema.safeParse(r.questions);
    const question = questions.success ? (questions.data.find((x) => x.id === r.question_id) ?? null) : null;
    const answer = openJson(r.answer);
    return {
      consentId: r.id,
      performerId: r.performer_id,
      performerName: r.performer_name,
      productionId: r.production_id,
      kind: r.kind,
      title: r.title,
      signedAt: new Date(r.signed_at),
      questionId: r.question_id,
      label: r.question_label,
      medical: r.medical,
      question: question ? { type: question.type, medical: question.medical } : null,
      answer: typeof answer === 'boolean' || typeof answer === 'string' ? answer : null,
    };
  });
}

export async function listHealthReviews(db: Db, productionId: string): Promise<Map<string, Date>> {
  const rows = await db.selectFrom('health_reviews').select(['performer_id', 'reviewed_at']).where('production_id', '=', productionId).execute();
  return new Map(rows.map((r) => [r.performer_id, new Date(r.reviewed_at)]));
}

export async function upsertHealthReview(db: Db, v: { performerId: string; productionId: string; userId: string; at: Date }): Promise<void> {
  await db
    .insertInto('health_reviews')
    .values({ performer_id: v.performerId, production_id: v.productionId, reviewed_by: v.userId, reviewed_at: v.at })
    .onConflict((oc) => oc.columns(['performer_id', 'production_id']).doUpdateSet({ reviewed_by: v.userId, reviewed_at: sql`greatest(health_reviews.reviewed_at, excluded.reviewed_at)` }))
    .execute();
}
