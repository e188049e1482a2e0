import { sql } from 'kysely';
import type { Db } from '../../db/index.ts';
import { likePattern, SEARCH_NAME, WORD_SIMILARITY_THRESHOLD } from './list-repo.ts';

// Performer lookups for other features' queries (the archive's cast search), on the registry's own name index.

/**
 * Runs another feature's name search. The trigram cut-off is the registry's, and every connection
 * carries it (and JIT off) from the pool's start-up options, so no transaction is needed to set it.
 */
export function withNameSearch<T>(db: Db, fn: (db: Db) => Promise<T>): Promise<T> {
  return fn(db);
}

/**
 * Performers whose legal or preferred name matches one search term, each with how closely (0 to 1),
 * inside withNameSearch. Close spellings count only for terms of three letters or more without
 * digits: one trigram of "b2" or "oz" is a third of the term, so it would match every name
 * starting with that letter.
 */
export async function performersMatchingName(db: Db, term: string): Promise<{ id: string; score: number }[]> {
  const close = term.length >= 3 && !/\d/.test(term);
  const rows = await db
    .selectFrom('performers')
    .select(['performers.id', sql<number>`word_similarity(${term}, ${SEARCH_NAME})`.as('score')])
    .where(
      close
        ? sql<boolean>`((${term} <% ${SEARCH_NAME} and word_similarity(${term}, ${SEARCH_NAME}) > ${WORD_SIMILARITY_THRESHOLD}) or ${SEARCH_NAME} ilike ${likePattern(term)})`
        : sql<boolean>`${SEARCH_NAME} ilike ${likePattern(term)}`,
    )
    .execute();
  return rows.map((r) => ({ id: r.id, score: Number(r.score) }));
}

/** Ids of performers engaged on any of these productions, as a sub-select. */
export function performersEngagedOn(db: Db, productionIds: readonly string[]) {
  return db.selectFrom('engagements').select('engagements.performer_id').where('engagements.production_id', 'in', productionIds.length ? [...productionIds] : ['00000000-0000-0000-0000-000000000000']);
}
