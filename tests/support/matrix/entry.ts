// One entry per API route: the policy question its handler asks about the record its ids resolve
// to, and a request that every rule but the permission accepts. The permission matrix predicts each
// answer from the policy; the request fuzzer starts its hostile inputs from the same request.
import request from 'supertest';
import { type Action, type Actor, type Resource, can } from '#shared/policy.ts';
import type { AnyRoute } from '../../../api/http/route.ts';
import type { Who, World } from './world.ts';

export interface Upload {
  field: string;
  bytes: Buffer;
  filename: string;
  /** Text fields sent beside the file. */
  fields?: Record<string, string>;
  /** A second file in the same form (always refused: every upload route takes one). */
  second?: { field: string; bytes: Buffer; filename: string };
}

export interface Input {
  params?: Record<string, string>;
  query?: Record<string, string | number>;
  body?: unknown;
  upload?: Upload;
}

export interface RouteEntry {
  /**
   * The question the handler asks of the policy once the record is loaded (a declared `requires`
   * is read from the route itself and asked first). Left out: any signed-in person may.
   */
  may?: Check;
  /** A request every rule but the permission accepts; the same ids for every role. */
  input?: (w: World, who: Who) => Input | Promise<Input>;
  /** The success status when it is not the route's declared one. */
  ok?: number;
  /** How the route says no when not with 403 (a seat you do not hold is a 400 naming the field). */
  refused?: number;
  /** A public route: the answer, whoever asks (the policy has no say). */
  public?: number;
  /** Why the answer is what it is, where that is not obvious. */
  note?: string;
}

export type Entries = Record<string, RouteEntry>;

export const keyOf = (r: Pick<AnyRoute, 'method' | 'path'>) => `${r.method.toUpperCase()} ${r.path}`;

/** A policy question, with the actions it asks about (so a test can tell a studio-wide question from a record's). */
export type Check = ((actor: Actor, w: World) => boolean) & { actions?: readonly Action[] };

const tagged = (fn: (actor: Actor, w: World) => boolean, actions: readonly Action[]): Check => Object.assign(fn, { actions });

/** The handler's question: this action on the record (as the policy sees it) the ids name. */
export const policy = (action: Action, resource: (w: World) => Resource = () => ({})): Check => tagged((actor, w) => can(actor, action, resource(w)), [action]);

/** Either question answered yes (a performer's own record, or staff who read it). */
export const either = (...checks: Check[]): Check => tagged((actor, w) => checks.some((c) => c(actor, w)), checks.flatMap((c) => c.actions ?? []));
export const both = (...checks: Check[]): Check => tagged((actor, w) => checks.every((c) => c(actor, w)), checks.flatMap((c) => c.actions ?? []));

/** A production's record. */
export const onProduction = (name: 'lantern' | 'saltglass') => (w: World) => ({ productionId: w.id[name] });

/** A JSON reply read as the head of department, for building an edit from what the screen shows. */
export async function readAs(w: World, who: Who, url: string): Promise<Record<string, unknown>> {
  const res = await request(w.t.app).get(url).set('Cookie', await w.cookie(who));
  if (res.status !== 200) throw new Error(`${url} answered ${res.status} to ${who}`);
  return res.body as Record<string, unknown>;
}

export const today = () => new Date().toISOString().slice(0, 10);
