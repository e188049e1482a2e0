import sharp from 'sharp';
import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { ErrorBodySchema } from '#shared/errors.ts';
import { LABEL_CODE_SPACE, labelCodeFromNumber, labelUrl } from '#shared/domain/label-codes.ts';
import { CastDetailSchema, LabelTargetSchema, PerformerCastsSchema, PhotoSchema } from '#shared/schemas/archive.ts';
import { createTestApp, type TestApp } from '../support/app.ts';
import { pdfPageQrTexts } from '../support/pdf-qr.ts';
import { pdfText } from '../support/pdf.ts';
import { cameraJpeg, exifHasGps, pngBombHeader } from '../fixtures/images.ts';
import { archiveCounts, castByKey, placeByKey } from '../fixtures/archive.ts';
import { performerId, sessions, type Who } from '../fixtures/performers.ts';
import { snapshotData } from '../fixtures/snapshot.ts';

let t: TestApp;
let as: Record<Who, string>;
let restore: () => Promise<void>;

beforeAll(async () => {
  t = await createTestApp();
  as = await sessions(t);
  restore = await snapshotData(t);
});
beforeEach(async () => {
  await restore();
});
afterAll(async () => {
  await t?.close();
});

const api = () => request(t.app);
const upload = (who: Who, castId: string, bytes: Buffer, name = 'photo.jpg', query = '') =>
  api().post(`/api/casts/${castId}/photos${query}`).set('Cookie', as[who]).attach('photo', bytes, { filename: name, contentType: 'image/jpeg' });
const binary = (req: request.Test) =>
  req.buffer(true).parse((r, cb) => {
    const chunks: Buffer[] = [];
    r.on('data', (c: Buffer) => chunks.push(c));
    r.on('end', () => cb(null, Buffer.concat(chunks)));
  });

describe('cast photos', () => {
  it('stores an upload upright as a JPEG without EXIF or GPS, with a thumbnail, shown to staff and to the performer', async () => {
    const cast = await castByKey(t, 'juno-hand-mold');
    const res = await upload('archivist', cast.id, await cameraJpeg());
    expect(res.status).toBe(201);
    const photo = PhotoSchema.parse(res.body);
    // EXIF orientation 6: the 400×200 picture is stored turned, 200 wide and 400 tall.
    expect([photo.width, photo.height]).toEqual([200, 400]);
    const big = await binary(api().get(photo.url).set('Cookie', as.head));
    expect(big.status).toBe(200);
    const meta = await sharp(big.body as Buffer).metadata();
    expect(meta.format).toBe('jpeg');
    expect(meta.exif).toBeUndefined();
    expect(exifHasGps(meta.exif)).toBe(false);
    const thumb = await binary(api().get(photo.thumbnailUrl).set('Cookie', as.performer));
    expect((await sharp(thumb.body as Buffer).metadata()).width).toBe(256);
    const d = CastDetailSchema.parse((await api().get(`/api/casts/${cast.id}`).set('Cookie', as.archivist)).body);
    expect(d.photos.map((p) => p.id)).toContain(photo.id);
    // Someone who may not see the cast gets neither the photo nor a hint of it.
    const stranger = await t.db.db.insertInto('users').values({ email: 'stranger@plinth.test', display_name: 'A Stranger' }).returning('id').executeTakeFirstOrThrow();
    const p = await t.db.db.insertInto('productions').values({ name: 'Elsewhere', kind: 'film' }).returning('id').executeTakeFirstOrThrow();
    await t.db.db.insertInto('memberships').values({ user_id: stranger.id, production_id: p.id, role: 'head' }).execute();
    expect((await api().get(photo.url).set('Cookie', await t.sessionFor('stranger@plinth.test'))).status).toBe(403);
  });
  it('attaches a photo to a condition check of the same cast only', async () => {
    const cast = await castByKey(t, 'oz-shoulders-positive');
    const d = CastDetailSchema.parse((await api().get(`/api/casts/${cast.id}`).set('Cookie', as.archivist)).body);
    const check = d.conditionChecks[0]!;
    const res = await upload('archivist', cast.id, await cameraJpeg(), 'crack.jpg', `?conditionCheckId=${check.id}`);
    expect(res.status).toBe(201);
    const after = CastDetailSchema.parse((await api().get(`/api/casts/${cast.id}`).set('Cookie', as.archivist)).body);
    expect(after.conditionChecks[0]!.photos.map((p) => p.id)).toEqual([res.body.id]);
    const other = await castByKey(t, 'juno-hand-mold');
    expect((await upload('archivist', other.id, await cameraJpeg(), 'x.jpg', `?conditionCheckId=${check.id}`)).status).toBe(404);
  });
  it('refuses a file that is not an image, one over 10 MB and one over 100 megapixels, storing nothing', async () => {
    const cast = await castByKey(t, 'juno-hand-mold');
    const before = await archiveCounts(t);
    const text = await upload('archivist', cast.id, Buffer.from('%PDF-1.7 this is not a photo at all'), 'note.jpg');
    expect(text.status).toBe(400);
    expect(ErrorBodySchema.parse(text.body).error.details?.fields?.photo).toEqual(['This is not a photo Plinth can read (JPEG, PNG, WebP or AVIF)']);
    const tooBig = await upload('archivist', cast.id, Buffer.concat([await cameraJpeg(), Buffer.alloc(10 * 1024 * 1024, 0x20)]));
    expect(tooBig.status).toBe(413);
    expect(ErrorBodySchema.parse(tooBig.body).error.code).toBe('payload_too_large');
    const bomb = await upload('archivist', cast.id, pngBombHeader(), 'bomb.png');
    expect(bomb.status).toBe(400);
    expect(ErrorBodySchema.parse(bomb.body).error.details?.fields?.photo).toEqual(['This photo has more than 100 megapixels. Send a smaller copy.']);
    const none = await api().post(`/api/casts/${cast.id}/photos`).set('Cookie', as.archivist).field('note', 'no file');
    expect(ErrorBodySchema.parse(none.body).error.details?.fields?.photo).toEqual(['Choose a photo to upload.']);
    expect(await archiveCounts(t)).toEqual(before);
  });
  it('only the archivist adds or removes photos; removing deletes the files', async () => {
    const cast = await castByKey(t, 'juno-hand-mold');
    expect((await upload('head', cast.id, await cameraJpeg())).status).toBe(403);
    expect((await upload('performer', cast.id, await cameraJpeg())).status).toBe(403);
    const photo = PhotoSchema.parse((await upload('archivist', cast.id, await cameraJpeg())).body);
    expect((await api().delete(`/api/casts/${cast.id}/photos/${photo.id}`).set('Cookie', as.artist)).status).toBe(403);
    const before = await archiveCounts(t);
    expect((await api().delete(`/api/casts/${cast.id}/photos/${photo.id}`).set('Cookie', as.archivist)).status).toBe(204);
    const after = await archiveCounts(t);
    expect([after.cast_photos, after.files]).toEqual([before.cast_photos! - 1, before.files! - 2]);
    expect((await api().get(photo.url).set('Cookie', as.archivist)).status).toBe(404);
  });
  it('the performer sees thumbnails of their own casts, never those of another performer', async () => {
    const juno = await performerId(t, 'Juno Castellane');
    const own = PerformerCastsSchema.parse((await api().get(`/api/performers/${juno}/casts`).set('Cookie', as.performer)).body);
    const url = own.items[0]!.thumbnailUrl!;
    expect((await api().get(url).set('Cookie', as.performer)).status).toBe(200);
    const oz = await castByKey(t, 'oz-head-mold');
    const ozDetail = CastDetailSchema.parse((await api().get(`/api/casts/${oz.id}`).set('Cookie', as.archivist)).body);
    expect((await api().get(ozDetail.photos[0]!.thumbnailUrl).set('Cookie', as.performer)).status).toBe(403);
  });
});

describe('labels', () => {
  it('prints a sheet whose QR codes, read back by an independent decoder, open each cast and place', async () => {
    const casts = await Promise.all(['juno-face-mold', 'oz-head-positive', 'tamsin-foot-mold'].map((k) => castByKey(t, k)));
    const places = await Promise.all(['north-r1-s2-b1', 'south-r2'].map((k) => placeByKey(t, k)));
    const res = await binary(api().get('/api/archive/labels.pdf').query({ casts: casts.map((c) => c.id).join(','), locations: places.map((p) => p.id).join(',') }).set('Cookie', as.archivist));
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toContain('application/pdf');
    const pdf = res.body as Buffer;
    const decoded = await pdfPageQrTexts(pdf);
    const expected = [...places.map((p) => p.labelCode), ...casts.map((c) => c.labelCode)].map((code) => labelUrl(t.config.appOrigin, code));
    expect(decoded.sort()).toEqual(expected.sort());
    const text = (await pdfText(pdf)).text;
    for (const c of [...casts, ...places]) expect(text).toContain(c.labelCode);
    expect(text).toContain('GH/NORTH/R1/2/B1');
    expect(text).toContain('Juno Castellane');
    // Each address leads back to its record.
    for (const c of casts) {
      const code = decodeURIComponent(new URL(decoded.find((u) => u.endsWith(c.labelCode))!).pathname.split('/').pop()!);
      const target = LabelTargetSchema.parse((await api().get(`/api/archive/labels/${code}`).set('Cookie', as.archivist)).body);
      expect(target).toEqual({ target: 'cast', id: c.id, code: c.labelCode });
    }
  });
  it('runs onto a second page past 21 labels', async () => {
    const places = await t.db.db.selectFrom('archive_locations').select('id').execute();
    const casts = await t.db.db.selectFrom('casts').select('id').limit(5).execute();
    const total = places.length + casts.length;
    expect(total).toBeGreaterThan(21);
    const res = await binary(api().get('/api/archive/labels.pdf').query({ locations: places.map((l) => l.id).join(','), casts: casts.map((c) => c.id).join(',') }).set('Cookie', as.archivist));
    const pdf = res.body as Buffer;
    expect((await pdfText(pdf)).pages).toBe(Math.ceil(total / 21));
    expect(await pdfPageQrTexts(pdf, 1)).toHaveLength(21);
    expect(await pdfPageQrTexts(pdf, 2)).toHaveLength(total - 21);
  });
  it('refuses an empty sheet, unknown ids and ids that are not ids', async () => {
    const none = await api().get('/api/archive/labels.pdf').set('Cookie', as.archivist);
    expect(none.status).toBe(400);
    expect(ErrorBodySchema.parse(none.body).error.details?.fields?.casts).toEqual(['Choose at least one cast or place to print a label for.']);
    const unknown = await api().get('/api/archive/labels.pdf?casts=00000000-0000-4000-8000-000000000000').set('Cookie', as.archivist);
    expect(ErrorBodySchema.parse(unknown.body).error.details?.fields?.casts).toEqual(['A cast on the list was not found.']);
    const junk = await api().get('/api/archive/labels.pdf?casts=nope').set('Cookie', as.archivist);
    expect(junk.status).toBe(400);
    expect((await api().get('/api/archive/labels.pdf?locations=x').set('Cookie', as.performer)).status).toBe(403);
  });
  it('a label code resolves to its place; a misread code is a 400 and a code never printed a 404, both in words', async () => {
    const bin = await placeByKey(t, 'north-r1-s2-b1');
    expect(LabelTargetSchema.parse((await api().get(`/api/archive/labels/${bin.labelCode.toLowerCase()}`).set('Cookie', as.head)).body)).toEqual({ target: 'location', id: bin.id, code: bin.labelCode });
    const misread = await api().get(`/api/archive/labels/${bin.labelCode.slice(0, -1)}${bin.labelCode.endsWith('0') ? '1' : '0'}`).set('Cookie', as.archivist);
    expect(misread.status).toBe(400);
    expect(ErrorBodySchema.parse(misread.body).error.message).toMatch(/does not check out/);
    const used = new Set((await t.db.db.selectFrom('casts').select('label_code').execute()).map((r) => r.label_code));
    let n = 12_345;
    while (used.has(labelCodeFromNumber('cast', n % LABEL_CODE_SPACE))) n++;
    const neverPrinted = labelCodeFromNumber('cast', n);
    const missing = await api().get(`/api/archive/labels/${neverPrinted}`).set('Cookie', as.archivist);
    expect(missing.status).toBe(404);
    expect(ErrorBodySchema.parse(missing.body).error).toEqual({ code: 'not_found', message: `The label ${neverPrinted} was not found.` });
  });
});
