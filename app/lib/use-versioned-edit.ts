import { useState } from 'react';
import { isApiError } from './api-client.ts';

export interface VersionedEdit {
  /** The 409 of a save made on a stale version, until the person reloads. */
  conflict: unknown;
  reloading: boolean;
  reloadError: unknown;
  /**
   * Runs a save. A 409 (someone saved first) is kept as the conflict and the save answers
   * `undefined`; any other error is thrown on to the caller's own handling.
   */
  save<R>(run: () => Promise<R>): Promise<R | undefined>;
  /** Fetches the saved version, hands it to the form, and clears the conflict. */
  reload(): Promise<void>;
  clear(): void;
}

/** The one flow for editing a versioned record: save, and on 409 offer to reload the saved version. */
export function useVersionedEdit<T>(opts: { refetch: () => Promise<T>; onFresh: (fresh: T) => void }): VersionedEdit {
  const [conflict, setConflict] = useState<unknown>(null);
  const [reloading, setReloading] = useState(false);
  const [reloadError, setReloadError] = useState<unknown>(null);
  return {
    conflict,
    reloading,
    reloadError,
    async save(run) {
      setConflict(null);
      try {
        return await run();
      } catch (err) {
        if (isApiError(err, 409)) {
          setConflict(err);
          return undefined;
        }
        throw err;
      }
    },
    async reload() {
      setReloading(true);
      setReloadError(null);
      try {
        opts.onFresh(await opts.refetch());
        setConflict(null);
      } catch (err) {
        setReloadError(err);
      } finally {
        setReloading(false);
      }
    },
    clear() {
      setConflict(null);
    },
  };
}
