import { sql } from 'kysely';
import type { Db } from '../db/index.ts';

/**
 * At most once per key. The key is claimed (committed) before the work starts, so a second
 * process, a retry or a restarted runner that reaches the same key finds it taken and skips it;
 * work that fails gives the key back. A process killed mid-work leaves its key claimed: a reminder
 * is then lost rather than sent twice.
 */
export async function runOnce(db: Db, job: string, key: string, work: () => Promise<void>): Promise<boolean> {
  const claimed = await db.insertInto('job_once').values({ key, job }).onConflict((oc) => oc.column('key').doNothing()).returning('key').executeTakeFirst();
  if (!claimed) return false;
  try {
    await work();
  } catch (err) {
    await db.deleteFrom('job_once').where('key', '=', key).where('done_at', 'is', null).execute();
    throw err;
  }
  await db.updateTable('job_once').set({ done_at: sql<Date>`now()` }).where('key', '=', key).execute();
  return true;
}

/** Keys older than a year have no run left to protect. */
export async function forgetOldKeys(db: Db): Promise<void> {
  await db.deleteFrom('job_once').where('claimed_at', '<', sql<Date>`now() - interval '1 year'`).execute();
}
