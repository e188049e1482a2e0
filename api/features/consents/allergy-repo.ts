import { sql } from 'kysely';
import { openJson } from '../../crypto/medical.ts';
import type { Db } from '../../db/index.ts';

/**
 * What a performer wrote in answer to the allergy questions of their signed forms (health details,
 * opened here), from consents not withdrawn, newest first: one query. A question counts when its id or
 * wording speaks of allergies; yes/no answers and blanks carry no allergen and are left out.
 */
export async function listDeclaredAllergyAnswers(db: Db, performerId: string): Promise<string[]> {
  const rows = await db
    .selectFrom('consent_answers as a')
    .innerJoin('consents as c', 'c.id', 'a.consent_id')
    .select('a.answer')
    .where('c.performer_id', '=', performerId)
    .where('c.withdrawn_at', 'is', null)
    .where('a.medical', '=', true)
    .where(sql<boolean>`(a.question_id ilike '%allerg%' or a.question_label ilike '%allerg%')`)
    .orderBy('c.signed_at', 'desc')
    .execute();
  return rows.flatMap((r) => {
    const v = openJson(r.answer);
    return typeof v === 'string' && v.trim() !== '' ? [v] : [];
  });
}
