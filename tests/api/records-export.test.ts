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
