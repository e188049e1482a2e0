import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { ErrorBodySchema } from '#shared/errors.ts';
import { ProductDetailSchema, SDS_MAX_BYTES } from '#shared/schemas/catalogue.ts';
import { createTestApp, type TestApp } from '../support/app.ts';
import { pdfText } from '../support/pdf.ts';
import { samplePdf } from '../fixtures/pdfs.ts';
import { smallWebp } from '../fixtures/images.ts';
import { sessions, type Who } from '../fixtures/performers.ts';
import { snapshotData } from '../fixtures/snapshot.ts';

let t: TestApp;
let as: Record<Who, string>;
let restore: () => Promise<void>;
let tidewater: string;

beforeAll(async () => {
  t = await createTestApp();
  as = await sessions(t);
  restore = await snapshotData(t);
});
beforeEach(async () => {
  await restore();
  tidewater = (await t.db.db.selectFrom('products').select('id').where('name', '=', 'Tidewater citrus remover').executeTakeFirstOrThrow()).id;
});
afterAll(async () => {
  await t?.close();
});

const api = () => request(t.app);
const upload = (who: Who, bytes: Buffer, version: number | null = 1, filename = 'tidewater-sds.pdf', contentType = 'application/pdf') => {
  const req = api().put(`/api/products/${tidewater}/safety-data-sheet`).set('Cookie', as[who]);
  if (version !== null) req.field('version', String(version));
  return req.attach('sds', bytes, { filename, contentType });
};
const sheetFiles = async () => (await t.db.db.selectFrom('files').select('id').where('purpose', '=', 'safety_sheet').execute()).length;

describe('PUT /api/products/:id/safety-data-sheet', () => {
  it('stores the PDF for the head, moves the product on a version, and anyone on the staff downloads it', async () => {
    const pdf = await samplePdf();
    const res = await upload('head', pdf);
    expect(res.status).toBe(200);
    const d = ProductDetailSchema.parse(res.body);
    expect(d.safetySheet).toMatchObject({ fileName: 'tidewater-sds.pdf', byteSize: pdf.length, uploadedBy: 'Marta Oyelaran', url: `/api/products/${tidewater}/safety-data-sheet` });
    expect(d.version).toBe(2);
    expect(d.solventCaution).toBe(true);
    for (const who of ['artist', 'archivist', 'lead', 'admin'] as const) {
      const got = await api().get(d.safetySheet!.url).set('Cookie', as[who]).buffer(true).parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      });
      expect(got.status, who).toBe(200);
      expect(got.headers['content-type']).toBe('application/pdf');
      expect(got.headers['content-disposition']).toMatch(/^attachment; filename="?tidewater-sds\.pdf"?$/);
      // Read back by an independent PDF library (pdf.js): the same document came out.
      expect((await pdfText(got.body as Buffer)).text).toContain('Safety data sheet: Tidewater citrus remover');
    }
    expect(await t.db.db.selectFrom('audit_log').select('action').where('action', '=', 'product.sds_upload').execute()).toHaveLength(1);
  });

  it('refuses the download to a performer and the upload to an artist, before reading the file', async () => {
    await upload('head', await samplePdf());
    expect((await api().get(`/api/products/${tidewater}/safety-data-sheet`).set('Cookie', as.performer)).status).toBe(403);
    expect((await api().get(`/api/products/${tidewater}/safety-data-sheet`).set('Cookie', as.norole)).status).toBe(403);
    const artist = await upload('artist', await samplePdf());
    expect(artist.status).toBe(403);
    expect(await sheetFiles()).toBe(1);
  });

  it('refuses a file that is not a PDF, whatever its name and declared type', async () => {
    for (const bytes of [await smallWebp(), Buffer.from('%PDF-1.7 but then nothing a reader could open'), Buffer.from('<html>%PDF-1.4 %%EOF</html>')]) {
      const res = await upload('head', bytes, 1, 'sheet.pdf', 'application/pdf');
      expect(res.status).toBe(400);
      expect(ErrorBodySchema.parse(res.body).error.details?.fields?.sds).toEqual(['This is not a PDF. Upload the safety data sheet as the PDF the maker supplies.']);
    }
    expect(await sheetFiles()).toBe(0);
  });

  it('refuses a PDF over 10 MB with 413, saving nothing', async () => {
    const big = Buffer.concat([Buffer.from('%PDF-1.4\n'), Buffer.alloc(SDS_MAX_BYTES, 0x20), Buffer.from('\n%%EOF\n')]);
    const res = await upload('head', big);
    expect(res.status).toBe(413);
    expect(ErrorBodySchema.parse(res.body).error.code).toBe('payload_too_large');
    expect(await sheetFiles()).toBe(0);
  });

  it('refuses an upload based on an old version (409) or without one (400), leaving no file behind', async () => {
    await api().put(`/api/products/${tidewater}`).set('Cookie', as.head).send({ name: 'Tidewater citrus remover', category: 'remover', exposure: 'rinse_off', version: 1 });
    const stale = await upload('head', await samplePdf(), 1);
    expect(stale.status).toBe(409);
    const missing = await upload('head', await samplePdf(), null);
    expect(missing.status).toBe(400);
    expect(Object.keys(ErrorBodySchema.parse(missing.body).error.details?.fields ?? {})).toEqual(['version']);
    expect(await sheetFiles()).toBe(0);
  });

  it('keeps a tidy display name and never the path the browser sent', async () => {
    const res = await upload('lead', await samplePdf(), 1, '..\\..\\etc\\"sheet"');
    expect(ProductDetailSchema.parse(res.body).safetySheet!.fileName).toBe('sheet.pdf');
  });

  it('answers 404 for a product without a sheet and for an unknown product', async () => {
    expect((await api().get(`/api/products/${tidewater}/safety-data-sheet`).set('Cookie', as.artist)).status).toBe(404);
    const res = await api().put('/api/products/00000000-0000-4000-8000-000000000000/safety-data-sheet').set('Cookie', as.head).field('version', '1').attach('sds', await samplePdf(), 'a.pdf');
    expect(res.status).toBe(404);
  });
});
