// Every API route's entry, and the one way both the permission matrix and the fuzzer send a request.
import request from 'supertest';
import type { Express } from 'express';
import type { AnyRoute } from '../../../api/http/route.ts';
import { concretePath } from '../routes.ts';
import { rawBody } from '../medical-detectors.ts';
import { adminEntries } from './entries-admin.ts';
import { checksEntries } from './entries-checks.ts';
import { consentWorkEntries } from './entries-consent-work.ts';
import { patchTestEntries } from './entries-patch-tests.ts';
import { peopleEntries } from './entries-people.ts';
import { stockEntries } from './entries-stock.ts';
import { type Input, type RouteEntry, keyOf } from './entry.ts';

export const ROUTE_ENTRIES: Record<string, RouteEntry> = { ...adminEntries, ...checksEntries, ...peopleEntries, ...consentWorkEntries, ...patchTestEntries, ...stockEntries };

export const MISSING_ENTRY = (key: string) => `${key} has no entry: add one (its policy question and a valid request) to tests/support/matrix/entries-*.ts`;

export function entryOf(route: AnyRoute): RouteEntry | undefined {
  return ROUTE_ENTRIES[keyOf(route)];
}

export const isWrite = (route: Pick<AnyRoute, 'method'>) => route.method !== 'get';

export interface Reply {
  status: number;
  headers: Record<string, string>;
  bytes: Buffer;
  /** The reply parsed as JSON, when it is JSON. */
  json: unknown;
  res: request.Response;
}

/** Sends one request as given: JSON body, query string, or a multipart upload. */
export async function send(app: Express, route: AnyRoute, input: Input, cookie?: string, opts: { rawQuery?: string; rawBody?: string; contentType?: string } = {}): Promise<Reply> {
  let url = concretePath(route, input.params ?? {});
  if (opts.rawQuery !== undefined) url += `?${opts.rawQuery}`;
  let req = request(app)[route.method](url);
  if (cookie) req = req.set('Cookie', cookie);
  if (input.query) req = req.query(input.query);
  if (input.upload) {
    for (const [k, v] of Object.entries(input.upload.fields ?? {})) req = req.field(k, v);
    req = req.attach(input.upload.field, input.upload.bytes, input.upload.filename);
    if (input.upload.second) req = req.attach(input.upload.second.field, input.upload.second.bytes, input.upload.second.filename);
  } else if (opts.rawBody !== undefined) {
    req = req.set('Content-Type', opts.contentType ?? 'application/json').send(opts.rawBody);
  } else if (input.body !== undefined) {
    req = req.send(input.body as object);
  }
  const res = await req.buffer(true).parse(rawBody);
  const bytes = res.body as Buffer;
  let json: unknown;
  if ((res.headers['content-type'] ?? '').includes('json')) {
    try {
      json = JSON.parse(bytes.toString('utf8'));
    } catch {
      json = undefined;
    }
  }
  return { status: res.status, headers: res.headers as Record<string, string>, bytes, json, res };
}
