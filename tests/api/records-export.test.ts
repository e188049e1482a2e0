import JSZip from 'jszip';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cameraJpeg } from '../fixtures/images.ts';
import { createTestApp, type TestApp } from '../support/app.ts';
import { pdfText } from '../support/pdf.ts';

let t: TestApp;
let juno: string;
let photo: { testId: string; photoId: string; served: Buffer };
beforeAll(async () => {
  t = await createTestApp();
  juno = (await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', 'Juno Castellane').executeTakeFirstOrThrow()).id;
  // A photo of one of her seeded readings, as the lead takes it; and the lead reading her consent (an entry her export must list).
  const lead = await t.sessionFor('lead@plinth.test');
  const reading = await t.db.db
    .selectFrom('patch_test_readings as r')
    .innerJoin('patch_test_products as tp', 'tp.id', 'r.test_product_id')
    .innerJoin('patch_tests as pt', 'pt.booking_id', 'tp.test_id')
    .select(['r.id', 'pt.booking_id'])
    .where('pt.performer_id', '=', juno)
    .orderBy('r.read_at')
    .executeTakeFirstOrThrow();
  const added = await request(t.app).post(`/api/patch-tests/${reading.booking_id}/readings/${reading.id}/photos`).set('Cookie', lead).attach('photo', await cameraJpeg(), 'site.jpg').expect(201);
  const photoId = (added.body.products as { readings?: { id: string; photos: { id: string }[] }[] }[]).flatMap((p) => p.readings ?? []).find((r) => r.id === reading.id)!.photos[0]!.id;
  const served = await request(t.app).get(`/api/patch-tests/${reading.booking_id}/photos/${photoId}?size=photo`).set('Cookie', lead).buffer(true).expect(200);
  photo = { testId: reading.booking_id, photoId, served: served.body as Buffer };
  const consent = (await t.db.db.selectFrom('consents').select('id').where('performer_id', '=', juno).where('kind', '=', 'patch_testing').executeTakeFirstOrThrow()).id;
  await request(t.app).get(`/api/consents/${consent}`).set('Cookie', lead).expect(200);
});
afterAll(async () => {
  await t?.close();
});

function binary(res: request.Request) {
  return res.buffer(true).parse((r, cb) => {
    const chunks: Buffer[] = [];
    r.on('data', (c: Buffer) => chunks.push(c));
    r.on('end', () => cb(null, Buffer.concat(chunks)));
  });
}

describe("the performer's own records (right of access)", () => {
  it('is one ZIP of JSON and the signed PDFs, with the health answers, and the download is logged', async () => {
    const res = await binary(request(t.app).get(`/api/performers/${juno}/records.zip`).set('Cookie', await t.sessionFor('performer@plinth.test')));
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/zip');
    // Read back with an independent ZIP reader.
    const zip = await JSZip.loadAsync(res.body as Buffer);
    const names = Object.keys(zip.files);
    for (const n of ['README.txt', 'me.json', 'consents.json', 'casts.json', 'health-reads.json']) expect(names).toContain(n);
    const me = JSON.parse(await zip.file('me.json')!.async('string'));
    expect(me).toMatchObject({ legalName: 'Juno Castellane', email: 'performer@plinth.test' });
    const consents = JSON.parse(await zip.file('consents.json')!.async('string')) as { answers: { answer: unknown }[] }[];
    const count = await t.db.db.selectFrom('consents').select((eb) => eb.fn.countAll<string>().as('n')).where('performer_id', '=', juno).executeTakeFirstOrThrow();
    expect(consents).toHaveLength(Number(count.n));
    expect(JSON.stringify(consents)).toContain('Sticking plasters make my skin itch');
    const pdfs = names.filter((n) => n.startsWith('consents/') && n.endsWith('.pdf'));
    expect(pdfs).toHaveLength(consents.length);
    expect((await zip.file(pdfs[0]!)!.async('nodebuffer')).subarray(0, 5).toString()).toBe('%PDF-');
    const casts = JSON.parse(await zip.file('casts.json')!.async('string'));
    expect(casts.length).toBeGreaterThan(0);
    // What touched her skin: every patch test with its readings, every logged application with its skin check, every appliance build.
    for (const n of ['patch-tests.json', 'applications.json', 'appliances.json']) expect(names).toContain(n);
    const patch = JSON.parse(await zip.file('patch-tests.json')!.async('string')) as { tests: { id: string; products: { readings: { code: string }[] }[] }[]; clearances: unknown[] };
    const tests = await t.db.db.selectFrom('patch_tests').select('booking_id').where('performer_id', '=', juno).execute();
    expect(patch.tests.map((x) => x.id).sort()).toEqual(tests.map((x) => x.booking_id).sort());
    const readings = await t.db.db.selectFrom('patch_test_readings as r').innerJoin('patch_test_products as tp', 'tp.id', 'r.test_product_id').innerJoin('patch_tests as pt', 'pt.booking_id', 'tp.test_id').select((eb) => eb.fn.countAll<string>().as('n')).where('pt.performer_id', '=', juno).executeTakeFirstOrThrow();
    expect(patch.tests.flatMap((x) => x.products.flatMap((p) => p.readings))).toHaveLength(Number(readings.n));
    expect(patch.clearances.length).toBeGreaterThan(0);
    const applications = JSON.parse(await zip.file('applications.json')!.async('string')) as { skinCheck: { observation: string | null } | null }[];
    const logged = await t.db.db.selectFrom('applications').select((eb) => eb.fn.countAll<string>().as('n')).where('performer_id', '=', juno).executeTakeFirstOrThrow();
    expect(applications).toHaveLength(Number(logged.n));
    expect(applications.some((a) => a.skinCheck?.observation)).toBe(true);
    const appliances = JSON.parse(await zip.file('appliances.json')!.async('string'));
    expect(JSON.stringify(appliances).length).toBeGreaterThan(10);
    const audit = await t.db.db.selectFrom('audit_log').select(['subject_performer_id', 'details']).where('entity_type', '=', 'records_export').executeTakeFirstOrThrow();
    expect(audit.subject_performer_id).toBe(juno);
  });

  it('holds the patch-test record as a PDF and the reading photos opened, named from the JSON', async () => {
    const res = await binary(request(t.app).get(`/api/performers/${juno}/records.zip`).set('Cookie', await t.sessionFor('performer@plinth.test')));
    expect(res.status).toBe(200);
    const zip = await JSZip.loadAsync(res.body as Buffer);
    // The printed record, read back with pdf.js: her name, and each test's readings in words.
    const pdf = await zip.file('patch-tests.pdf')!.async('nodebuffer');
    expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    const { text } = await pdfText(pdf);
    expect(text).toContain('Patch-test results');
    expect(text).toContain('Juno');
    const patch = JSON.parse(await zip.file('patch-tests.json')!.async('string')) as { tests: { id: string; status: string; protocolName: string; products: { site: string; readings?: { photos: { id: string; file: string | null }[] }[] }[] }[] };
    for (const test of patch.tests.filter((x) => x.status !== 'cancelled')) expect(text).toContain(test.protocolName);
    for (const site of new Set(patch.tests.filter((x) => x.status !== 'cancelled').flatMap((x) => x.products.map((p) => p.site)))) expect(text.replace(/\s+/g, ' ')).toContain(site);
    // Every photo of her readings is in the archive as the picture itself, the very bytes the lead is served.
    const inJson = patch.tests.flatMap((x) => x.products.flatMap((p) => (p.readings ?? []).flatMap((r) => r.photos)));
    const stored = await t.db.db.selectFrom('patch_test_photos as ph').innerJoin('patch_test_readings as r', 'r.id', 'ph.reading_id').innerJoin('patch_test_products as tp', 'tp.id', 'r.test_product_id').innerJoin('patch_tests as pt', 'pt.booking_id', 'tp.test_id').select('ph.id').where('pt.performer_id', '=', juno).execute();
    expect(inJson.map((p) => p.id).sort()).toEqual(stored.map((p) => p.id).sort());
    const entries = Object.keys(zip.files).filter((n) => n.startsWith('patch-tests/photos/') && !zip.files[n]!.dir);
    expect(entries.sort()).toEqual(inJson.map((p) => p.file).sort());
    const mine = inJson.find((p) => p.id === photo.photoId)!;
    const bytes = await zip.file(mine.file!)!.async('nodebuffer');
    expect(bytes.subarray(0, 3).toString('hex')).toBe('ffd8ff');
    expect(bytes.equals(photo.served)).toBe(true);
  });

  it('lists each cast with its movements, without naming who in the department had it', async () => {
    const res = await binary(request(t.app).get(`/api/performers/${juno}/records.zip`).set('Cookie', await t.sessionFor('performer@plinth.test')));
    const zip = await JSZip.loadAsync(res.body as Buffer);
    const casts = JSON.parse(await zip.file('casts.json')!.async('string')) as { label: string; where: string; movements: { kind: string; at: string; from: string; to: string; reason: string | null }[] }[];
    const rows = await t.db.db.selectFrom('casts as c').leftJoin('cast_movements as m', 'm.cast_id', 'c.id').select(['c.label_code', 'm.kind', 'm.reason']).where('c.performer_id', '=', juno).execute();
    expect(casts.map((c) => c.label).sort()).toEqual([...new Set(rows.map((r) => r.label_code))].sort());
    const moves = rows.filter((r) => r.kind !== null);
    expect(moves.length).toBeGreaterThan(0);
    expect(casts.flatMap((c) => c.movements)).toHaveLength(moves.length);
    for (const c of casts) {
      expect(c.where.length).toBeGreaterThan(0);
      const theirs = moves.filter((m) => m.label_code === c.label);
      expect(c.movements.map((m) => m.kind).sort()).toEqual(theirs.map((m) => m.kind).sort());
      expect(c.movements.map((m) => m.at)).toEqual(c.movements.map((m) => m.at).toSorted());
    }
    expect(casts.flatMap((c) => c.movements).some((m) => m.kind === 'check_out' && m.to === 'Out of the store with the department' && m.reason)).toBe(true);
    // The demo's holders are named in the staff's records of the moves only (who made a cast, she was there for).
    const text = JSON.stringify(casts.map((c) => c.movements));
    expect(text).not.toContain('Rafe Lindqvist');
    expect(text).not.toContain('Sol Varga');
  });

  it('lists every audit entry about her, who viewed her health details among them, as the log stood when she asked', async () => {
    const before = await t.db.db.selectFrom('audit_log').select((eb) => eb.fn.countAll<string>().as('n')).where('subject_performer_id', '=', juno).executeTakeFirstOrThrow();
    const res = await binary(request(t.app).get(`/api/performers/${juno}/records.zip`).set('Cookie', await t.sessionFor('performer@plinth.test')));
    const zip = await JSZip.loadAsync(res.body as Buffer);
    const audit = JSON.parse(await zip.file('audit.json')!.async('string')) as { at: string; who: string | null; action: string; what: string; record: string }[];
    // The export's own reads of her tests are logged before the log is read; its own entry after.
    const during = await t.db.db.selectFrom('audit_log').select(['action', 'entity_type']).where('subject_performer_id', '=', juno).orderBy('at').orderBy('id').offset(Number(before.n)).execute();
    expect(during.at(-1)).toMatchObject({ action: 'medical.read', entity_type: 'records_export' });
    expect(audit).toHaveLength(Number(before.n) + during.length - 1);
    const leadName = (await t.db.db.selectFrom('users').select('display_name').where('email', '=', 'lead@plinth.test').executeTakeFirstOrThrow()).display_name;
    expect(audit.some((a) => a.action === 'medical.read' && a.record === 'consent' && a.who === leadName)).toBe(true);
    expect(audit.some((a) => a.action === 'medical.read' && a.record === 'reading_photo' && a.who === leadName)).toBe(true);
    for (const a of audit) expect(a.what.length).toBeGreaterThan(0);
    expect(audit.map((a) => a.at)).toEqual(audit.map((a) => a.at).toSorted());
    // The earlier downloads of this file are in it, each logged as a read of her health details.
    expect(audit.filter((a) => a.record === 'records_export').length).toBeGreaterThan(0);
  });

  it('the lead may hand it over; no one else on the staff may download it', async () => {
    const lead = await binary(request(t.app).get(`/api/performers/${juno}/records.zip`).set('Cookie', await t.sessionFor('lead@plinth.test')));
    expect(lead.status).toBe(200);
    const handed = await t.db.db.selectFrom('audit_log').select(['details', 'actor_user_id']).where('entity_type', '=', 'records_export').orderBy('id', 'desc').executeTakeFirstOrThrow();
    expect(handed.actor_user_id).toBe(await t.userId('lead@plinth.test'));
    expect(handed.details).toMatchObject({ handedOverBy: await t.userId('lead@plinth.test') });
    for (const email of ['head@plinth.test', 'artist@plinth.test', 'archivist@plinth.test', 'admin@plinth.test']) {
      expect((await request(t.app).get(`/api/performers/${juno}/records.zip`).set('Cookie', await t.sessionFor(email))).status, email).toBe(403);
    }
  });
});
