import { openJson } from '../../api/crypto/medical.ts';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { allRoutes } from '../../api/routes.ts';
import { createTestApp, type TestApp } from '../support/app.ts';
import { pdfText } from '../support/pdf.ts';
import { samplePdf } from '../fixtures/pdfs.ts';
import { cameraJpeg } from '../fixtures/images.ts';
import { concretePath } from '../support/routes.ts';

/**
 * Sweeps every read route with every staff role that is not the designated lead, filling each
 * path and query with real ids, and looks for any health answer in any reply.
 */
let t: TestApp;
const medicalTexts: string[] = [];
const ids: Record<string, string[]> = {};

beforeAll(async () => {
  t = await createTestApp();
  const db = t.db.db;
  const juno = await db.selectFrom('performers').select('id').where('legal_name', '=', 'Juno Castellane').executeTakeFirstOrThrow();
  const consents = await db.selectFrom('consents').select('id').where('performer_id', '=', juno.id).execute();
  const production = await db.selectFrom('productions').select('id').where('name', '=', 'The Lantern Keeper').executeTakeFirstOrThrow();
  const templates = await db.selectFrom('consent_templates').select('id').execute();
  const bookings = await db.selectFrom('bookings').select('id').execute();
  // The catalogue holds nothing medical, but its reads are swept with real ids all the same: a product
  // with a safety data sheet, an ingredient, and a protocol by its slug.
  const harbour = await db.selectFrom('products').select('id').where('name', '=', 'Harbour Bond silicone adhesive').executeTakeFirstOrThrow();
  const tidewater = await db.selectFrom('products').select('id').where('name', '=', 'Tidewater citrus remover').executeTakeFirstOrThrow();
  const rosin = await db.selectFrom('ingredients').select('id').where('inci', '=', 'Colophonium').executeTakeFirstOrThrow();
  const headCookie = await t.sessionFor('head@plinth.test');
  const sds = await request(t.app).put(`/api/products/${tidewater.id}/safety-data-sheet`).set('Cookie', headCookie).field('version', '1').attach('sds', await samplePdf(), 'tidewater.pdf');
  expect(sds.status).toBe(200);
  ids.id = [juno.id, production.id, ...consents.map((c) => c.id), templates[0]!.id, bookings[0]!.id, harbour.id, tidewater.id, rosin.id, 'occluded-48h'];
  const answers = await db.selectFrom('consent_answers').select(['answer', 'medical']).where('medical', '=', true).execute();
  for (const a of answers) {
    const text = openJson(a.answer);
    if (typeof text === 'string' && text.length > 3) medicalTexts.push(text);
  }
  expect(medicalTexts).toContain('Sticking plasters make my skin itch');
  ids.performerId = [juno.id];
  ids.productionId = [production.id];
  // The archive: Juno's casts (with photos and history), places, and label codes of both.
  const casts = await db.selectFrom('casts').select(['id', 'label_code']).where('performer_id', '=', juno.id).execute();
  const places = await db.selectFrom('archive_locations').select(['id', 'label_code']).limit(3).execute();
  const photos = await db.selectFrom('cast_photos').select(['id', 'cast_id']).where('cast_id', 'in', casts.map((c) => c.id)).execute();
  ids.id.push(...casts.map((c) => c.id), ...places.map((p) => p.id));
  ids.castId = casts.map((c) => c.id);
  ids.locationId = places.map((p) => p.id);
  ids.code = [casts[0]!.label_code, places[0]!.label_code];
  photoOf = new Map(photos.map((p) => [p.cast_id, p.id]));
  // Appliance builds hold no health data; their reads are swept with real ids, one with a photo.
  const builds = await db.selectFrom('appliance_builds').select('id').execute();
  expect(builds.length).toBeGreaterThan(0);
  const photo = await request(t.app).put(`/api/appliance-builds/${builds[0]!.id}/photo`).set('Cookie', headCookie).attach('photo', await cameraJpeg(), 'piece.jpg');
  expect(photo.status).toBe(200);
  ids.id.push(...builds.map((b) => b.id));
  // The application log: the demo's skin check with redness (its observation), the lead's note on an
  // answered request, and every record's id: checks, requests, applications, incidents, kits and lots.
  const leadCookie = await t.sessionFor('lead@plinth.test');
  const waiting = await db.selectFrom('lead_requests').select(['id', 'version']).where('status', '=', 'waiting').executeTakeFirstOrThrow();
  const decided = await request(t.app).post(`/api/lead-requests/${waiting.id}/decision`).set('Cookie', leadCookie).send({ decision: 'refused', note: 'Weeping rash under the patch last season', version: waiting.version });
  expect(decided.status).toBe(200);
  medicalTexts.push('Weeping rash under the patch last season', 'Pink patch about 2 cm along the jaw line');
  const applications = await db.selectFrom('applications').select('id').execute();
  const incidents = await db.selectFrom('incidents').select('id').execute();
  const checks = await db.selectFrom('clearance_checks').select('id').execute();
  const requests = await db.selectFrom('lead_requests').select('id').execute();
  const kits = await db.selectFrom('kits').select('id').execute();
  const usedLots = await db.selectFrom('application_products').select('lot_id').distinct().execute();
  expect(applications.length * incidents.length * requests.length).toBeGreaterThan(0);
  // Filled only into their own routes, so the sweep stays the size it was for every other route.
  ownIds.set('/api/applications/', applications.map((r) => r.id));
  ownIds.set('/api/incidents/', incidents.map((r) => r.id));
  ownIds.set('/api/checks/', checks.map((r) => r.id));
  ownIds.set('/api/lead-requests/', requests.map((r) => r.id));
  ownIds.set('/api/kits/', kits.map((r) => r.id));
  ownIds.set('/api/lots/', usedLots.map((l) => l.lot_id));
});
let photoOf = new Map<string, string>();
const ownIds = new Map<string, string[]>();
afterAll(async () => {
  await t?.close();
});

const NOT_LEAD = ['head@plinth.test', 'artist@plinth.test', 'artist2@plinth.test', 'archivist@plinth.test', 'admin@plinth.test'];

describe('no staff role but the designated lead reads health answers through any route', () => {
  for (const email of NOT_LEAD) {
    it(`${email}: every GET route, every real id`, async () => {
      const cookie = await t.sessionFor(email);
      const reads = allRoutes.filter((r) => r.method === 'get' && !r.path.includes(':token'));
      expect(reads.length).toBeGreaterThan(15);
      let answered = 0;
      let archiveAnswered = 0;
      let buildsAnswered = 0;
      let sawPerformer = false;
      for (const route of reads) {
        const own = [...ownIds].find(([prefix]) => route.path.startsWith(prefix))?.[1];
        const fills = route.path.includes(':id') ? (own ?? ids.id!) : route.path.includes(':code') ? ids.code! : [''];
        for (const fill of fills) {
          const url = concretePath(route, { id: fill, code: fill, photoId: photoOf.get(fill) ?? '' });
          const res = await request(t.app)
            .get(url)
            .query({ performerId: ids.performerId![0], productionId: ids.productionId![0], casts: ids.castId!.join(','), locations: ids.locationId!.join(',') })
            .set('Cookie', cookie)
            .buffer(true)
            .parse((r, cb) => {
              const chunks: Buffer[] = [];
              r.on('data', (c: Buffer) => chunks.push(c));
              r.on('end', () => cb(null, Buffer.concat(chunks)));
            });
          (res as { text?: string }).text = (res.body as Buffer).toString('latin1');
          if (res.status === 200) answered++;
          if (res.status === 200 && (url.startsWith('/api/casts') || url.startsWith('/api/archive') || url.endsWith('/casts'))) archiveAnswered++;
          if (res.status === 200 && url.includes('/appliance-')) buildsAnswered++;
          const text = res.text ?? '';
          if (text.includes('Juno Castellane')) sawPerformer = true;
          for (const m of medicalTexts) expect(text, `${email} ${url}`).not.toContain(m);
          // An answer object marked medical (question definitions in templates may say medical: true; answers never may).
          expect(text, `${email} ${url}`).not.toMatch(/"medical":true,"answer"/);
          if (res.status === 200 && (res.headers['content-type'] ?? '').includes('application/pdf')) {
            // Only a consent with no health questions may reach them as a PDF, and it must hold no health answer.
            const consentId = /\/api\/consents\/([0-9a-f-]{36})\/pdf/.exec(url)?.[1];
            if (consentId) {
              const medical = await t.db.db.selectFrom('consent_answers').select('id').where('consent_id', '=', consentId).where('medical', '=', true).execute();
              expect(medical, `${email} got the PDF of a consent with health questions`).toEqual([]);
            } else {
              expect(url, 'the only other PDFs staff may fetch are a safety data sheet, the archive’s label sheet and a performer’s card').toMatch(/^\/api\/(products\/[0-9a-f-]{36}\/safety-data-sheet$|archive\/labels\.pdf|performers\/[0-9a-f-]{36}\/card\.pdf$)/);
            }
            const pdf = await pdfText(res.body as Buffer);
            for (const m of medicalTexts) expect(pdf.text).not.toContain(m);
          }
        }
      }
      // The sweep really reached data, not only refusals.
      expect(answered).toBeGreaterThan(5);
      if (email === 'archivist@plinth.test') expect(archiveAnswered, 'the archive routes answered the archivist').toBeGreaterThan(10);
      if (email !== 'admin@plinth.test') expect(buildsAnswered, 'the appliance build routes answered production staff').toBeGreaterThan(5);
      // …and the replies were really read (a performer's name appears somewhere).
      expect(sawPerformer).toBe(true);
    }, 120_000);
  }

  it('the same sweep finds the answers for the lead (so the check can fail)', async () => {
    const cookie = await t.sessionFor('lead@plinth.test');
    const route = allRoutes.find((r) => r.path === '/api/consents/:id' && r.method === 'get')!;
    let found = false;
    for (const id of ids.id!) {
      const res = await request(t.app).get(concretePath(route, { id })).set('Cookie', cookie);
      if (medicalTexts.some((m) => res.text.includes(m))) found = true;
    }
    expect(found).toBe(true);
  });
});
