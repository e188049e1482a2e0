import { randomBytes } from 'node:crypto';
import { existsSync, promises as fs } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ICDRG_CODES } from '#shared/domain/icdrg.ts';
import { installKeyring, keyringOf, openBytes, openJson, sealedWith } from '../../api/crypto/medical.ts';
import { resealColumns } from '../../api/crypto/reseal.ts';
import { SEALED_COLUMNS, type SealedColumn } from '../../api/crypto/sealed-columns.ts';
import { findOpenMailFailure, recordMailFailure } from '../../api/mail/failures.ts';
import { rotateMedicalKey, rotateMedicalKeyFromEnv } from '../../scripts/rotate-key-lib.ts';
import { cameraJpeg } from '../fixtures/images.ts';
import { createTestApp, TEST_MEDICAL_KEY, type TestApp } from '../support/app.ts';

let t: TestApp;
let work: string;
let juno: string;
let testId: string;
let photoId: string;
let uploaded: Buffer;
let keptMail: string;
const ALLERGY = 'Sticking plasters make my skin itch';
/** A signed copy kept with a message that could not be sent: it carries the health answer. */
const COPY = Buffer.from(`%PDF-1.7 signed copy: ${ALLERGY}`);
/** Words of every health detail this file writes or the demo seeds; none may be found in a raw row. */
const PLAIN = [ALLERGY, 'eczema', 'Weeping patch', 'production doctor', 'Blistered under occlusion', 'cool compress', 'Pink patch', 'No longer comfortable', 'Reviewed with the performer'];
const OUTCOMES = ['clear', 'redness', 'reaction'];

async function id(table: 'performers' | 'productions', col: 'legal_name' | 'name', value: string): Promise<string> {
  return (await t.db.db.selectFrom(table).select('id').where(col, '=', value).executeTakeFirstOrThrow()).id;
}

beforeAll(async () => {
  // The local disk driver, so the test reads the very bytes on disk.
  t = await createTestApp({ FILE_STORE: 'local' });
  work = await fs.mkdtemp(path.join(os.tmpdir(), 'plinth-key-'));
  const lead = await t.sessionFor('lead@plinth.test');
  // A withdrawal with a reason, so a sealed reason exists too.
  const bea = await id('performers', 'legal_name', 'Beatrix Nwachukwu');
  const c = await t.db.db.selectFrom('consents').select(['id', 'version']).where('performer_id', '=', bea).where('withdrawn_at', 'is', null).executeTakeFirstOrThrow();
  await request(t.app).post(`/api/consents/${c.id}/withdraw`).set('Cookie', lead).send({ reason: 'My eczema flared up', version: c.version }).expect(200);
  // A patch-test reading with a grade, a note and a photo, and an override with its note.
  juno = await id('performers', 'legal_name', 'Juno Castellane');
  const lantern = await id('productions', 'name', 'The Lantern Keeper');
  const lot = await t.db.db.selectFrom('product_lots').select(['id', 'product_id']).where('code', '=', 'TW-2604').executeTakeFirstOrThrow();
  const booked = await request(t.app)
    .post('/api/patch-tests')
    .set('Cookie', lead)
    .send({ performerId: juno, productionId: lantern, protocolId: 'short-contact', startsAt: new Date(Date.now() + 3_600_000).toISOString(), location: 'Trailer 1', products: [{ productId: lot.product_id, lotId: lot.id, site: 'Behind the right ear' }] })
    .expect(201);
  testId = booked.body.id;
  const applied = await request(t.app).post(`/api/patch-tests/${testId}/apply`).set('Cookie', lead).send({ appliedAt: new Date(Date.now() - 31 * 60_000).toISOString(), version: booked.body.version }).expect(200);
  const read = await request(t.app)
    .post(`/api/patch-tests/${testId}/readings`)
    .set('Cookie', lead)
    .send({ pointId: 'm30', readAt: new Date().toISOString(), version: applied.body.version, sites: [{ testProductId: applied.body.products[0].id, code: '+++', note: 'Weeping patch spreading past the edge' }] })
    .expect(201);
  uploaded = await cameraJpeg();
  const withPhoto = await request(t.app).post(`/api/patch-tests/${testId}/readings/${read.body.products[0].readings[0].id}/photos`).set('Cookie', lead).attach('photo', uploaded, 'site.jpg').expect(201);
  photoId = withPhoto.body.products[0].readings[0].photos[0].id;
  await request(t.app).post(`/api/performers/${juno}/clearance-overrides`).set('Cookie', lead).send({ formulationId: applied.body.products[0].formulationId, state: 'do_not_use', note: 'Referred to the production doctor' }).expect(201);
  // The lead's answer to an artist's request, and an incident closed with a note.
  const waiting = await t.db.db.selectFrom('lead_requests').select(['id', 'version']).where('status', '=', 'waiting').executeTakeFirstOrThrow();
  await request(t.app).post(`/api/lead-requests/${waiting.id}/decision`).set('Cookie', lead).send({ decision: 'refused', note: 'Blistered under occlusion last season', version: waiting.version }).expect(200);
  const incident = await t.db.db.selectFrom('incidents').select(['id', 'version']).executeTakeFirstOrThrow();
  await request(t.app).post(`/api/incidents/${incident.id}/close`).set('Cookie', lead).send({ note: 'Settled with a cool compress', version: incident.version }).expect(200);
  // A signed copy whose mail could not be sent is kept to send again.
  await recordMailFailure(t.db.db, { to: 'performer@plinth.test', subject: 'Your signed form', text: 'Attached.', attachments: [{ filename: 'consent.pdf', content: COPY, contentType: 'application/pdf' }] }, 'connection refused');
  keptMail = (await t.db.db.selectFrom('mail_failures').select('id').where('subject', '=', 'Your signed form').executeTakeFirstOrThrow()).id;
});
afterAll(async () => {
  await t?.close();
  await fs.rm(work, { recursive: true, force: true });
});

/** The raw text of every value of one sealed column, by a plain pg query (no app code between). */
async function rawColumn(c: SealedColumn): Promise<string[]> {
  const { rows } = await t.db.pool.query<{ v: string }>(`select "${c.column}"::text as v from "${c.table}" where "${c.column}" is not null${c.where ? ` and "${c.where}"` : ''}`);
  return rows.map((r) => r.v);
}

/** A raw value as the sealed string it holds (a jsonb column holds it as a JSON string). */
function sealedText(c: SealedColumn, raw: string): string {
  return c.jsonb ? (JSON.parse(raw) as string) : raw;
}

async function readingPhotoFiles(): Promise<{ purpose: string; bytes: Buffer }[]> {
  const rows = await t.db.db.selectFrom('files').select(['purpose', 'storage_path']).where('purpose', 'in', ['reading_photo', 'reading_photo_thumb']).execute();
  // The bytes on this machine's disk, read past the app's file store.
  return Promise.all(rows.map(async (r) => ({ purpose: r.purpose, bytes: await fs.readFile(path.join(t.config.storageDir, r.storage_path)) })));
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

async function leadReads() {
  const lead = await t.sessionFor('lead@plinth.test');
  const c = (await t.db.db.selectFrom('consents').select('id').where('performer_id', '=', juno).where('kind', '=', 'patch_testing').executeTakeFirstOrThrow()).id;
  const consent = await request(t.app).get(`/api/consents/${c}`).set('Cookie', lead).expect(200);
  const test = await request(t.app).get(`/api/patch-tests/${testId}`).set('Cookie', lead).expect(200);
  const checked = (await t.db.db.selectFrom('skin_checks').select('application_id').executeTakeFirstOrThrow()).application_id;
  const application = await request(t.app).get(`/api/applications/${checked}`).set('Cookie', lead).expect(200);
  const photo = await request(t.app).get(`/api/patch-tests/${testId}/photos/${photoId}?size=photo`).set('Cookie', lead).buffer(true).expect(200);
  return { consent: JSON.stringify(consent.body), reading: test.body.products[0].readings[0], skinCheck: application.body.skinCheck, photo: photo.body as Buffer };
}

describe('health details at rest', () => {
  it('every sealed column holds only sealed values in its raw rows: no answer, grade, outcome, note or observation in plain text', async () => {
    for (const c of SEALED_COLUMNS) {
      const raw = await rawColumn(c);
      expect(raw.length, `${c.table}.${c.column} has rows to check`).toBeGreaterThan(0);
      for (const v of raw) expect(sealedText(c, v).startsWith('sealed:v1:'), `${c.table}.${c.column}`).toBe(true);
      const all = raw.join('\n');
      for (const p of PLAIN) expect(all, `${c.table}.${c.column}`).not.toContain(p);
      // Each value's own plain text is not in the column either (a word of three letters or more).
      for (const v of raw) {
        const plain = JSON.stringify(openJson(sealedText(c, v)));
        if (plain.length > 5) expect(all).not.toContain(plain.slice(1, -1));
      }
    }
    // A grade or an outcome is a short word: the column holds none as it is.
    const codes = await rawColumn(SEALED_COLUMNS.find((c) => c.table === 'patch_test_readings' && c.column === 'code')!);
    for (const v of codes) expect([...ICDRG_CODES] as string[]).not.toContain(v);
    expect(codes.map((v) => openJson<string>(v))).toContain('+++');
    const outcomes = await rawColumn(SEALED_COLUMNS.find((c) => c.table === 'skin_checks' && c.column === 'outcome')!);
    for (const v of outcomes) expect(OUTCOMES).not.toContain(v);
    expect(outcomes.map((v) => openJson<string>(v))).toContain('redness');
    // The kept message holds its attachment neither as text nor as base64.
    const kept = (await rawColumn(SEALED_COLUMNS.find((c) => c.table === 'mail_failures')!)).join('\n');
    expect(kept).not.toContain(COPY.toString('base64'));
    expect(kept).not.toContain('Your signed form');
    // The seeded answer is among the sealed ones.
    const answers = await rawColumn(SEALED_COLUMNS.find((c) => c.table === 'consent_answers')!);
    expect(answers.map((v) => JSON.stringify(openJson(JSON.parse(v)))).join('\n')).toContain(ALLERGY);
  });

  it('a reading photo on disk is ciphertext: no JPEG or PNG signature, and neither the upload nor the stored picture in it', async () => {
    const { photo } = await leadReads();
    expect(photo.subarray(0, 3).toString('hex')).toBe('ffd8ff');
    const files = await readingPhotoFiles();
    expect(files.map((f) => f.purpose).sort()).toEqual(['reading_photo', 'reading_photo_thumb']);
    for (const f of files) {
      expect(f.bytes.subarray(0, 3).toString('hex')).not.toBe('ffd8ff');
      expect(f.bytes.subarray(0, 8).toString('hex')).not.toBe('89504e470d0a1a0a');
      expect(f.bytes.includes(Buffer.from('JFIF'))).toBe(false);
      expect(f.bytes.includes(uploaded.subarray(200, 264))).toBe(false);
      expect(f.bytes.includes(photo.subarray(photo.length >> 1, (photo.length >> 1) + 64))).toBe(false);
    }
    // Opened with the key, the large one is the very picture the lead is served.
    expect(openBytes(files.find((f) => f.purpose === 'reading_photo')!.bytes).equals(photo)).toBe(true);
  });

  it('the lead still reads them through the app', async () => {
    const r = await leadReads();
    expect(r.consent).toContain(ALLERGY);
    expect(r.reading).toMatchObject({ code: '+++', note: 'Weeping patch spreading past the edge' });
    expect(r.skinCheck).toMatchObject({ outcome: 'redness', observation: expect.stringContaining('Pink patch') });
    expect((await findOpenMailFailure(t.db.db, keptMail))?.attachments?.[0]?.content).toEqual(COPY);
  });

  it('an outcome left in plain text by an earlier release still reads, and the start-up pass seals it', async () => {
    const checked = (await t.db.db.selectFrom('skin_checks').select('application_id').executeTakeFirstOrThrow()).application_id;
    await t.db.pool.query(`update skin_checks set outcome = 'redness' where application_id = $1`, [checked]);
    expect((await leadReads()).skinCheck.outcome).toBe('redness');
    expect(await resealColumns(t.db.db, { onlyPlain: true })).toBe(1);
    const { rows } = await t.db.pool.query<{ outcome: string }>(`select outcome from skin_checks where application_id = $1`, [checked]);
    expect(rows[0]!.outcome.startsWith('sealed:v1:')).toBe(true);
    expect((await leadReads()).skinCheck.outcome).toBe('redness');
    expect(await resealColumns(t.db.db, { onlyPlain: true })).toBe(0);
  });
});

describe('rotating the medical data key', () => {
  /** Every sealed value in the database, and every sealed stored file. */
  async function everything() {
    const values: string[] = [];
    for (const c of SEALED_COLUMNS) values.push(...(await rawColumn(c)).map((v) => sealedText(c, v)));
    const files = [...(await medicalPdfFiles()), ...(await readingPhotoFiles()).map((f) => f.bytes)];
    return { values, files };
  }

  it('the key file: seals everything again under a new key, drops the old one, and the app reads on', async () => {
    const keyFile = path.join(work, 'medical-data.key');
    await fs.writeFile(keyFile, `${TEST_MEDICAL_KEY}\n`, { mode: 0o600 });
    const before = await everything();
    const oldId = sealedWith(before.values[0]!);
    const report = await rotateMedicalKey({ db: t.db.db, files: t.ctx.files, keyFile });
    expect(report.keyId).not.toBe(oldId);
    expect(report.values).toBe(before.values.length);
    expect(report.files).toBe(before.files.length);
    const after = await everything();
    for (const v of after.values) expect(sealedWith(v)).toBe(report.keyId);
    for (const f of after.files) expect(sealedWith(f)).toBe(report.keyId);
    expect((await fs.stat(keyFile)).mode & 0o777).toBe(0o600);
    expect(existsSync(`${keyFile}.previous`)).toBe(false);
    // The process now holds only the new key, and the lead still reads the answer.
    expect((await leadReads()).consent).toContain(ALLERGY);
  });

  it('MEDICAL_DATA_KEY to MEDICAL_DATA_KEY_NEW: the app reads every detail with the new key, and the old key opens nothing', async () => {
    const oldKey = (await fs.readFile(path.join(work, 'medical-data.key'), 'utf8')).trim();
    const newKey = randomBytes(32).toString('base64');
    const seen = await leadReads();
    const before = await everything();
    const report = await rotateMedicalKeyFromEnv({ db: t.db.db, files: t.ctx.files, oldKey, newKey });
    expect(report.keyId).toBe(keyringOf(newKey).current.id);
    expect(report.values).toBe(before.values.length);
    expect(report.files).toBe(before.files.length);
    const after = await everything();
    for (const v of after.values) expect(sealedWith(v)).toBe(report.keyId);
    for (const f of after.files) expect(sealedWith(f)).toBe(report.keyId);
    // Nothing of it changed but its seal.
    const now = await leadReads();
    expect(now.consent).toContain(ALLERGY);
    expect(now.reading).toEqual(seen.reading);
    expect(now.skinCheck).toEqual(seen.skinCheck);
    expect(now.photo.equals(seen.photo)).toBe(true);
    // A process holding only the old key opens none of it.
    installKeyring(keyringOf(oldKey));
    try {
      for (const v of after.values) expect(() => openJson(v)).toThrow(/does not hold/);
      for (const f of after.files) expect(() => openBytes(f)).toThrow(/does not hold/);
    } finally {
      installKeyring(keyringOf(newKey));
    }
    // The kept message still goes out as it was.
    expect((await findOpenMailFailure(t.db.db, keptMail))?.attachments?.[0]?.content).toEqual(COPY);
    const retry = await request(t.app).post(`/api/outbox/failures/${keptMail}/retry`).set('Cookie', await t.sessionFor('admin@plinth.test')).expect(200);
    expect(retry.body).toEqual({ sent: true, error: null });
    // The same two keys again: nothing is left to do, and the same key twice is refused.
    expect(await rotateMedicalKeyFromEnv({ db: t.db.db, files: t.ctx.files, oldKey, newKey })).toMatchObject({ values: 0, files: 0 });
    await expect(rotateMedicalKeyFromEnv({ db: t.db.db, files: t.ctx.files, oldKey: newKey, newKey })).rejects.toThrow(/key in use/);
  });
});
