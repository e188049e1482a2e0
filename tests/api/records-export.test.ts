import JSZip from 'jszip';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, type TestApp } from '../support/app.ts';

let t: TestApp;
let juno: string;
beforeAll(async () => {
  t = await createTestApp();
  juno = (await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', 'Juno Castellane').executeTakeFirstOrThrow()).id;
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

  it('the lead may hand it over; no one else on the staff may download it', async () => {
    const lead = await binary(request(t.app).get(`/api/performers/${juno}/records.zip`).set('Cookie', await t.sessionFor('lead@plinth.test')));
    expect(lead.status).toBe(200);
    for (const email of ['head@plinth.test', 'artist@plinth.test', 'archivist@plinth.test', 'admin@plinth.test']) {
      expect((await request(t.app).get(`/api/performers/${juno}/records.zip`).set('Cookie', await t.sessionFor(email))).status, email).toBe(403);
    }
  });
});
