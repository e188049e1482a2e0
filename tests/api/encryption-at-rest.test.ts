import { existsSync, promises as fs } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sealedWith } from '../../api/crypto/medical.ts';
import { SEALED_COLUMNS } from '../../api/crypto/sealed-columns.ts';
import { rotateMedicalKey } from '../../scripts/rotate-key-lib.ts';
import { createTestApp, TEST_MEDICAL_KEY, type TestApp } from '../support/app.ts';

let t: TestApp;
let work: string;
const ALLERGY = 'Sticking plasters make my skin itch';

beforeAll(async () => {
  t = await createTestApp();
  work = await fs.mkdtemp(path.join(os.tmpdir(), 'plinth-key-'));
  // A withdrawal with a reason, so a sealed reason exists too.
  const bea = (await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', 'Beatrix Nwachukwu').executeTakeFirstOrThrow()).id;
  const c = await t.db.db.selectFrom('consents').select(['id', 'version']).where('performer_id', '=', bea).where('withdrawn_at', 'is', null).executeTakeFirstOrThrow();
  await request(t.app).post(`/api/consents/${c.id}/withdraw`).set('Cookie', await t.sessionFor('lead@plinth.test')).send({ reason: 'My eczema flared up', version: c.version }).expect(200);
  // A patch-test reading with a note, and an override with its note.
  const lead = await t.sessionFor('lead@plinth.test');
  const juno = (await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', 'Juno Castellane').executeTakeFirstOrThrow()).id;
  const lantern = (await t.db.db.selectFrom('productions').select('id').where('name', '=', 'The Lantern Keeper').executeTakeFirstOrThrow()).id;
  const lot = await t.db.db.selectFrom('product_lots').select(['id', 'product_id']).where('code', '=', 'TW-2604').executeTakeFirstOrThrow();
  const booked = await request(t.app)
    .post('/api/patch-tests')
    .set('Cookie', lead)
    .send({ performerId: juno, productionId: lantern, protocolId: 'short-contact', startsAt: new Date(Date.now() + 3_600_000).toISOString(), location: 'Trailer 1', products: [{ productId: lot.product_id, lotId: lot.id, site: 'Behind the right ear' }] })
    .expect(201);
  const applied = await request(t.app).post(`/api/patch-tests/${booked.body.id}/apply`).set('Cookie', lead).send({ appliedAt: new Date(Date.now() - 31 * 60_000).toISOString(), version: booked.body.version }).expect(200);
  await request(t.app)
    .post(`/api/patch-tests/${booked.body.id}/readings`)
    .set('Cookie', lead)
    .send({ pointId: 'm30', readAt: new Date().toISOString(), version: applied.body.version, sites: [{ testProductId: applied.body.products[0].id, code: '+++', note: 'Weeping patch spreading past the edge' }] })
    .expect(201);
  await request(t.app).post(`/api/performers/${juno}/clearance-overrides`).set('Cookie', lead).send({ formulationId: applied.body.products[0].formulationId, state: 'do_not_use', note: 'Referred to the production doctor' }).expect(201);
});
afterAll(async () => {
  await t?.close();
  await fs.rm(work, { recursive: true, force: true });
});

async function rawMedical() {
  const answers = await t.db.db.selectFrom('consent_answers').select(['answer']).where('medical', '=', true).execute();
  const reasons = await t.db.db.selectFrom('consents').select(['withdrawal_reason']).where('withdrawal_reason', 'is not', null).execute();
  const readings = await t.db.db.selectFrom('patch_test_readings').select(['code', 'note']).execute();
  const overrides = await t.db.db.selectFrom('clearance_overrides').select('note').execute();
  const texts = [...readings.flatMap((r) => [r.code, ...(r.note === null ? [] : [r.note])]), ...overrides.map((o) => o.note)];
  return { answers: answers.map((a) => JSON.stringify(a.answer)), reasons: [...reasons.map((r) => r.withdrawal_reason!), ...texts] };
}

async function medicalPdfFiles() {
  const rows = await t.db.db
    .selectFrom('consents as c')
    .innerJoin('files as f', 'f.id', 'c.pdf_file_id')
    .select(['f.storage_path'])
    .where((eb) => eb.exists(eb.selectFrom('consent_answers as a').select('a.id').whereRef('a.consent_id', '=', 'c.id').where('a.medical', '=', true)))
    .execute();
  return Promise.all(rows.map(async (r) => t.storedBytes(r.storage_path)));
}

describe('health details at rest', () => {
  it('no health answer, withdrawal reason or health-bearing PDF is stored in plain text', async () => {
    const { answers, reasons } = await rawMedical();
    expect(answers.length).toBeGreaterThan(3);
    for (const a of answers) expect(a).toMatch(/^"sealed:v1:/);
    expect(answers.join('\n')).not.toContain(ALLERGY);
    expect(reasons.length).toBeGreaterThan(0);
    for (const r of reasons) expect(r.startsWith('sealed:v1:')).toBe(true);
    expect(reasons.join('\n')).not.toContain('eczema');
    // Reading codes and notes and override notes are sealed too.
    expect(reasons.join('\n')).not.toMatch(/Weeping|production doctor|\+\+\+/);
    const pdfs = await medicalPdfFiles();
    expect(pdfs.length).toBeGreaterThan(2);
    for (const bytes of pdfs) {
      expect(bytes.subarray(0, 5).toString('latin1')).not.toBe('%PDF-');
      expect(bytes.toString('latin1')).not.toContain('Sticking');
    }
  });

  it('skin-check observations, the lead’s answers to requests and incident notes are sealed in their rows', async () => {
    const lead = await t.sessionFor('lead@plinth.test');
    const waiting = await t.db.db.selectFrom('lead_requests').select(['id', 'version']).where('status', '=', 'waiting').executeTakeFirstOrThrow();
    await request(t.app).post(`/api/lead-requests/${waiting.id}/decision`).set('Cookie', lead).send({ decision: 'refused', note: 'Blistered under occlusion last season', version: waiting.version }).expect(200);
    const incident = await t.db.db.selectFrom('incidents').select(['id', 'version']).executeTakeFirstOrThrow();
    await request(t.app).post(`/api/incidents/${incident.id}/close`).set('Cookie', lead).send({ note: 'Settled with a cool compress', version: incident.version }).expect(200);
    const observations = await t.db.db.selectFrom('skin_checks').select('observation').where('observation', 'is not', null).execute();
    const notes = await t.db.db.selectFrom('lead_requests').select('decision_note').where('decision_note', 'is not', null).execute();
    const closing = await t.db.db.selectFrom('incidents').select('closing_note').where('closing_note', 'is not', null).execute();
    const raw = [...observations.map((o) => o.observation!), ...notes.map((n) => n.decision_note!), ...closing.map((c) => c.closing_note!)];
    expect(raw.length).toBe(observations.length + 2);
    expect(observations.length).toBeGreaterThan(0);
    for (const r of raw) expect(r.startsWith('sealed:v1:')).toBe(true);
    expect(raw.join('\n')).not.toMatch(/Pink patch|Blistered|compress/);
  });

  it('the lead still reads them through the app', async () => {
    const juno = (await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', 'Juno Castellane').executeTakeFirstOrThrow()).id;
    const c = (await t.db.db.selectFrom('consents').select('id').where('performer_id', '=', juno).where('kind', '=', 'patch_testing').executeTakeFirstOrThrow()).id;
    const res = await request(t.app).get(`/api/consents/${c}`).set('Cookie', await t.sessionFor('lead@plinth.test'));
    expect(JSON.stringify(res.body)).toContain(ALLERGY);
  });

  it('a rotation seals everything again under a new key, drops the old one, and the app reads on', async () => {
    const keyFile = path.join(work, 'medical-data.key');
    await fs.writeFile(keyFile, `${TEST_MEDICAL_KEY}\n`, { mode: 0o600 });
    const before = await rawMedical();
    const oldId = sealedWith(JSON.parse(before.answers[0]!) as string);
    const report = await rotateMedicalKey({ db: t.db.db, files: t.ctx.files, keyFile });
    expect(report.keyId).not.toBe(oldId);
    // Every sealed column's values: answers and reasons, and the health details of the other features (lead's notes, observations).
    let sealedValues = before.answers.length;
    for (const c of SEALED_COLUMNS.filter((x) => x.table !== 'consent_answers')) {
      const { rows } = await t.db.pool.query<{ n: string }>(`select count(*) as n from "${c.table}" where "${c.column}" is not null`);
      sealedValues += Number(rows[0]!.n);
    }
    expect(sealedValues).toBeGreaterThan(before.answers.length + before.reasons.length);
    expect(report.values).toBe(sealedValues);
    expect(report.files).toBe((await medicalPdfFiles()).length);
    const after = await rawMedical();
    for (const a of after.answers) expect(sealedWith(JSON.parse(a) as string)).toBe(report.keyId);
    for (const f of await medicalPdfFiles()) expect(sealedWith(f)).toBe(report.keyId);
    expect((await fs.stat(keyFile)).mode & 0o777).toBe(0o600);
    expect(existsSync(`${keyFile}.previous`)).toBe(false);
    // The process now holds only the new key, and the lead still reads the answer.
    const juno = (await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', 'Juno Castellane').executeTakeFirstOrThrow()).id;
    const c = (await t.db.db.selectFrom('consents').select('id').where('performer_id', '=', juno).where('kind', '=', 'patch_testing').executeTakeFirstOrThrow()).id;
    expect(JSON.stringify((await request(t.app).get(`/api/consents/${c}`).set('Cookie', await t.sessionFor('lead@plinth.test'))).body)).toContain(ALLERGY);
  });
});
