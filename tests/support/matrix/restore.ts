// Puts the database (and the stored files) back as they were, for tests that let real writes land
// and must start the next request from the same state.
import { cp, mkdtemp } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
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
  // Files too: an allowed removal deletes them, and the rows put back still name them.
  const files = await mkdtemp(path.join(os.tmpdir(), 'plinth-files-'));
  await cp(t.config.storageDir, files, { recursive: true });
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
      await cp(files, t.config.storageDir, { recursive: true, force: false });
      state.current = await fingerprint(t.db.pool);
    },
  };
  return state;
}
