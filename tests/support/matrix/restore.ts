// Puts the database (and the stored files) back as they were, for tests that let real writes land
// and must start the next request from the same state.
import type { TestApp } from '../app.ts';
import { snapshotData } from '../../fixtures/snapshot.ts';
import { changedTables, type Fingerprint, fingerprint } from '../db-fingerprint.ts';

export interface Restorable {
  /** The database as it stands after the last check. */
  current: Fingerprint;
  /** Tables changed since the last check; the new state becomes current. */
  changedSinceLast(): Promise<string[]>;
  /** Rows and files back to the snapshot. */
  restore(): Promise<void>;
}

export async function restorable(t: TestApp): Promise<Restorable> {
  const restoreRows = await snapshotData(t);
  // Files too, from whichever store the app uses (disk or bucket): an allowed removal deletes them, and the rows put back still name them.
  const files = new Map<string, Buffer>();
  for await (const key of t.ctx.files.list()) {
    const bytes = await t.ctx.files.get(key);
    if (bytes) files.set(key, bytes);
  }
  const state: Restorable = {
    current: await fingerprint(t.db.pool),
    async changedSinceLast() {
      const after = await fingerprint(t.db.pool);
      const changed = changedTables(state.current, after);
      state.current = after;
      return changed;
    },
    async restore() {
      await restoreRows();
      const present = new Set<string>();
      for await (const key of t.ctx.files.list()) present.add(key);
      for (const [key, bytes] of files) if (!present.has(key)) await t.ctx.files.put(key, bytes, 'application/octet-stream');
      state.current = await fingerprint(t.db.pool);
    },
  };
  return state;
}
