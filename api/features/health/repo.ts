import { sql } from 'kysely';
import type { Db } from '../../db/index.ts';

/** One trivial statement: answers only if PostgreSQL does. */
export async function pingDatabase(db: Db): Promise<void> {
  await sql`select 1`.execute(db);
}
