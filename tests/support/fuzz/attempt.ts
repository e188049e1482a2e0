// One hostile request and what must hold of its answer: never a 500; a 4xx in the error shape when the
// route's own schema refuses the input; and nothing written to the database by a refused input.
import { expect } from 'vitest';
import { ErrorBodySchema } from '#shared/errors.ts';
import type { AnyRoute } from '../../../api/http/route.ts';
import type { TestApp } from '../app.ts';
import { type Reply, send } from '../matrix/index.ts';
import type { Input, RouteEntry } from '../matrix/entry.ts';
import type { Restorable } from '../matrix/restore.ts';
import type { Who, World } from '../matrix/world.ts';
import { can } from '#shared/policy.ts';
import { afterResponseSettled } from '../../../api/http/after-response.ts';

export interface FuzzCounts {
  runs: number;
  refused: number;
  accepted: number;
}

/** The first role the policy lets past this route's checks; null for a public route (sent with no session). */
export function fuzzer(route: AnyRoute, entry: RouteEntry, w: World): Who | null {
  if (route.auth === 'public') return null;
  const order: Who[] = ['admin', 'head', 'lead', 'artist', 'archivist', 'performer', 'norole', 'otherLead'];
  const who = order.find((o) => (!route.requires || can(w.actors[o], route.requires)) && (!entry.may || entry.may(w.actors[o], w)));
  if (!who) throw new Error(`no role passes the permission check of ${route.method} ${route.path}`);
  return who;
}

export interface Attempt {
  t: TestApp;
  w: World;
  db: Restorable;
  route: AnyRoute;
  entry: RouteEntry;
  who: Who | null;
  counts: FuzzCounts;
}

/** Sends it; `valid` says whether the route's own schema accepts what the server will receive. */
export async function attempt(a: Attempt, input: Input, opts: { rawQuery?: string; rawBody?: string; contentType?: string }, valid: boolean, label: string): Promise<Reply> {
  // Inputs the schema refuses are checked together: the database must still be as it was before the first.
  if (valid) expect(await a.db.changedSinceLast(), `${label}: an input refused earlier changed the database`).toEqual([]);
  const cookie = a.who ? await a.w.cookie(a.who) : undefined;
  const reply = await send(a.t.app, a.route, input, cookie, opts);
  // Work some routes do after the reply (so its duration tells nothing) lands before the next look.
  await afterResponseSettled();
  a.counts.runs++;
  const what = `${a.route.method.toUpperCase()} ${a.route.path} (${label}) → ${reply.status} ${reply.bytes.toString('utf8').slice(0, 200)}`;
  // The sign-in route answers 503 when no identity provider is reachable, as here, once the input is good.
  if (!(valid && reply.status === a.entry.public)) expect(reply.status, what).toBeLessThan(500);
  if (!valid) expect(reply.status, what).toBeGreaterThanOrEqual(400);
  if (reply.status >= 400 && a.route.produces !== 'text/html') expect(ErrorBodySchema.safeParse(reply.json).success, `${what}: the error shape`).toBe(true);
  expect(({} as Record<string, unknown>).polluted, 'Object.prototype was polluted').toBeUndefined();
  expect(({} as Record<string, unknown>).isAdmin, 'Object.prototype was polluted').toBeUndefined();
  if (reply.status >= 400) a.counts.refused++;
  else a.counts.accepted++;
  if (valid && (await a.db.changedSinceLast()).length) await a.db.restore();
  return reply;
}
