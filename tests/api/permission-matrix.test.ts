import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { type Action, PRODUCTION_ROLES, can } from '#shared/policy.ts';
import { ErrorBodySchema } from '#shared/errors.ts';
import { allRoutes } from '../../api/routes.ts';
import type { AnyRoute } from '../../api/http/route.ts';
import { afterResponseSettled } from '../../api/http/after-response.ts';
import { createTestApp, type TestApp } from '../support/app.ts';
import { type Restorable, restorable } from '../support/matrix/restore.ts';
import { loadMedicalTexts, type MedicalText, medicalLeaks, replyText } from '../support/medical-detectors.ts';
import { MISSING_ENTRY, ROUTE_ENTRIES, entryOf, isWrite, send } from '../support/matrix/index.ts';
import { keyOf, type RouteEntry } from '../support/matrix/entry.ts';
import { WHO, type World, buildWorld } from '../support/matrix/world.ts';

/**
 * Every route × every role (and no session), on the demo's two productions: the policy predicts each
 * answer from the route's declared permission and the question its handler asks of the record its ids
 * name; the server answers. Replies carry no health detail the reader may not see, and a write the
 * policy refuses leaves every table as it was.
 */
let t: TestApp;
let w: World;
let medical: MedicalText[];
/** The database as it stands between cells: read once after each change, not before every write. */
let db: Restorable;
const CALLERS = [...WHO, 'anonymous'] as const;
type Caller = (typeof CALLERS)[number];
let cells = 0;
let refusedWrites = 0;

beforeAll(async () => {
  t = await createTestApp();
  w = await buildWorld(t);
  medical = await loadMedicalTexts(t);
  expect(medical.map((m) => m.text)).toContain('Sticking plasters make my skin itch');
  db = await restorable(t);
}, 240_000);
afterAll(async () => {
  console.info(`permission matrix: ${allRoutes.length} routes × ${CALLERS.length} callers (${WHO.join(', ')}, no session) = ${allRoutes.length * CALLERS.length} cells, plus unknown-id probes: ${cells} requests in all; ${refusedWrites} refused writes left the database unchanged`);
  await t?.close();
});

/** What the policy says the server must answer. */
function expected(route: AnyRoute, entry: RouteEntry, who: Caller): number {
  if (route.auth === 'public') return entry.public!;
  if (who === 'anonymous') return 401;
  const actor = w.actors[who];
  if (route.requires && !can(actor, route.requires)) return 403;
  if (entry.may && !entry.may(actor, w)) return entry.refused ?? 403;
  return entry.ok ?? route.status ?? 200;
}

/** One cell: the request as this caller, its status as the policy predicts, and no health detail it may not see. */
async function runCell(route: AnyRoute, entry: RouteEntry, who: Caller, want: number): Promise<void> {
  const key = keyOf(route);
  const input = (await entry.input?.(w, who === 'anonymous' ? 'head' : who)) ?? {};
  const cookie = who === 'anonymous' ? undefined : await w.cookie(who);
  const reply = await send(t.app, route, input, cookie);
  // Work some routes do after the reply (so its duration tells nothing) lands before the next look.
  await afterResponseSettled();
  cells++;
  const what = `${who} ${key} → ${reply.status} ${reply.bytes.toString('utf8').slice(0, 300)}`;
  expect(reply.status, what).toBe(want);
  // A page for the browser (the sign-in callback) answers in HTML; every other error in the one shape.
  if (reply.status >= 400 && route.produces !== 'text/html') expect(ErrorBodySchema.safeParse(reply.json).success, `${what}: the error shape`).toBe(true);
  if (reply.status < 300) {
    const actor = who === 'anonymous' ? null : w.actors[who];
    const text = await replyText(reply.res);
    const leaks = medicalLeaks(text, medical, (performerId) => actor !== null && can(actor, 'medical.read', w.performer(performerId)));
    expect(leaks, `${who} ${key}: health details in the reply`).toEqual([]);
  }
}

describe('the permission matrix', () => {
  it('has an entry for every route, and no entry for a route that is gone', () => {
    const keys = new Set(allRoutes.map(keyOf));
    for (const route of allRoutes) expect(entryOf(route), MISSING_ENTRY(keyOf(route))).toBeDefined();
    for (const key of Object.keys(ROUTE_ENTRIES)) expect(keys.has(key), `${key} has an entry but no route`).toBe(true);
    for (const route of allRoutes) if (route.auth === 'public') expect(entryOf(route)!.public, `${keyOf(route)} is public: give its answer`).toBeDefined();
  });

  for (const route of allRoutes) {
    const key = keyOf(route);
    it(`${key}: every role answered as the policy says`, async () => {
      const entry = entryOf(route);
      expect(entry, MISSING_ENTRY(key)).toBeDefined();
      // Refused cells first, checked together against one reading of the database; then the allowed ones,
      // each put back before the next.
      const planned = CALLERS.map((who) => ({ who, want: expected(route, entry!, who) }));
      const refused = planned.filter((c) => c.want >= 400);
      const allowed = planned.filter((c) => c.want < 400);
      for (const cell of refused) await runCell(route, entry!, cell.who, cell.want);
      if (isWrite(route)) {
        expect(await db.changedSinceLast(), `${key}: a write refused to ${refused.map((c) => c.who).join(', ')} changed these tables`).toEqual([]);
        refusedWrites += refused.length;
      }
      for (const cell of allowed) {
        await runCell(route, entry!, cell.who, cell.want);
        if (isWrite(route) && (await db.changedSinceLast()).length) await db.restore();
      }
      // Reads may write to the audit log (a health read is recorded): the next write compares with that.
      if (!isWrite(route)) await db.changedSinceLast();
    });
  }
});

/** Does the policy answer this action the same whatever record it is asked about? (Asked of one person in each role.) */
function resourceFree(action: Action): boolean {
  const roles = [...PRODUCTION_ROLES, 'lead'] as const;
  return roles.every((role) => {
    const actor = { userId: 'u', isAdmin: false, memberships: role === 'lead' ? [] : [{ productionId: 'p', role }], leadOf: role === 'lead' ? ['p'] : [], performerIds: [] };
    return can(actor, action, { productionId: 'p' }) === can(actor, action, { productionId: 'q' });
  });
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
const UNKNOWN_ID = '0badc0de-0000-4000-8000-00000000f00d';

describe('404 before 403: a record that does not exist', () => {
  // A studio-wide permission is asked before anything is looked up; a record's own question only once
  // it is found. So an unknown id is 403 to whoever lacks the former, and 404 to everyone else.
  for (const route of allRoutes.filter((r) => r.auth === 'session' && r.path.includes('/:'))) {
    const key = keyOf(route);
    it(`${key}: an unknown id answers as the policy says`, async () => {
      const entry = entryOf(route);
      expect(entry, MISSING_ENTRY(key)).toBeDefined();
      const studioWide = (entry!.may?.actions ?? []).length > 0 && entry!.may!.actions!.every(resourceFree);
      for (const who of WHO) {
        const input = (await entry!.input?.(w, who)) ?? {};
        const params = Object.fromEntries(Object.entries(input.params ?? {}).map(([k, v]) => [k, UUID.test(v) ? UNKNOWN_ID : v]));
        if (!Object.values(params).includes(UNKNOWN_ID)) return;
        const actor = w.actors[who];
        const want = route.requires && !can(actor, route.requires) ? 403 : studioWide && !entry!.may!(actor, w) ? (entry!.refused ?? 403) : 404;
        const reply = await send(t.app, route, { ...input, params }, await w.cookie(who));
        await afterResponseSettled();
        cells++;
        expect(reply.status, `${who} ${key} → ${reply.status} ${reply.bytes.toString('utf8').slice(0, 200)}`).toBe(want);
        expect(ErrorBodySchema.safeParse(reply.json).success).toBe(true);
      }
      expect(await db.changedSinceLast(), `${key}: a request about no record changed these tables`).toEqual([]);
    });
  }
});
