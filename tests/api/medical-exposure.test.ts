import request from 'supertest';
import { openJson } from '../../api/crypto/medical.ts';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { allRoutes } from '../../api/routes.ts';
import { createTestApp, type TestApp } from '../support/app.ts';
import { pdfText } from '../support/pdf.ts';
import { samplePdf } from '../fixtures/pdfs.ts';
import { cameraJpeg } from '../fixtures/images.ts';
import { concretePath } from '../support/routes.ts';
import { loadMedicalTexts, MEDICAL_ANSWER_PATTERN, rawBody } from '../support/medical-detectors.ts';

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
  medicalTexts.push(...(await loadMedicalTexts(t)).map((m) => m.text));
  expect(medicalTexts).toContain('Sticking plasters make my skin itch');
  // A withdrawal reason may speak of health: it is guarded like the answers.
  const reasons = await db.selectFrom('consents').select('withdrawal_reason').where('withdrawal_reason', 'is not', null).execute();
  for (const r of reasons) medicalTexts.push(openJson<string>(r.withdrawal_reason));
  expect(medicalTexts).toContain('No longer comfortable with face casting');
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
  // A patch test read by the lead: a code, a note and a photo per site, and an override with its note.
  const leadCookie = await t.sessionFor('lead@plinth.test');
  const lot = await db.selectFrom('product_lots').select(['id', 'product_id']).where('code', '=', 'QA-2602').executeTakeFirstOrThrow();
  const booked = await request(t.app)
    .post('/api/patch-tests')
    .set('Cookie', headCookie)
    .send({ performerId: juno.id, productionId: production.id, protocolId: 'short-contact', startsAt: new Date(Date.now() + 3_600_000).toISOString(), location: 'Trailer 1', products: [{ productId: lot.product_id, lotId: lot.id, site: 'Behind the left ear' }] });
  expect(booked.status).toBe(201);
  const applied = await request(t.app).post(`/api/patch-tests/${booked.body.id}/apply`).set('Cookie', leadCookie).send({ appliedAt: new Date(Date.now() - 31 * 60_000).toISOString(), version: booked.body.version });
  expect(applied.status).toBe(200);
  const read = await request(t.app)
    .post(`/api/patch-tests/${booked.body.id}/readings`)
    .set('Cookie', leadCookie)
    .send({ pointId: 'm30', readAt: new Date().toISOString(), version: applied.body.version, sites: [{ testProductId: applied.body.products[0].id, code: '++', note: 'Blistering behind the ear noted at the check' }] });
  expect(read.status).toBe(201);
  const shot = await request(t.app).post(`/api/patch-tests/${booked.body.id}/readings/${read.body.products[0].readings[0].id}/photos`).set('Cookie', leadCookie).attach('photo', await cameraJpeg(), 'site.jpg');
  expect(shot.status).toBe(201);
  const override = await request(t.app).post(`/api/performers/${juno.id}/clearance-overrides`).set('Cookie', leadCookie).send({ formulationId: read.body.products[0].formulationId, state: 'do_not_use', note: 'Confirmed by the production dermatologist' });
  expect(override.status).toBe(201);
  medicalTexts.push('Blistering behind the ear noted at the check', 'Confirmed by the production dermatologist');
  ids.id.push(booked.body.id);
  photoOf.set(booked.body.id, shot.body.products[0].readings[0].photos[0].id);
  // The application log: the demo's skin check with redness (its observation), the lead's note on an
  // answered request, and every record's id: checks, requests, applications, incidents, kits and lots.
  const leadCookie2 = await t.sessionFor('lead@plinth.test');
  const waiting = await db.selectFrom('lead_requests').select(['id', 'version']).where('status', '=', 'waiting').executeTakeFirstOrThrow();
  const decided = await request(t.app).post(`/api/lead-requests/${waiting.id}/decision`).set('Cookie', leadCookie2).send({ decision: 'refused', note: 'Weeping rash under the patch last season', version: waiting.version });
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
      let staffCopies = 0;
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
            .parse(rawBody);
          (res as { text?: string }).text = (res.body as Buffer).toString('latin1');
          if (res.status === 200) answered++;
          if (res.status === 200 && (url.startsWith('/api/casts') || url.startsWith('/api/archive') || url.endsWith('/casts'))) archiveAnswered++;
          if (res.status === 200 && url.includes('/appliance-')) buildsAnswered++;
          const text = res.text ?? '';
          if (text.includes('Juno Castellane')) sawPerformer = true;
          for (const m of medicalTexts) expect(text, `${email} ${url}`).not.toContain(m);
          expect(text, `${email} ${url}`).not.toMatch(MEDICAL_ANSWER_PATTERN);
          // No reading code, outcome or note of a patch test (clearance reasons carry word codes only); the API description names the fields, never values.
          if (!url.endsWith('/openapi.json')) expect(text, `${email} ${url}`).not.toMatch(/"code":"(\?\+|\+{1,3}|-|IR|NT)"|"strongest":|"final":|"pointId":"[^"]*","readAt":/);
          if (res.status === 200 && (res.headers['content-type'] ?? '').includes('application/pdf')) {
            // Only a consent with no health questions may reach them as a PDF, and it must hold no health answer.
            const consentId = /\/api\/consents\/([0-9a-f-]{36})\/pdf/.exec(url)?.[1];
            if (/^\/api\/consents\/[0-9a-f-]{36}\/staff-pdf$/.test(url)) {
              // The staff copy of any consent: its text is checked below for every health answer.
              staffCopies++;
            } else if (consentId) {
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
      if (email !== 'admin@plinth.test') expect(staffCopies, 'staff copies reached production staff').toBeGreaterThan(0);
      // …and the replies were really read (a performer's name appears somewhere).
      expect(sawPerformer).toBe(true);
      // Every read route × every real id is a few thousand requests, and every staff copy is read back with pdf.js: allow it time (speed is measured by the bench, not here).
    }, 180_000);
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
    const test = await request(t.app).get(`/api/patch-tests/${ids.id!.at(-1)}`).set('Cookie', cookie);
    expect(test.text).toContain('Blistering behind the ear noted at the check');
    expect(test.text).toMatch(/"code":"\+\+"/);
  });

  it('the lead reads health answers and withdrawal reasons through the worklist routes (so those checks can fail too)', async () => {
    const cookie = await t.sessionFor('lead@plinth.test');
    const summary = await request(t.app).get('/api/consent-notices/health-summary').query({ performerId: ids.performerId![0] }).set('Cookie', cookie);
    expect(summary.status).toBe(200);
    expect(summary.text).toContain('Sticking plasters make my skin itch');
    const withdrawals = await request(t.app).get('/api/consent-notices/withdrawals').query({ productionId: ids.productionId![0] }).set('Cookie', cookie);
    expect(withdrawals.status).toBe(200);
    expect(withdrawals.text).toContain('No longer comfortable with face casting');
  });
});

describe('every health-data read the sweep made is logged with what it exposed', () => {
  it('the lead reads through every GET route; each medical.read entry names its fields in details.fields', async () => {
    const cookie = await t.sessionFor('lead@plinth.test');
    for (const route of allRoutes.filter((r) => r.method === 'get' && !r.path.includes(':token'))) {
      const own = [...ownIds].find(([prefix]) => route.path.startsWith(prefix))?.[1];
      const fills = route.path.includes(':id') ? (own ?? ids.id!) : route.path.includes(':code') ? ids.code! : [''];
      for (const fill of fills) {
        await request(t.app)
          .get(concretePath(route, { id: fill, code: fill, photoId: photoOf.get(fill) ?? '' }))
          .query({ performerId: ids.performerId![0], productionId: ids.productionId![0], casts: ids.castId!.join(','), locations: ids.locationId!.join(',') })
          .set('Cookie', cookie)
          .buffer(true)
          .parse(rawBody);
      }
    }
    const rows = await t.db.db.selectFrom('audit_log').select(['entity_type', 'route', 'details']).where('action', '=', 'medical.read').execute();
    // The lead's sweep reached health details of several kinds (consents, tests, photos, incidents…).
    expect(new Set(rows.map((r) => r.entity_type)).size).toBeGreaterThan(5);
    const unnamed = rows.filter((r) => !Array.isArray((r.details as { fields?: unknown }).fields)).map((r) => `${r.entity_type} ${r.route}`);
    expect([...new Set(unnamed)]).toEqual([]);
  }, 180_000);
});
