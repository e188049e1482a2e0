import type { Response } from 'express';

const pending = new Set<Promise<void>>();

/**
 * Runs work once the reply has gone, so how long the work takes tells the caller nothing (whether
 * an address is on file, say). Failures are logged; the reply has already said all it will.
 */
export function afterResponse(res: Response, log: (msg: string, err?: unknown) => void, label: string, work: () => Promise<void>): void {
  res.once('finish', () => {
    const p = work()
      .catch((err: unknown) => log(`${label} failed after the reply`, err))
      .finally(() => pending.delete(p));
    pending.add(p);
  });
}

/** Resolves when all work queued after replies so far has finished (for orderly shutdown and tests). */
export async function afterResponseSettled(): Promise<void> {
  while (pending.size) await Promise.all(pending);
}
