import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { ERROR_STATUS, fieldErrorsFromIssues } from '#shared/errors.ts';
import { toApiError } from '../../api/http/errors.ts';

describe('error mapping', () => {
  it('uses the HTTP status codes literally', () => {
    expect(ERROR_STATUS).toMatchObject({ validation_failed: 400, unauthenticated: 401, forbidden: 403, not_found: 404, conflict: 409, payload_too_large: 413, unavailable: 503, internal: 500 });
  });
  it('turns zod issues into messages keyed by field path', () => {
    const r = z.object({ a: z.string(), b: z.object({ c: z.number() }) }).safeParse({ b: { c: 'x' } });
    expect(r.success).toBe(false);
    const fields = fieldErrorsFromIssues(r.error!.issues);
    expect(Object.keys(fields).sort()).toEqual(['a', 'b.c']);
  });
  it('names fields called "constructor" or "toString" like any other', () => {
    const r = z.object({}).catchall(z.string()).safeParse(JSON.parse('{"constructor":["a"],"__proto__":[1],"toString":2}'));
    expect(r.success).toBe(false);
    const fields = fieldErrorsFromIssues(r.error!.issues);
    expect(Object.keys(fields).sort()).toEqual(['constructor', 'toString']);
    expect(Object.getPrototypeOf(fields)).toBe(Object.prototype);
    expect(JSON.parse(JSON.stringify(fields)).constructor).toHaveLength(1);
  });
  it('maps a refused connection to 503 and a duplicate key to 409', () => {
    expect(toApiError(Object.assign(new Error('connect ECONNREFUSED 127.0.0.1:1'), { code: 'ECONNREFUSED' })).status).toBe(503);
    expect(toApiError(Object.assign(new Error('dup'), { code: '23505' })).status).toBe(409);
  });
  it('hides the text of anything unexpected', () => {
    const e = toApiError(new Error('secret internals at /srv/x.ts:12'));
    expect(e.status).toBe(500);
    expect(e.message).not.toContain('secret');
  });
});
