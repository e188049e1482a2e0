import { beforeEach, describe, expect, it } from 'vitest';
import sharp from 'sharp';
import { ErrorBodySchema } from '#shared/errors.ts';
import { PerformerDetailSchema, PerformerPageSchema } from '#shared/schemas/performers.ts';
import { bandColour, cameraJpeg, exifHasGps, largePng, pngBombHeader, smallAvif, smallGif, smallWebp } from '../../fixtures/images.ts';
import { performerId, type Who } from '../../fixtures/performers.ts';
import { usePerformerApp, t, as, api, list, detail, count } from './setup.ts';

usePerformerApp();

describe('portraits', () => {
  beforeEach(async () => {
    // The database is reset for each test; the stored bytes of earlier tests are cleared here.
    for (const dir of ['portrait', 'portrait_thumb']) {
      const keys: string[] = [];
      for await (const key of t.ctx.files.list(dir)) keys.push(key);
      await t.ctx.files.remove(keys);
    }
  });
  const put = (who: Who, id: string, bytes: Buffer, filename = 'photo.jpg', contentType = 'image/jpeg') =>
    api().put(`/api/performers/${id}/portrait`).set('Cookie', as[who]).attach('portrait', bytes, { filename, contentType });
  const storedFiles = async () => {
    const out: string[] = [];
    for (const dir of ['portrait', 'portrait_thumb']) for await (const key of t.ctx.files.list(dir)) out.push(key);
    return out.sort();
  };

  it('stores an upright JPEG without EXIF or GPS, and a 256×256 thumbnail', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const photo = await cameraJpeg();
    // The fixture really carries what must be dropped.
    const original = await sharp(photo).metadata();
    expect(original).toMatchObject({ width: 400, height: 200, orientation: 6 });
    expect(exifHasGps(original.exif)).toBe(true);
    expect(original.exif!.includes(Buffer.from('PlinthTestCam'))).toBe(true);

    const res = await put('head', oz, photo);
    expect(res.status).toBe(200);
    const d = PerformerDetailSchema.parse(res.body);
    const files = await t.db.db.selectFrom('files').select(['id', 'purpose', 'width', 'height', 'content_type']).where('purpose', 'in', ['portrait', 'portrait_thumb']).orderBy('purpose').execute();
    expect(files.map((f) => [f.purpose, f.width, f.height, f.content_type])).toEqual([
      ['portrait', 200, 400, 'image/jpeg'],
      ['portrait_thumb', 256, 256, 'image/jpeg'],
    ]);
    expect(d.portraitUrl).toBe(`/api/performers/${oz}/portrait?v=${files[0]!.id}`);
    expect(d.thumbnailUrl).toBe(`/api/performers/${oz}/portrait/thumbnail?v=${files[1]!.id}`);

    const big = await api().get(d.portraitUrl!).set('Cookie', as.artist).buffer(true);
    expect(big.status).toBe(200);
    expect(big.headers['content-type']).toBe('image/jpeg');
    const meta = await sharp(big.body).metadata();
    expect(meta).toMatchObject({ format: 'jpeg', width: 200, height: 400 });
    expect(meta.exif).toBeUndefined();
    expect(meta.orientation).toBeUndefined();
    expect(meta.xmp).toBeUndefined();
    expect(big.body.includes(Buffer.from('PlinthTestCam'))).toBe(false);
    // Orientation 6 means "turn 90° clockwise": the red left half is now on top.
    const top = await bandColour(big.body, 'top');
    const bottom = await bandColour(big.body, 'bottom');
    expect(top.r).toBeGreaterThan(150);
    expect(top.b).toBeLessThan(80);
    expect(bottom.b).toBeGreaterThan(150);
    expect(bottom.r).toBeLessThan(80);

    const thumb = await api().get(d.thumbnailUrl!).set('Cookie', as.archivist).buffer(true);
    expect(thumb.status).toBe(200);
    const tm = await sharp(thumb.body).metadata();
    expect([tm.width, tm.height, tm.exif]).toEqual([256, 256, undefined]);
    // The list shows the thumbnail too.
    const row = PerformerPageSchema.parse((await list('artist', '?q=Parfitt')).body).items[0]!;
    expect(row.thumbnailUrl).toBe(d.thumbnailUrl);
  });

  it('accepts PNG and WebP, fits large photos inside 1600 px, and replaces the old files', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const first = await put('lead', oz, await largePng(), 'big.png', 'image/png');
    expect(first.status).toBe(200);
    const meta = await sharp((await api().get(first.body.portraitUrl).set('Cookie', as.head).buffer(true)).body).metadata();
    expect([meta.format, meta.width, meta.height]).toEqual(['jpeg', 1600, 1067]);
    const firstFiles = await storedFiles();
    expect(firstFiles).toHaveLength(2);
    const second = await put('head', oz, await smallWebp(), 'x.webp', 'image/webp');
    expect(second.status).toBe(200);
    expect(second.body.portraitUrl).not.toBe(first.body.portraitUrl);
    // The replaced photo is gone, rows and bytes.
    expect(await t.db.db.selectFrom('files').select('id').where('purpose', 'in', ['portrait', 'portrait_thumb']).execute()).toHaveLength(2);
    const now = await storedFiles();
    expect(now).toHaveLength(2);
    expect(now.some((f) => firstFiles.includes(f))).toBe(false);
    expect((await api().get(first.body.portraitUrl).set('Cookie', as.head)).status).toBe(200);
  });

  it('refuses a text file named .jpg, and a GIF, with the field message', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const filesBefore = await count('files');
    for (const [bytes, name] of [
      [Buffer.from('this is just some text pretending to be a photo\n'), 'holiday.jpg'],
      [await smallGif(), 'anim.gif'],
    ] as const) {
      const res = await put('head', oz, bytes, name);
      expect(res.status).toBe(400);
      expect(res.body.error.details.fields.portrait).toEqual(['This is not a photo Plinth can read (JPEG, PNG, WebP or AVIF)']);
    }
    expect(await count('files')).toBe(filesBefore);
    expect(await storedFiles()).toEqual([]);
    expect(PerformerDetailSchema.parse((await detail('head', oz)).body).portraitUrl).toBeNull();
  });

  it('accepts AVIF (HEIF) and refuses a header claiming more than 100 megapixels before decoding it', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const avif = await put('head', oz, await smallAvif(), 'x.avif', 'image/avif');
    expect(avif.status).toBe(200);
    const meta = await sharp((await api().get(avif.body.portraitUrl).set('Cookie', as.head).buffer(true)).body).metadata();
    expect([meta.format, meta.width, meta.height]).toEqual(['jpeg', 64, 48]);
    const bomb = await put('head', oz, pngBombHeader(), 'bomb.png', 'image/png');
    expect(bomb.status).toBe(400);
    expect(bomb.body.error.details.fields.portrait).toEqual(['This photo has more than 100 megapixels. Send a smaller copy.']);
    expect(avif.body.portraitUrl).toBe(PerformerDetailSchema.parse((await detail('head', oz)).body).portraitUrl);
  });

  it('answers a file over 10 MB with 413 and stores nothing', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const filesBefore = await count('files');
    const tooBig = Buffer.concat([await cameraJpeg(), Buffer.alloc(10 * 1024 * 1024, 0x20)]);
    const res = await put('head', oz, tooBig);
    expect(res.status).toBe(413);
    expect(ErrorBodySchema.parse(res.body).error.code).toBe('payload_too_large');
    expect(await count('files')).toBe(filesBefore);
    expect(await storedFiles()).toEqual([]);
  });

  it('asks for the photo when none is sent, and names the field when it is sent under another name', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const none = await api().put(`/api/performers/${oz}/portrait`).set('Cookie', as.head).field('note', 'no file');
    expect(none.status).toBe(400);
    expect(none.body.error.details.fields.portrait).toEqual(['Choose a photo to upload.']);
    const wrong = await api().put(`/api/performers/${oz}/portrait`).set('Cookie', as.head).attach('photo', await cameraJpeg(), 'a.jpg');
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.details.fields.portrait).toBeDefined();
  });

  it('removes the portrait and its files', async () => {
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const set = await put('head', oz, await cameraJpeg());
    expect(set.status).toBe(200);
    expect((await api().delete(`/api/performers/${oz}/portrait`).set('Cookie', as.artist)).status).toBe(403);
    const del = await api().delete(`/api/performers/${oz}/portrait`).set('Cookie', as.head);
    expect(del.status).toBe(204);
    expect(PerformerDetailSchema.parse((await detail('head', oz)).body)).toMatchObject({ portraitUrl: null, thumbnailUrl: null });
    expect((await api().get(`/api/performers/${oz}/portrait`).set('Cookie', as.head)).status).toBe(404);
    expect((await api().get(`/api/performers/${oz}/portrait/thumbnail`).set('Cookie', as.head)).status).toBe(404);
    expect(await t.db.db.selectFrom('files').select('id').where('purpose', 'in', ['portrait', 'portrait_thumb']).execute()).toEqual([]);
    expect(await storedFiles()).toEqual([]);
  });
});

