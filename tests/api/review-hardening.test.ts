import { randomUUID } from 'node:crypto';
import { promises as fs } from 'node:fs';
import path from 'node:path';
import { simpleParser } from 'mailparser';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it, onTestFinished, vi } from 'vitest';
import { DEMO_PASSWORD } from '../../fake-idp/accounts.ts';
import { type RunningIdp, startIdp } from '../../fake-idp/server.ts';
import { createTestApp, type TestApp } from '../support/app.ts';
import { CookieJar, followUntilLeaving, signInAtIdp } from '../support/oidc-flow.ts';
import { drawnSignature } from '../support/signature.ts';

const ORIGIN = 'http://127.0.0.1:3999';
let idp: RunningIdp;
let t: TestApp;
let production: string;

beforeAll(async () => {
  idp = await startIdp({ port: 0, quiet: true, clients: [{ clientId: 'plinth', clientSecret: 'plinth-dev-secret', redirectUris: [`${ORIGIN}/api/auth/callback`], postLogoutRedirectUris: [`${ORIGIN}/`] }] });
  t = await createTestApp({ OIDC_ISSUER: idp.issuer, APP_ORIGIN: ORIGIN });
  production = (await t.db.db.selectFrom('productions').select('id').where('name', '=', 'The Lantern Keeper').executeTakeFirstOrThrow()).id;
});
afterAll(async () => {
  await t?.close();
  await idp?.close();
});

const performerId = async (legal: string) => (await t.db.db.selectFrom('performers').select(['id', 'version']).where('legal_name', '=', legal).executeTakeFirstOrThrow());
const templateId = async (kind: string) => (await t.db.db.selectFrom('consent_templates').select('id').where('kind', '=', kind as never).orderBy('created_at').executeTakeFirstOrThrow()).id;
function cookieOf(res: request.Response): string {
  return ([] as string[]).concat(res.headers['set-cookie'] ?? []).find((l) => l.startsWith('plinth.sid='))!.split(';')[0]!;
}

describe('staff cannot become "the performer"', () => {
  it('refuses to link a performer to the caller, to another staff member, or to the administrator', async () => {
    const head = await t.sessionFor('head@plinth.test');
    const juno = await performerId('Juno Castellane');
    for (const email of ['head@plinth.test', 'lead@plinth.test', 'artist@plinth.test', 'admin@plinth.test']) {
      const res = await request(t.app).put(`/api/performers/${juno.id}/account`).set('Cookie', head).send({ userId: await t.userId(email), version: juno.version });
      expect(res.status, email).toBe(400);
      expect(res.body.error.details.fields.userId).toBeDefined();
    }
    const me = await request(t.app).get('/api/session').set('Cookie', head);
    expect(me.body.performerIds).toEqual([]);
  });

  it('does not link a staff member at sign-in even when a performer carries their e-mail', async () => {
    const oz = await performerId('Oswin Parfitt-Reyes');
    await t.db.db.updateTable('performers').set({ email: 'head@plinth.test' }).where('id', '=', oz.id).execute();
    const login = await request(t.app).get('/api/auth/login');
    const { callbackUrl } = await signInAtIdp(login.headers.location as string, idp.issuer, 'head@plinth.test', DEMO_PASSWORD);
    const cb = await request(t.app).get(callbackUrl.slice(ORIGIN.length)).set('Cookie', cookieOf(login));
    const me = await request(t.app).get('/api/session').set('Cookie', cookieOf(cb));
    expect(me.body.user.email).toBe('head@plinth.test');
    expect(me.body.performerIds).toEqual([]);
    const linked = await t.db.db.selectFrom('performers').select('user_id').where('id', '=', oz.id).executeTakeFirstOrThrow();
    expect(linked.user_id).toBeNull();
    await t.db.db.updateTable('performers').set({ email: 'oz.parfitt@example.test' }).where('id', '=', oz.id).execute();
  });
});

describe('sign-in redirects stay on this site', () => {
  for (const returnTo of ['//evil.test/x', '/\\evil.test/x', '/\\/evil.test', 'https://evil.test/', '/ok path']) {
    it(`refuses returnTo=${JSON.stringify(returnTo)}`, async () => {
      expect((await request(t.app).get('/api/auth/login').query({ returnTo })).status).toBe(400);
    });
  }
  it('accepts a path with a query', async () => {
    expect((await request(t.app).get('/api/auth/login').query({ returnTo: '/admin/users?access=none' })).status).toBe(302);
  });
});

describe('the lent tablet', () => {
  async function lend(): Promise<{ cookie: string; requestId: string }> {
    const login = await request(t.app).get('/api/auth/login');
    const { callbackUrl } = await signInAtIdp(login.headers.location as string, idp.issuer, 'lead@plinth.test', DEMO_PASSWORD);
    const cb = await request(t.app).get(callbackUrl.slice(ORIGIN.length)).set('Cookie', cookieOf(login));
    const cookie = cookieOf(cb);
    const pid = (await performerId('Corentin Malik Ashdown')).id;
    const r = await request(t.app).post('/api/signing-requests').set('Cookie', cookie).send({ performerId: pid, templateId: await templateId('application'), productionId: production, mode: 'tablet' });
    expect((await request(t.app).post(`/api/signing-requests/${r.body.id}/hand-over`).set('Cookie', cookie)).status).toBe(200);
    return { cookie, requestId: r.body.id };
  }

  it('cannot be left with a remembered sign-in: a login without fresh credentials is refused', async () => {
    // One browser: the identity provider remembers the lead's sign-in in this jar.
    const jar = new CookieJar();
    const first = await request(t.app).get('/api/auth/login');
    const signedIn = await followUntilLeaving(jar, first.headers.location as string, idp.issuer);
    const html = await signedIn.last.text();
    const action = /<form[^>]*action="([^"]+)"/.exec(html)![1]!.replace(/&amp;/g, '&');
    const done = await followUntilLeaving(jar, new URL(action, idp.issuer + '/').href, idp.issuer, {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({ email: 'lead@plinth.test', password: DEMO_PASSWORD }).toString(),
    });
    const cb = await request(t.app).get(done.location.slice(ORIGIN.length)).set('Cookie', cookieOf(first));
    const cookie = cookieOf(cb);
    const pid = (await performerId('Halvard Imre Solberg')).id;
    const r = await request(t.app).post('/api/signing-requests').set('Cookie', cookie).send({ performerId: pid, templateId: await templateId('health_data'), productionId: production, mode: 'tablet' });
    expect((await request(t.app).post(`/api/signing-requests/${r.body.id}/hand-over`).set('Cookie', cookie)).status).toBe(200);
    // The remembered sign-in ages past the allowed skew: the clock moves on (the identity provider runs in this process too).
    vi.useFakeTimers({ toFake: ['Date'], now: Date.now() + 5000 });
    onTestFinished(() => void vi.useRealTimers());

    const login = await request(t.app).get('/api/auth/login').set('Cookie', cookie);
    const url = new URL(login.headers.location as string);
    expect(url.searchParams.get('prompt')).toBe('login');
    // Someone at the tablet strips what forces the password and rides the remembered sign-in.
    url.searchParams.delete('prompt');
    url.searchParams.delete('max_age');
    const silent = await followUntilLeaving(jar, url.href, idp.issuer);
    expect(silent.location.startsWith(`${ORIGIN}/api/auth/callback?code=`)).toBe(true);
    const refused = await request(t.app).get(silent.location.slice(ORIGIN.length)).set('Cookie', cookieOf(login));
    expect(refused.status).toBe(401);
    expect(refused.text).toContain('enter their password again');
    expect((await request(t.app).get('/api/session').set('Cookie', cookieOf(login))).status).toBe(401);
  });

  it('signing out does not unlock it', async () => {
    const { cookie } = await lend();
    const out = await request(t.app).post('/api/auth/logout').set('Cookie', cookie);
    expect(out.body.redirectTo).toBe('/tablet');
    const after = cookieOf(out);
    const state = await request(t.app).get('/api/tablet').set('Cookie', after);
    expect(state.body.phase).toBe('signing');
    const login = new URL((await request(t.app).get('/api/auth/login').set('Cookie', after)).headers.location as string);
    expect(login.searchParams.get('prompt')).toBe('login');
  });

  it('after "I don\'t want to sign", the form cannot be signed from the tablet any more', async () => {
    const { cookie, requestId } = await lend();
    const state = await request(t.app).get('/api/tablet').set('Cookie', cookie);
    expect((await request(t.app).post('/api/tablet/decline').set('Cookie', cookie)).status).toBe(200);
    const res = await request(t.app).post('/api/tablet/submit').set('Cookie', cookie).send({ templateVersionId: state.body.form.template.versionId, idempotencyKey: state.body.idempotencyKey, signerName: 'Someone Else', agreed: true, answers: { wear_hours: 'Up to 4 hours' }, signaturePng: await drawnSignature() });
    expect(res.status).toBe(409);
    const made = await t.db.db.selectFrom('consents').select('id').where('request_id', '=', requestId).execute();
    expect(made).toEqual([]);
  });

  it('refuses a submission key other than the one the tablet was given', async () => {
    const { cookie } = await lend();
    const state = await request(t.app).get('/api/tablet').set('Cookie', cookie);
    const res = await request(t.app).post('/api/tablet/submit').set('Cookie', cookie).send({ templateVersionId: state.body.form.template.versionId, idempotencyKey: randomUUID(), signerName: 'Cory Ashdown', agreed: true, answers: { wear_hours: 'Up to 4 hours' }, signaturePng: await drawnSignature() });
    expect(res.status).toBe(400);
  });
});

describe('the Outbox', () => {
  it('shows that a signing link went out, never the link itself', async () => {
    const head = await t.sessionFor('head@plinth.test');
    const pid = (await performerId('Tamsin Achebe-Lowry')).id;
    await request(t.app).post('/api/signing-requests').set('Cookie', head).send({ performerId: pid, templateId: await templateId('life_casting'), productionId: production, mode: 'link' });
    const files = (await fs.readdir(t.mail.dir)).filter((f) => f.endsWith('.eml')).sort();
    const raw = await simpleParser(await fs.readFile(path.join(t.mail.dir, files.at(-1)!)));
    const token = /\/sign\/([A-Za-z0-9_-]{40,60})/.exec(raw.text ?? '')![1]!;
    const admin = await t.sessionFor('admin@plinth.test');
    const one = await request(t.app).get(`/api/outbox/${files.at(-1)}`).set('Cookie', admin);
    expect(one.status).toBe(200);
    expect(one.body.text).toContain('/sign/[link withheld]');
    expect(one.body.text).not.toContain(token);
  });
});

describe('withdrawal reasons', () => {
  it('reading one is a medical read, written to the audit log', async () => {
    const lead = await t.sessionFor('lead@plinth.test');
    // Bea's life-casting consent was withdrawn with a reason (demo data).
    const bea = (await performerId('Beatrix Nwachukwu')).id;
    const c = await t.db.db.selectFrom('consents').select('id').where('performer_id', '=', bea).where('withdrawn_at', 'is not', null).executeTakeFirstOrThrow();
    const before = await t.db.db.selectFrom('audit_log').select('id').where('action', '=', 'medical.read').where('entity_id', '=', c.id).execute();
    const res = await request(t.app).get(`/api/consents/${c.id}`).set('Cookie', lead);
    expect(res.body.withdrawalReason).toBe('No longer comfortable with face casting');
    const after = await t.db.db.selectFrom('audit_log').select('id').where('action', '=', 'medical.read').where('entity_id', '=', c.id).execute();
    expect(after.length).toBe(before.length + 1);
    const head = await request(t.app).get(`/api/consents/${c.id}`).set('Cookie', await t.sessionFor('head@plinth.test'));
    expect(head.body.withdrawalReason).toBeNull();
  });
});

describe('error replies carry no internals', () => {
  it('a duplicate does not name the database constraint', async () => {
    const { toApiError } = await import('../../api/http/errors.ts');
    const e = toApiError(Object.assign(new Error('dup'), { code: '23505', constraint: 'users_email_key' }));
    expect(JSON.stringify(e.details ?? {})).not.toContain('users_email_key');
  });
});

describe('a production sees its own consents, and imports pull in no strangers', () => {
  it('a head and lead of another production, where the performer is also engaged, see none of this production\'s consents', async () => {
    const db = t.db.db;
    const ashfall = await db.insertInto('productions').values({ name: 'Ashfall Quay', kind: 'film' }).returning('id').executeTakeFirstOrThrow();
    const soloHead = await db.insertInto('users').values({ email: 'solo.head@plinth.test', display_name: 'Solo Head' }).returning('id').executeTakeFirstOrThrow();
    const soloLead = await db.insertInto('users').values({ email: 'solo.lead@plinth.test', display_name: 'Solo Lead' }).returning('id').executeTakeFirstOrThrow();
    await db.insertInto('memberships').values([{ user_id: soloHead.id, production_id: ashfall.id, role: 'head' }, { user_id: soloLead.id, production_id: ashfall.id, role: 'artist' }]).execute();
    await db.insertInto('lead_appointments').values({ production_id: ashfall.id, user_id: soloLead.id }).execute();
    const juno = await performerId('Juno Castellane');
    await db.insertInto('engagements').values({ performer_id: juno.id, production_id: ashfall.id, character_name: 'Cameo' }).execute();
    const lanternConsent = (await db.selectFrom('consents').select('id').where('performer_id', '=', juno.id).where('kind', '=', 'patch_testing').executeTakeFirstOrThrow()).id;

    for (const email of ['solo.head@plinth.test', 'solo.lead@plinth.test']) {
      const cookie = await t.sessionFor(email);
      const detail = await request(t.app).get(`/api/performers/${juno.id}`).set('Cookie', cookie);
      expect(detail.status).toBe(200);
      expect(detail.body.consents).toEqual([]);
      const list = await request(t.app).get(`/api/consents?performerId=${juno.id}`).set('Cookie', cookie);
      expect(list.body.items).toEqual([]);
      expect((await request(t.app).get(`/api/consents/${lanternConsent}`).set('Cookie', cookie)).status, email).toBe(403);
      expect((await request(t.app).get(`/api/consents/${lanternConsent}/pdf`).set('Cookie', cookie)).status, email).toBe(403);
    }
    // The Lantern Keeper's own lead still reads it.
    expect((await request(t.app).get(`/api/consents/${lanternConsent}`).set('Cookie', await t.sessionFor('lead@plinth.test'))).status).toBe(200);

    // An import into Ashfall Quay cannot pull in a performer its head does not already work with.
    const halvard = await db.selectFrom('performers').select('email').where('legal_name', '=', 'Halvard Imre Solberg').executeTakeFirstOrThrow();
    const csv = `legal_name,email\nHalvard Imre Solberg,${halvard.email}\n`;
    const preview = await request(t.app).post(`/api/performers/import?productionId=${ashfall.id}&commit=false`).set('Cookie', await t.sessionFor('solo.head@plinth.test')).attach('file', Buffer.from(csv), { filename: 'p.csv', contentType: 'text/csv' });
    expect(preview.status).toBe(200);
    expect(preview.body.errorCount).toBe(1);
    expect(preview.body.rows[0].errors.email[0]).toMatch(/you do not manage/);
    // …while Juno, whom this head already works with, may be listed again without error.
    const again = await request(t.app).post(`/api/performers/import?productionId=${ashfall.id}&commit=false`).set('Cookie', await t.sessionFor('solo.head@plinth.test')).attach('file', Buffer.from('legal_name,email\nJuno Castellane,performer@plinth.test\n'), { filename: 'p.csv', contentType: 'text/csv' });
    expect(again.body.errorCount).toBe(0);
    expect(again.body.rows[0].action).toBe('already_engaged');
  });
});
