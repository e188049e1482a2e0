import { openBytes } from '../../api/crypto/medical.ts';
import { promises as fs } from 'node:fs';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { afterResponseSettled } from '../../api/http/after-response.ts';
import type { Mailer } from '../../api/mail/mailer.ts';
import { DEMO_PASSWORD } from '../../fake-idp/accounts.ts';
import { type RunningIdp, startIdp } from '../../fake-idp/server.ts';
import { createTestApp, type TestApp } from '../support/app.ts';
import { signInAtIdp } from '../support/oidc-flow.ts';
import { snapshotData } from '../fixtures/snapshot.ts';

// Ways a manager or an administrator could reach health data without being the lead, closed.
const ORIGIN = 'http://127.0.0.1:3999';
let idp: RunningIdp;
let t: TestApp;
let restore: () => Promise<void>;
let lantern: { id: string; version: number };
let saltglass: string;

beforeAll(async () => {
  idp = await startIdp({ port: 0, quiet: true, clients: [{ clientId: 'plinth', clientSecret: 'plinth-dev-secret', redirectUris: [`${ORIGIN}/api/auth/callback`], postLogoutRedirectUris: [`${ORIGIN}/`] }] });
  t = await createTestApp({ OIDC_ISSUER: idp.issuer, APP_ORIGIN: ORIGIN });
  restore = await snapshotData(t);
});
beforeEach(async () => {
  await restore();
  lantern = await t.db.db.selectFrom('productions').select(['id', 'version']).where('name', '=', 'The Lantern Keeper').executeTakeFirstOrThrow();
  saltglass = (await t.db.db.selectFrom('productions').select('id').where('name', '=', 'Saltglass Mile').executeTakeFirstOrThrow()).id;
});
afterAll(async () => {
  await t?.close();
  await idp?.close();
});

const api = () => request(t.app);
const currentLead = async (productionId: string) =>
  (await t.db.db.selectFrom('lead_appointments').select('user_id').where('production_id', '=', productionId).where('ends_at', 'is', null).executeTakeFirst())?.user_id ?? null;

describe('who may be the designated lead', () => {
  it('a performer on the production cannot be appointed, even with a staff role there too', async () => {
    const juno = await t.userId('performer@plinth.test');
    const before = await currentLead(lantern.id);
    const res = await api().post(`/api/productions/${lantern.id}/lead`).set('Cookie', await t.sessionFor('admin@plinth.test')).send({ userId: juno, version: lantern.version });
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields.userId.join(' ')).toMatch(/staff role|performer/);
    // A performer who is also given a staff role there is still a performer there.
    await t.db.db.insertInto('memberships').values({ user_id: juno, production_id: lantern.id, role: 'artist' }).execute();
    const again = await api().post(`/api/productions/${lantern.id}/lead`).set('Cookie', await t.sessionFor('admin@plinth.test')).send({ userId: juno, version: lantern.version });
    expect(again.status).toBe(400);
    expect(again.body.error.details.fields.userId.join(' ')).toMatch(/performer/);
    expect(await currentLead(lantern.id)).toBe(before);
  });

  it('an administrator cannot appoint themself', async () => {
    const admin = await t.userId('admin@plinth.test');
    await t.db.db.insertInto('memberships').values({ user_id: admin, production_id: lantern.id, role: 'head' }).execute();
    const res = await api().post(`/api/productions/${lantern.id}/lead`).set('Cookie', await t.sessionFor('admin@plinth.test')).send({ userId: admin, version: lantern.version });
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields.userId.join(' ')).toMatch(/Another administrator/);
    expect(await currentLead(lantern.id)).not.toBe(admin);
  });

  it("every appointment and every ending is e-mailed to the production's heads", async () => {
    const files = async () => (await fs.readdir(t.mail.dir)).filter((f) => f.endsWith('.eml'));
    const before = new Set(await files());
    const artist = await t.userId('artist@plinth.test');
    const res = await api().post(`/api/productions/${lantern.id}/lead`).set('Cookie', await t.sessionFor('admin@plinth.test')).send({ userId: artist, version: lantern.version });
    expect(res.status).toBe(201);
    const ended = await api().delete(`/api/productions/${lantern.id}/lead?version=${res.body.version}`).set('Cookie', await t.sessionFor('admin@plinth.test'));
    expect(ended.status).toBe(200);
    const added = (await files()).filter((f) => !before.has(f));
    const texts = await Promise.all(added.map((f) => fs.readFile(path.join(t.mail.dir, f), 'utf8')));
    const toHead = texts.filter((m) => /^To: .*head@plinth\.test/m.test(m) && /designated lead on The Lantern Keeper changed/.test(m));
    expect(toHead).toHaveLength(2);
  });
});

describe('CSV import', () => {
  it('an artist here who is head elsewhere cannot turn "may view" into "manages" by importing a performer they only see', async () => {
    // Sol Varga: artist on The Lantern Keeper (sees Halvard), head on Saltglass Mile.
    const sol = await t.sessionFor('artist2@plinth.test');
    const halvard = await t.db.db.selectFrom('performers').select(['id', 'email']).where('legal_name', '=', 'Halvard Imre Solberg').executeTakeFirstOrThrow();
    const csv = `legal_name,email\nHalvard Imre Solberg,${halvard.email}\n`;
    const res = await api().post(`/api/performers/import?productionId=${saltglass}&commit=true`).set('Cookie', sol).attach('file', Buffer.from(csv), { filename: 'p.csv', contentType: 'text/csv' });
    expect(res.status).toBe(400);
    expect(res.body.error.details.result.rows[0].errors.email[0]).toMatch(/you do not manage/);
    const engaged = await t.db.db.selectFrom('engagements').select('production_id').where('performer_id', '=', halvard.id).execute();
    expect(engaged.map((e) => e.production_id)).toEqual([lantern.id]);
    const detail = await api().get(`/api/performers/${halvard.id}`).set('Cookie', sol);
    expect(detail.body.contact).toBeNull();
    expect(detail.body.canEdit).toBe(false);
  });
});

describe('consent templates', () => {
  async function patchTemplate() {
    const id = (await t.db.db.selectFrom('consent_templates').select('id').where('kind', '=', 'patch_testing').executeTakeFirstOrThrow()).id;
    const current = (await api().get(`/api/consent-templates/${id}`).set('Cookie', await t.sessionFor('head@plinth.test'))).body;
    return { id, current };
  }

  it('a head cannot lower a health question to "not medical"; the lead of a production using the form can', async () => {
    const { id, current } = await patchTemplate();
    const lowered = current.questions.map((q: { id: string; medical: boolean }) => (q.id === 'known_allergies' ? { ...q, medical: false } : q));
    expect(current.questions.find((q: { id: string }) => q.id === 'known_allergies').medical).toBe(true);
    const body = { kind: current.kind, title: current.title, body: current.body, questions: lowered, validityDays: current.validityDays, version: current.version };
    const byHead = await api().put(`/api/consent-templates/${id}`).set('Cookie', await t.sessionFor('head@plinth.test')).send(body);
    expect(byHead.status).toBe(403);
    expect((await api().get(`/api/consent-templates/${id}`).set('Cookie', await t.sessionFor('head@plinth.test'))).body.version).toBe(current.version);
    const byLead = await api().put(`/api/consent-templates/${id}`).set('Cookie', await t.sessionFor('lead@plinth.test')).send(body);
    expect(byLead.status).toBe(200);
    const audit = await t.db.db.selectFrom('audit_log').select('details').where('action', '=', 'template.publish').where('entity_id', '=', id).executeTakeFirstOrThrow();
    expect(audit.details).toMatchObject({ madeNonMedical: ['known_allergies'] });
  });

  it('every question of a health-data form is stored as medical, whatever its flag says', async () => {
    const res = await api()
      .post('/api/consent-templates')
      .set('Cookie', await t.sessionFor('head@plinth.test'))
      .send({ kind: 'health_data', title: 'Extra health form', body: 'A body long enough to be a consent text.', questions: [{ id: 'meds', type: 'short_text', label: 'Medication?', medical: false, required: false }], validityDays: 365 });
    expect(res.status).toBe(201);
    expect(res.body.questions[0].medical).toBe(true);
  });
});

describe('checking a PDF', () => {
  it('names no performer of a production the checker does not work on', async () => {
    const juno = await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', 'Juno Castellane').executeTakeFirstOrThrow();
    const c = await t.db.db
      .selectFrom('consents')
      .innerJoin('files', 'files.id', 'consents.pdf_file_id')
      .select(['files.storage_path'])
      .where('consents.performer_id', '=', juno.id)
      .where('consents.production_id', '=', lantern.id)
      .executeTakeFirstOrThrow();
    const pdf = openBytes(await t.storedBytes(c.storage_path));
    // A head on Saltglass Mile only.
    const outsider = await t.db.db.insertInto('users').values({ email: 'salt.head@plinth.test', display_name: 'Salt Head' }).returning('id').executeTakeFirstOrThrow();
    await t.db.db.insertInto('memberships').values({ user_id: outsider.id, production_id: saltglass, role: 'head' }).execute();
    const res = await api().post('/api/consents/verify').set('Cookie', await t.sessionFor('salt.head@plinth.test')).attach('file', pdf, 'c.pdf');
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ match: true, elsewhere: true, consent: null });
    expect(JSON.stringify(res.body)).not.toContain('Juno');
    const own = await api().post('/api/consents/verify').set('Cookie', await t.sessionFor('head@plinth.test')).attach('file', pdf, 'c.pdf');
    expect(own.body).toMatchObject({ match: true, elsewhere: false, consent: { performerName: 'Juno Castellane' } });
  });
});

describe('the withdrawal-link request', () => {
  it('replies before any work is done, the same for a known and an unknown address', async () => {
    const real = t.ctx.mailer;
    let release: () => void = () => {};
    const gate = new Promise<void>((resolve) => (release = resolve));
    const held: Mailer = { send: async (m) => (await gate, real.send(m)), close: () => real.close() };
    t.ctx.mailer = held;
    try {
      // If the reply waited for the mail, this would hang until the gate opens.
      const known = await api().post('/api/withdrawal-links').send({ email: 'bea.n@example.test' });
      const unknown = await api().post('/api/withdrawal-links').send({ email: 'nobody@example.test' });
      expect(known.status).toBe(202);
      expect(known.body).toEqual(unknown.body);
    } finally {
      release();
      await afterResponseSettled();
      t.ctx.mailer = real;
    }
    expect(await t.db.db.selectFrom('withdrawal_links').select('id').execute()).toHaveLength(1);
  });

  it('sends at most three links an hour to one address, however many are asked for', async () => {
    for (let i = 0; i < 5; i++) await api().post('/api/withdrawal-links').send({ email: 'bea.n@example.test' }).expect(202);
    await afterResponseSettled();
    expect(await t.db.db.selectFrom('withdrawal_links').select('id').execute()).toHaveLength(3);
  });
});

describe('sign-in with an e-mail bound to another identity', () => {
  it('ends on the "not completed" page, not a raw error, and is audited', async () => {
    await t.db.db.updateTable('users').set({ oidc_issuer: idp.issuer, oidc_subject: 'some-other-subject' }).where('email', '=', 'artist@plinth.test').execute();
    const login = await api().get('/api/auth/login');
    const cookie = ([] as string[]).concat(login.headers['set-cookie'] ?? []).find((l) => l.startsWith('plinth.sid='))!.split(';')[0]!;
    const { callbackUrl } = await signInAtIdp(login.headers.location as string, idp.issuer, 'artist@plinth.test', DEMO_PASSWORD);
    const cb = await api().get(callbackUrl.slice(ORIGIN.length)).set('Cookie', cookie);
    expect(cb.status).toBe(401);
    expect(cb.type).toBe('text/html');
    expect(cb.text).toContain('Sign-in was not completed');
    const audit = await t.db.db.selectFrom('audit_log').select(['details']).where('action', '=', 'auth.sign_in_refuse').executeTakeFirstOrThrow();
    expect(audit.details).toMatchObject({ reason: 'email_bound_to_other_subject' });
  });
});

describe('production settings', () => {
  it('the demo identity provider refuses to start with NODE_ENV=production', async () => {
    const was = process.env.NODE_ENV;
    process.env.NODE_ENV = 'production';
    try {
      await expect(startIdp({ port: 0, quiet: true, clients: [] })).rejects.toThrow(/does not run with NODE_ENV=production/);
    } finally {
      process.env.NODE_ENV = was;
    }
  });

  it('rate limits count per client address: the proxy’s forwarded address when TRUST_PROXY is on, the socket otherwise', async () => {
    const token = 'Q'.repeat(43);
    const proxied = await createTestApp({ RATE_LIMITS: 'on', TRUST_PROXY: 'true' }, { seed: false });
    try {
      // The signing-link routes allow 30 a minute per address.
      for (let i = 0; i < 30; i++) await request(proxied.app).get(`/api/signing/${token}`).set('X-Forwarded-For', '203.0.113.7').expect(404);
      expect((await request(proxied.app).get(`/api/signing/${token}`).set('X-Forwarded-For', '203.0.113.7')).status).toBe(429);
      // Another client behind the same proxy has its own allowance.
      expect((await request(proxied.app).get(`/api/signing/${token}`).set('X-Forwarded-For', '203.0.113.8')).status).toBe(404);
    } finally {
      await proxied.close();
    }
  });
});
