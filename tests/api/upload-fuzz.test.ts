import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { VERIFY_MAX_BYTES } from '#shared/limits.ts';
import { allRoutes } from '../../api/routes.ts';
import { createTestApp, type TestApp } from '../support/app.ts';
import { type Attempt, type FuzzCounts, attempt, fuzzer } from '../support/fuzz/attempt.ts';
import { MISSING_ENTRY, entryOf } from '../support/matrix/index.ts';
import { type Input, type Upload, keyOf } from '../support/matrix/entry.ts';
import { type Restorable, restorable } from '../support/matrix/restore.ts';
import { type World, buildWorld } from '../support/matrix/world.ts';
import { pngBombHeader } from '../fixtures/images.ts';

/**
 * Hostile files to every upload route, from someone the policy lets upload there: zero bytes, the
 * wrong kind of file under the right name, files cut short, random bytes, a decompression bomb's
 * header, more than the limit, the wrong field, two files, a hostile file name, and no multipart at all. Every answer is a
 * 4xx in the error shape and nothing is written.
 */
const SEED = 20_261_203;

/**
 * Where a file cut short is not an attack but a question the route answers: the checker says whether
 * Plinth issued a PDF, so a PDF cut short is answered "no match" (and the check is recorded); a CSV cut
 * at a line is still a CSV, so the import is not cut at random.
 */
const CUT_IS_ANSWERED = new Set(['POST /api/consents/verify']);
const CUT_IS_NO_ATTACK = new Set(['POST /api/performers/import']);
const RUNS = { randomBytes: 8, truncated: 8 };

let t: TestApp;
let w: World;
let db: Restorable;
const counts: FuzzCounts = { runs: 0, refused: 0, accepted: 0 };
let routesFuzzed = 0;

beforeAll(async () => {
  t = await createTestApp();
  w = await buildWorld(t);
  db = await restorable(t);
}, 240_000);
afterAll(async () => {
  console.info(`upload fuzzing: ${routesFuzzed} upload routes, ${counts.runs} requests (${counts.refused} refused); per route 11 fixed hostile uploads + ${RUNS.randomBytes} random files + ${RUNS.truncated} cut short; seed ${SEED}`);
  await t?.close();
});

/** A PDF cut short, to the checker: answered, and no match (the check itself is recorded, then put back). */
async function answeredNoMatch(a: Attempt, input: Input, label: string): Promise<void> {
  const reply = await attempt(a, input, {}, true, label);
  expect(reply.status, label).toBe(200);
  expect((reply.json as { match: boolean }).match, label).toBe(false);
}

describe('hostile uploads', () => {
  const uploads = allRoutes.filter((r) => r.multipart);
  it('reach every upload route', () => {
    expect(uploads.length).toBeGreaterThanOrEqual(6);
  });
  for (const route of uploads) {
    const key = keyOf(route);
    it(`${key}: every hostile file gets a 4xx and changes nothing`, async () => {
      const entry = entryOf(route);
      expect(entry, MISSING_ENTRY(key)).toBeDefined();
      routesFuzzed++;
      const who = fuzzer(route, entry!, w);
      const base = (await entry!.input?.(w, who ?? 'head')) ?? {};
      expect(base.upload, `${key}: its entry gives no upload`).toBeDefined();
      // A CSV import previews with its problems listed (200); committing is where a bad file is refused.
      const query = route.path === '/api/performers/import' ? { ...base.query, commit: 'true' } : base.query;
      const good: Upload = base.upload!;
      const a: Attempt = { t, w, db, route, entry: entry!, who, counts };
      await db.changedSinceLast();
      const withFile = (u: Partial<Upload>): Input => ({ ...base, query, upload: { ...good, ...u } });
      const fixed: [string, Input][] = [
        ['zero bytes', withFile({ bytes: Buffer.alloc(0) })],
        ['text under the right name', withFile({ bytes: Buffer.from('just some words, not the file you asked for\n'.repeat(20)) })],
        ['half of a good file', withFile({ bytes: good.bytes.subarray(0, Math.floor(good.bytes.length / 2)) })],
        ['a decompression bomb header', withFile({ bytes: pngBombHeader(), filename: 'bomb.png' })],
        ['over the limit', withFile({ bytes: Buffer.concat([good.bytes, Buffer.alloc(VERIFY_MAX_BYTES + 1 - good.bytes.length, 0x41)]) })],
        ['the wrong field', withFile({ field: 'attachment' })],
        ['two files', withFile({ second: { field: good.field, bytes: good.bytes, filename: `again-${good.filename}` } })],
        ['a file beside the wrong field', withFile({ second: { field: 'extra', bytes: good.bytes, filename: good.filename } })],
        ['a hostile file name', withFile({ bytes: Buffer.alloc(0), filename: '../../../etc/passwd\u0000.jpg' })],
      ];
      for (const [label, input] of fixed) {
        if (label === 'half of a good file' && CUT_IS_NO_ATTACK.has(key)) continue;
        if (label === 'half of a good file' && CUT_IS_ANSWERED.has(key)) await answeredNoMatch(a, input, label);
        else await attempt(a, input, {}, false, label);
      }
      // No multipart at all: a JSON body, and a multipart body cut off before its end.
      await attempt(a, { ...base, query, upload: undefined }, { rawBody: '{"file":"data:image/jpeg;base64,/9j/"}' }, false, 'JSON instead of a form');
      await attempt(a, { ...base, query, upload: undefined }, { rawBody: '--xyz\r\nContent-Disposition: form-data; name="file"; filename="a.jpg"\r\n\r\n\xff\xd8', contentType: 'multipart/form-data; boundary=xyz' }, false, 'a form cut off');

      await fc.assert(
        fc.asyncProperty(fc.uint8Array({ minLength: 1, maxLength: 4_096 }), async (bytes) => {
          await attempt(a, withFile({ bytes: Buffer.from(bytes) }), {}, false, `${bytes.length} random bytes`);
        }),
        { seed: SEED, numRuns: RUNS.randomBytes, endOnFailure: true },
      );
      if (!CUT_IS_NO_ATTACK.has(key)) {
        await fc.assert(
          fc.asyncProperty(fc.double({ min: 0.05, max: 0.95, noNaN: true }), async (share) => {
            const cut = good.bytes.subarray(0, Math.max(6, Math.floor(good.bytes.length * share)));
            const label = `cut at ${cut.length} of ${good.bytes.length} bytes`;
            if (CUT_IS_ANSWERED.has(key)) await answeredNoMatch(a, withFile({ bytes: cut }), label);
            else await attempt(a, withFile({ bytes: cut }), {}, false, label);
          }),
          { seed: SEED, numRuns: RUNS.truncated, endOnFailure: true },
        );
      }
      expect(await db.changedSinceLast(), `${key}: a hostile upload changed the database`).toEqual([]);
    });
  }
});
