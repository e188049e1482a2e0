import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cameraJpeg } from '../../fixtures/images.ts';
import { counts, DAY, HOUR, patchTestWorld, type PatchTestWorld } from './setup.ts';

/** Book → apply → remove → read → clearance on real PostgreSQL, with every refusal on the way. */
let w: PatchTestWorld;
let testId: string;
let version: number;
let quayside: { id: string; productId: string };
let pier: { id: string; productId: string };
let flotsam: { id: string; productId: string };
const appliedAt = new Date(Date.now() - 4 * DAY);
const removedAt = new Date(appliedAt.getTime() + 48 * HOUR);

beforeAll(async () => {
  w = await patchTestWorld();
  quayside = await w.lot('QA-2602');
  pier = await w.lot('PR-2602');
  flotsam = await w.lot('FA-2602');
});
afterAll(async () => {
  await w?.t.close();
});

const site = (n: number) => `Left inner forearm ${n}`;

describe('booking (head)', () => {
  it('books a test with products, lots and sites; the performer has a patch-testing consent, so it needs none', async () => {
    const res = await w.book({
      products: [
        { productId: quayside.productId, lotId: quayside.id, site: site(1) },
        { productId: pier.productId, lotId: pier.id, site: site(2) },
        { productId: flotsam.productId, lotId: flotsam.id, site: site(3) },
      ],
    });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ status: 'booked', consentMissing: false, productCount: 3, protocolName: expect.any(String), testKind: 'occluded_patch', medical: false });
    expect(res.body.products.map((p: { lotCode: string; site: string }) => [p.lotCode, p.site])).toEqual([
      ['QA-2602', site(1)],
      ['PR-2602', site(2)],
      ['FA-2602', site(3)],
    ]);
    // D2, D4 and the optional D7 (product brief §3's occluded protocol), estimated until removal is recorded.
    expect(res.body.schedule.map((s: { pointId: string }) => s.pointId)).toEqual(['d2', 'd4', 'd7']);
    testId = res.body.id;
    version = res.body.version;
    const booking = await w.t.db.db.selectFrom('bookings').select(['purpose', 'status']).where('id', '=', testId).executeTakeFirstOrThrow();
    expect(booking).toEqual({ purpose: 'patch_test', status: 'booked' });
  });

  it('refuses an expired lot, a lot of another product, an unknown site and a site used twice, saving nothing', async () => {
    const before = await counts(w.t);
    const harbourOld = await w.lot('HB-2411');
    const expired = await w.book({ products: [{ productId: harbourOld.productId, lotId: harbourOld.id, site: site(4) }] });
    expect(expired.status).toBe(400);
    expect(expired.body.error.details.fields['products.0.lotId']).toEqual(['Lot HB-2411 expired on 2026-10-31 and cannot be used for a test.']);
    const other = await w.book({ products: [{ productId: pier.productId, lotId: quayside.id, site: site(4) }] });
    expect(other.body.error.details.fields['products.0.lotId']).toEqual(['Lot QA-2602 belongs to another product.']);
    const unknownSite = await w.book({ products: [{ productId: pier.productId, lotId: pier.id, site: 'Left knee' }] });
    expect(unknownSite.status).toBe(400);
    expect(unknownSite.body.error.details.fields['products.0.site']).toBeDefined();
    const twice = await w.book({ products: [{ productId: pier.productId, lotId: pier.id, site: site(5) }, { productId: quayside.productId, lotId: quayside.id, site: site(5) }] });
    expect(twice.body.error.details.fields['products.1.site']).toEqual(['Each product needs its own site']);
    const none = await w.book({ products: [] });
    expect(none.body.error.details.fields.products).toEqual(['Add at least one product']);
    const badProtocol = await w.book({ protocolId: 'no-such-protocol', products: [{ productId: pier.productId, lotId: pier.id, site: site(5) }] });
    expect(badProtocol.body.error.details.fields.protocolId).toEqual(['That protocol is not in the list.']);
    expect(await counts(w.t)).toEqual(before);
  });

  it('refuses an overlapping test on the same sites for the performer, and takes one on other sites', async () => {
    const before = await counts(w.t);
    const at = new Date(Date.now() + 2 * HOUR).toISOString();
    const clash = await w.book({ startsAt: at, products: [{ productId: pier.productId, lotId: pier.id, site: site(1) }] });
    expect(clash.status).toBe(400);
    expect(clash.body.error.details.fields.products[0]).toContain('Left inner forearm 1 is already in use by another test');
    expect(await counts(w.t)).toEqual(before);
    const elsewhere = await w.book({ startsAt: at, products: [{ productId: pier.productId, lotId: pier.id, site: 'Behind the right ear' }] });
    expect(elsewhere.status).toBe(201);
    // Cancelled, it frees its site and its session.
    const cancelled = await w.api().post(`/api/patch-tests/${elsewhere.body.id}/cancel`).set('Cookie', w.as.head).send({ version: elsewhere.body.version });
    expect(cancelled.status).toBe(200);
    expect(cancelled.body.status).toBe('cancelled');
    const reading = await w.api().post(`/api/patch-tests/${elsewhere.body.id}/readings`).set('Cookie', w.as.lead).send({ pointId: 'd2', readAt: new Date().toISOString(), version: cancelled.body.version, sites: [{ testProductId: cancelled.body.products[0].id, code: '-' }] });
    expect(reading.status).toBe(409);
    expect(reading.body.error.message).toBe('This test was cancelled; no more readings can be recorded.');
  });

  it('is cancelled only from its own page: the sessions list refuses it, and cancelling the test cancels its session', async () => {
    const booked = await w.book({ startsAt: new Date(Date.now() + 30 * DAY).toISOString(), products: [{ productId: pier.productId, lotId: pier.id, site: 'Upper back, left 5' }] });
    expect(booked.status).toBe(201);
    const viaSessions = await w.api().post(`/api/bookings/${booked.body.id}/cancel`).set('Cookie', w.as.head).send({});
    expect(viaSessions.status).toBe(409);
    expect((await w.api().get(`/api/patch-tests/${booked.body.id}`).set('Cookie', w.as.lead)).body.status).toBe('booked');
    const cancelled = await w.api().post(`/api/patch-tests/${booked.body.id}/cancel`).set('Cookie', w.as.head).send({ version: booked.body.version });
    expect(cancelled.status).toBe(200);
    const session = await w.t.db.db.selectFrom('bookings').select('status').where('id', '=', booked.body.id).executeTakeFirstOrThrow();
    expect(session.status).toBe('cancelled');
    const test = await w.api().get(`/api/patch-tests/${booked.body.id}`).set('Cookie', w.as.lead);
    expect(test.body.status).toBe('cancelled');
    const apply = await w.api().post(`/api/patch-tests/${booked.body.id}/apply`).set('Cookie', w.as.lead).send({ appliedAt: new Date().toISOString(), version: test.body.version });
    expect(apply.status).toBe(409);
  });

  it('lets only the head and the lead book', async () => {
    for (const who of ['artist', 'archivist', 'performer', 'admin'] as const) {
      const res = await w.book({ products: [{ productId: pier.productId, lotId: pier.id, site: 'Behind the left ear' }] }, who);
      expect(res.status, who).toBe(403);
    }
  });

  it('moves a booked test; a stale version gets 409', async () => {
    const stale = await w.api().post(`/api/patch-tests/${testId}/reschedule`).set('Cookie', w.as.head).send({ startsAt: new Date(Date.now() + 3 * HOUR).toISOString(), location: 'Studio 4', version: version + 5 });
    expect(stale.status).toBe(409);
    const moved = await w.api().post(`/api/patch-tests/${testId}/reschedule`).set('Cookie', w.as.head).send({ startsAt: new Date(Date.now() + 3 * HOUR).toISOString(), location: 'Studio 4', version });
    expect(moved.status).toBe(200);
    expect(moved.body.location).toBe('Studio 4');
    version = moved.body.version;
  });
});

describe('application, removal and readings (lead)', () => {
  it('records the application only for the lead', async () => {
    const head = await w.api().post(`/api/patch-tests/${testId}/apply`).set('Cookie', w.as.head).send({ appliedAt: appliedAt.toISOString(), version });
    expect(head.status).toBe(403);
    const res = await w.api().post(`/api/patch-tests/${testId}/apply`).set('Cookie', w.as.lead).send({ appliedAt: appliedAt.toISOString(), version });
    expect(res.status).toBe(200);
    expect(res.body.status).toBe('applied');
    version = res.body.version;
  });

  it('refuses a reading before the removal is recorded, and one before its window opens', async () => {
    const detail = await w.api().get(`/api/patch-tests/${testId}`).set('Cookie', w.as.lead);
    const sites = detail.body.products.map((p: { id: string }) => p.id);
    const early = await w.api().post(`/api/patch-tests/${testId}/readings`).set('Cookie', w.as.lead).send({ pointId: 'd2', readAt: new Date().toISOString(), version, sites: [{ testProductId: sites[0], code: '-' }] });
    expect(early.status).toBe(409);
    expect(early.body.error.message).toContain('Record when the patches came off first');
    const removal = await w.api().post(`/api/patch-tests/${testId}/removal`).set('Cookie', w.as.lead).send({ removedAt: removedAt.toISOString(), version });
    expect(removal.status).toBe(200);
    version = removal.body.version;
    // Read at least 10–15 minutes after removal (Skin Health Institute AU, check-values.md §1.3): five minutes is too soon.
    const tooSoon = await w.api().post(`/api/patch-tests/${testId}/readings`).set('Cookie', w.as.lead).send({ pointId: 'd2', readAt: new Date(removedAt.getTime() + 5 * 60_000).toISOString(), version, sites: [{ testProductId: sites[0], code: '-' }] });
    expect(tooSoon.status).toBe(400);
    expect(tooSoon.body.error.details.fields.readAt[0]).toContain('after the patches come off');
  });

  it('records a grid, refuses an unknown code, and answers a second reading of a site and point with 409, the first standing', async () => {
    const detail = await w.api().get(`/api/patch-tests/${testId}`).set('Cookie', w.as.lead);
    const [q, p, f] = detail.body.products.map((x: { id: string }) => x.id);
    const readAt = new Date(removedAt.getTime() + 40 * 60_000).toISOString();
    const before = await counts(w.t);
    const unknown = await w.api().post(`/api/patch-tests/${testId}/readings`).set('Cookie', w.as.lead).send({ pointId: 'd2', readAt, version, sites: [{ testProductId: q, code: '+' }, { testProductId: p, code: '4+' }] });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.details.fields['sites.1.code']).toEqual(['Use one of -, ?+, +, ++, +++, IR, NT']);
    expect(await counts(w.t)).toEqual(before);
    const head = await w.api().post(`/api/patch-tests/${testId}/readings`).set('Cookie', w.as.head).send({ pointId: 'd2', readAt, version, sites: [{ testProductId: q, code: '+' }] });
    expect(head.status).toBe(403);
    const ok = await w.api().post(`/api/patch-tests/${testId}/readings`).set('Cookie', w.as.lead).send({ pointId: 'd2', readAt, version, sites: [{ testProductId: q, code: '+', note: 'Raised redness at the edge' }, { testProductId: p, code: '-' }, { testProductId: f, code: '-' }] });
    expect(ok.status).toBe(201);
    expect(ok.body.medical).toBe(true);
    expect(ok.body.products[0].readings[0]).toMatchObject({ pointId: 'd2', code: '+', note: 'Raised redness at the edge' });
    version = ok.body.version;
    const again = await w.api().post(`/api/patch-tests/${testId}/readings`).set('Cookie', w.as.lead).send({ pointId: 'd2', readAt, version, sites: [{ testProductId: q, code: '-' }] });
    expect(again.status).toBe(409);
    const after = await w.api().get(`/api/patch-tests/${testId}`).set('Cookie', w.as.lead);
    expect(after.body.products[0].readings.map((r: { code: string }) => r.code)).toEqual(['+']);
  });

  it('shows staff which readings were taken, never what they were', async () => {
    for (const who of ['head', 'artist', 'archivist'] as const) {
      const res = await w.api().get(`/api/patch-tests/${testId}`).set('Cookie', w.as[who]);
      expect(res.status, who).toBe(200);
      expect(res.body.medical).toBe(false);
      expect(res.body.products[0].readPointIds).toEqual(['d2']);
      expect(res.body.products[0].readings).toBeUndefined();
      expect(res.text).not.toContain('Raised redness');
    }
  });

  it('adds a photo to a reading: an image only, not too large, sealed, and served only to the lead and the performer', async () => {
    const detail = await w.api().get(`/api/patch-tests/${testId}`).set('Cookie', w.as.lead);
    const readingId = detail.body.products[0].readings[0].id;
    const url = `/api/patch-tests/${testId}/readings/${readingId}/photos`;
    const before = await counts(w.t);
    const text = await w.api().post(url).set('Cookie', w.as.lead).attach('photo', Buffer.from('not a photo at all'), 'site.jpg');
    expect(text.status).toBe(400);
    const big = await w.api().post(url).set('Cookie', w.as.lead).attach('photo', Buffer.alloc(11 * 1024 * 1024, 1), 'site.jpg');
    expect(big.status).toBe(413);
    expect(await counts(w.t)).toEqual(before);
    const ok = await w.api().post(url).set('Cookie', w.as.lead).attach('photo', await cameraJpeg(), 'site.jpg');
    expect(ok.status).toBe(201);
    const photoId = ok.body.products[0].readings[0].photos[0].id;
    const lead = await w.api().get(`/api/patch-tests/${testId}/photos/${photoId}?size=photo`).set('Cookie', w.as.lead);
    expect(lead.status).toBe(200);
    expect(lead.headers['content-type']).toBe('image/jpeg');
    expect(lead.body.subarray(0, 2).toString('hex')).toBe('ffd8');
    const performer = await w.api().get(`/api/patch-tests/${testId}/photos/${photoId}`).set('Cookie', w.as.performer);
    expect(performer.status).toBe(200);
    for (const who of ['head', 'artist', 'archivist', 'admin'] as const) {
      const res = await w.api().get(`/api/patch-tests/${testId}/photos/${photoId}`).set('Cookie', w.as[who]);
      expect(res.status, who).toBe(403);
    }
    const reads = await w.t.db.db.selectFrom('audit_log').select('subject_performer_id').where('action', '=', 'medical.read').where('entity_type', '=', 'reading_photo').execute();
    expect(reads).toEqual([{ subject_performer_id: w.juno }, { subject_performer_id: w.juno }]);
  });

  it('reads D4, then the clearance says why for staff and shows outcomes to the lead', async () => {
    const detail = await w.api().get(`/api/patch-tests/${testId}`).set('Cookie', w.as.lead);
    const [q, p, f] = detail.body.products.map((x: { id: string }) => x.id);
    const d4 = await w.api().post(`/api/patch-tests/${testId}/readings`).set('Cookie', w.as.lead).send({ pointId: 'd4', readAt: new Date().toISOString(), version: detail.body.version, sites: [{ testProductId: q, code: '++' }, { testProductId: p, code: '-' }, { testProductId: f, code: '-' }] });
    expect(d4.status).toBe(201);
    const head = await w.api().get(`/api/performers/${w.juno}/patch-tests`).set('Cookie', w.as.head);
    expect(head.status).toBe(200);
    expect(head.body.medical).toBe(false);
    const rows: { productName: string }[] = [...head.body.clearances, ...head.body.sharedCautions.items];
    const byName = new Map<string, unknown>(rows.map((c) => [c.productName, c]));
    // Any + or stronger: Do not use (product brief §3).
    expect(byName.get('Quayside acrylic emulsion adhesive')).toMatchObject({ state: 'do_not_use', reasons: [{ text: 'reacted in testing' }] });
    expect(byName.get('Quayside acrylic emulsion adhesive')).not.toHaveProperty('outcome');
    // A product with no ingredients stays Untested, "ingredients not recorded", even with negative readings.
    // (The demo's lead once decided on it for Juno; that decision has lapsed, a later reason.)
    const flotsam = byName.get('Flotsam prosthetic adhesive') as { state: string; reasons: { text: string }[] };
    expect(flotsam.state).toBe('untested');
    expect(flotsam.reasons[0]!.text).toBe('ingredients not recorded');
    // Shares Acrylates Copolymer with Quayside (catalogue seed INCI lists): Caution.
    const breakwater = byName.get('Breakwater acrylic sealer') as { state: string; reasons: { text: string }[] };
    expect(breakwater.state).toBe('caution');
    expect(breakwater.reasons[0]!.text).toBe('shares an ingredient with a product that reacted');
    // Untested and reached only through that ingredient: on the first page of shared-ingredient Cautions, not in the table proper.
    expect(head.body.sharedCautions).toMatchObject({ page: 1, pageSize: 25 });
    expect(head.body.sharedCautions.total).toBe(head.body.sharedCautions.items.length);
    expect(head.body.clearances.map((c: { productName: string }) => c.productName)).not.toContain('Breakwater acrylic sealer');
    expect(head.text).not.toContain('"++"');
    expect(head.body.tests.items.find((x: { id: string }) => x.id === testId)).toMatchObject({ status: 'applied' });
    const lead = await w.api().get(`/api/performers/${w.juno}/patch-tests`).set('Cookie', w.as.lead);
    const leadRow = lead.body.clearances.find((c: { productName: string }) => c.productName === 'Quayside acrylic emulsion adhesive');
    // + then ++: strongest ++, final ++, rising (crescendo, MSD Manual via check-values.md §1.4).
    expect(leadRow.outcome).toEqual({ strongest: '++', final: '++', pattern: 'rising' });
  });

  it('lets the lead override with a required note, shown as an override; the note stays with the lead and the performer', async () => {
    const pierProduct = await w.product('Pier silicone adhesive remover');
    const url = `/api/performers/${w.juno}/clearance-overrides`;
    const head = await w.api().post(url).set('Cookie', w.as.head).send({ formulationId: pierProduct.formulationId, state: 'caution', note: 'Watch the edges' });
    expect(head.status).toBe(403);
    const before = await counts(w.t);
    const noNote = await w.api().post(url).set('Cookie', w.as.lead).send({ formulationId: pierProduct.formulationId, state: 'caution', note: '  ' });
    expect(noNote.status).toBe(400);
    expect(noNote.body.error.details.fields.note).toEqual(['Explain the decision in a note']);
    const pending = await w.api().post(url).set('Cookie', w.as.lead).send({ formulationId: pierProduct.formulationId, state: 'pending', note: 'x' });
    expect(pending.status).toBe(400);
    expect(await counts(w.t)).toEqual(before);
    const ok = await w.api().post(url).set('Cookie', w.as.lead).send({ formulationId: pierProduct.formulationId, state: 'caution', note: 'Watch the edges after long wear' });
    expect(ok.status).toBe(201);
    const row = ok.body.clearances.find((c: { productName: string }) => c.productName === 'Pier silicone adhesive remover');
    expect(row).toMatchObject({ state: 'caution', overridden: true, computedState: 'cleared', override: { state: 'caution', by: 'Dr. Tomasz Brill', note: 'Watch the edges after long wear' } });
    const staff = await w.api().get(`/api/performers/${w.juno}/patch-tests`).set('Cookie', w.as.artist);
    expect(staff.body.clearances.find((c: { productName: string }) => c.productName === 'Pier silicone adhesive remover')).toMatchObject({ state: 'caution', overridden: true });
    expect(staff.text).not.toContain('Watch the edges');
    const audit = await w.t.db.db.selectFrom('audit_log').select(['subject_performer_id', 'details']).where('action', '=', 'clearance.override').execute();
    expect(audit).toHaveLength(1);
    expect(audit[0]!.subject_performer_id).toBe(w.juno);
    expect(JSON.stringify(audit[0]!.details)).not.toContain('Watch the edges');
  });

  it('closes the test; a reading after that is refused with the reason', async () => {
    const detail = await w.api().get(`/api/patch-tests/${testId}`).set('Cookie', w.as.lead);
    const closed = await w.api().post(`/api/patch-tests/${testId}/close`).set('Cookie', w.as.lead).send({ version: detail.body.version });
    expect(closed.status).toBe(200);
    expect(closed.body.status).toBe('closed');
    const late = await w.api().post(`/api/patch-tests/${testId}/readings`).set('Cookie', w.as.lead).send({ pointId: 'd7', readAt: new Date().toISOString(), version: closed.body.version, sites: [{ testProductId: detail.body.products[1].id, code: '-' }] });
    expect(late.status).toBe(409);
    expect(late.body.error.message).toBe('This test is closed; no more readings can be recorded.');
  });
});

describe('a test waiting for a consent', () => {
  it('is saved and shown as needing consent, and cannot be applied until one is signed', async () => {
    // Beatrix has no patch-testing consent in the demo data.
    const beatrix = await w.performer('Beatrix Nwachukwu');
    const booked = await w.book({ performerId: beatrix, products: [{ productId: pier.productId, lotId: pier.id, site: site(1) }] });
    expect(booked.status).toBe(201);
    expect(booked.body.consentMissing).toBe(true);
    const list = await w.api().get(`/api/patch-tests?productionId=${w.lantern}`).set('Cookie', w.as.head);
    expect(list.body.items.find((x: { id: string }) => x.id === booked.body.id).consentMissing).toBe(true);
    const apply = await w.api().post(`/api/patch-tests/${booked.body.id}/apply`).set('Cookie', w.as.lead).send({ appliedAt: new Date().toISOString(), version: booked.body.version });
    expect(apply.status).toBe(409);
    expect(apply.body.error.message).toContain('no patch-testing consent in force');
  });
});

describe('the printable result summary', () => {
  it('gives the lead and the performer a PDF with the grades and notes, audited, and refuses everyone else', async () => {
    const { pdfText } = await import('../../support/pdf.ts');
    const url = `/api/performers/${w.juno}/patch-tests/summary.pdf`;
    const before = (await w.t.db.db.selectFrom('audit_log').select('id').where('action', '=', 'medical.read').where('subject_performer_id', '=', w.juno).execute()).length;
    const lead = await w.api().get(url).set('Cookie', w.as.lead).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(lead.status).toBe(200);
    expect(lead.headers['content-type']).toContain('application/pdf');
    const text = (await pdfText(lead.body as Buffer)).text.replace(/\s+/g, ' ');
    expect(text).toContain('Patch-test results: Juno');
    expect(text).toContain('Screening, not diagnosis');
    expect(text).toContain('Quayside acrylic emulsion adhesive: Do not use');
    expect(text).toContain('Raised redness at the edge');
    const after = (await w.t.db.db.selectFrom('audit_log').select('id').where('action', '=', 'medical.read').where('subject_performer_id', '=', w.juno).execute()).length;
    expect(after).toBeGreaterThan(before);
    expect((await w.api().get(url).set('Cookie', w.as.performer)).status).toBe(200);
    for (const who of ['head', 'artist', 'archivist', 'admin'] as const) expect((await w.api().get(url).set('Cookie', w.as[who])).status, who).toBe(403);
  });
});
