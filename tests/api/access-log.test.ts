import { sql } from 'kysely';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, type TestApp } from '../support/app.ts';

let t: TestApp;
let juno: string;
let junoConsent: string;

beforeAll(async () => {
  t = await createTestApp();
  juno = (await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', 'Juno Castellane').executeTakeFirstOrThrow()).id;
  junoConsent = (await t.db.db.selectFrom('consents').select('id').where('performer_id', '=', juno).where('kind', '=', 'patch_testing').executeTakeFirstOrThrow()).id;
});
afterAll(async () => {
  await t?.close();
});

describe('the audit log is append-only', () => {
  it('refuses UPDATE, DELETE and TRUNCATE, even on the application’s own connection', async () => {
    await request(t.app).get(`/api/consents/${junoConsent}`).set('Cookie', await t.sessionFor('lead@plinth.test')).expect(200);
    const before = await t.db.db.selectFrom('audit_log').select((eb) => eb.fn.countAll<string>().as('n')).executeTakeFirstOrThrow();
    // The connection the app itself uses (t.ctx.db), not an administrator's.
    await expect(t.ctx.db.updateTable('audit_log').set({ action: 'auth.sign_in' }).where('action', '=', 'medical.read').execute()).rejects.toThrow(/append-only/);
    await expect(t.ctx.db.deleteFrom('audit_log').where('action', '=', 'medical.read').execute()).rejects.toThrow(/append-only/);
    await expect(sql`truncate audit_log`.execute(t.ctx.db)).rejects.toThrow(/append-only/);
    const after = await t.db.db.selectFrom('audit_log').select((eb) => eb.fn.countAll<string>().as('n')).executeTakeFirstOrThrow();
    expect(after.n).toBe(before.n);
    // Appending still works.
    await t.ctx.db.transaction().execute((trx) => trx.insertInto('audit_log').values({ actor_user_id: null, action: 'demo.seed', entity_type: 'system', details: '{}' }).execute());
  });
});

describe('who has read a performer’s health details', () => {
  it('the performer sees each read by the lead, with who, when and what; the route is recorded as a pattern', async () => {
    const lead = await t.sessionFor('lead@plinth.test');
    await request(t.app).get(`/api/consents/${junoConsent}`).set('Cookie', lead).expect(200);
    await request(t.app).get(`/api/consents/${junoConsent}/pdf`).set('Cookie', lead).expect(200);
    const mine = await request(t.app).get(`/api/performers/${juno}/health-reads`).set('Cookie', await t.sessionFor('performer@plinth.test'));
    expect(mine.status).toBe(200);
    const whats = mine.body.items.filter((r: { who: string }) => r.who === 'Dr. Tomasz Brill').map((r: { what: string }) => r.what);
    expect(whats).toContain('Answers on a consent form');
    expect(whats).toContain('A signed consent PDF');
    const row = await t.db.db.selectFrom('audit_log').select(['route', 'subject_performer_id']).where('action', '=', 'medical.read').where('entity_type', '=', 'consent_pdf').executeTakeFirstOrThrow();
    expect(row).toEqual({ route: 'GET /api/consents/:id/pdf', subject_performer_id: juno });
  });

  it('is for the performer and the lead only', async () => {
    expect((await request(t.app).get(`/api/performers/${juno}/health-reads`).set('Cookie', await t.sessionFor('lead@plinth.test'))).status).toBe(200);
    for (const email of ['head@plinth.test', 'artist@plinth.test', 'archivist@plinth.test', 'admin@plinth.test']) {
      expect((await request(t.app).get(`/api/performers/${juno}/health-reads`).set('Cookie', await t.sessionFor(email))).status, email).toBe(403);
    }
  });
});
