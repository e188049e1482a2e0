import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SessionSchema } from '#shared/schemas/session.ts';
import { DEMO_PASSWORD } from '../../fake-idp/accounts.ts';
import { type RunningIdp, startIdp } from '../../fake-idp/server.ts';
import { createTestApp, type TestApp } from '../support/app.ts';
import { signInAtIdp } from '../support/oidc-flow.ts';

const ORIGIN = 'http://127.0.0.1:3999';
let idp: RunningIdp;
let t: TestApp;

beforeAll(async () => {
  idp = await startIdp({
    port: 0,
    quiet: true,
    clients: [{ clientId: 'plinth', clientSecret: 'plinth-dev-secret', redirectUris: [`${ORIGIN}/api/auth/callback`], postLogoutRedirectUris: [`${ORIGIN}/`] }],
  });
  t = await createTestApp({ OIDC_ISSUER: idp.issuer, APP_ORIGIN: ORIGIN });
});
afterAll(async () => {
  await t?.close();
  await idp?.close();
});

function sessionCookie(res: request.Response): string {
  const set = ([] as string[]).concat(res.headers['set-cookie'] ?? []);
  const c = set.find((l) => l.startsWith('plinth.sid='));
  if (!c) throw new Error('no session cookie set');
  return c.split(';')[0]!;
}

async function startLogin(returnTo?: string) {
  const res = await request(t.app).get('/api/auth/login').query(returnTo ? { returnTo } : {});
  expect(res.status).toBe(302);
  return { authUrl: res.headers.location as string, cookie: sessionCookie(res) };
}

describe('sign-in through the identity provider (authorization code + PKCE)', () => {
  it('signs a demo user in, links their account, and rotates the session id', async () => {
    const { authUrl, cookie: preLogin } = await startLogin('/admin/users');
    const url = new URL(authUrl);
    expect(url.origin).toBe(idp.issuer);
    expect(url.searchParams.get('code_challenge_method')).toBe('S256');
    expect(url.searchParams.get('code_challenge')).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(url.searchParams.get('state')).toBeTruthy();
    expect(url.searchParams.get('nonce')).toBeTruthy();

    const { callbackUrl } = await signInAtIdp(authUrl, idp.issuer, 'head@plinth.test', DEMO_PASSWORD);
    expect(callbackUrl.startsWith(`${ORIGIN}/api/auth/callback?`)).toBe(true);

    const cb = await request(t.app).get(callbackUrl.slice(ORIGIN.length)).set('Cookie', preLogin);
    expect(cb.status).toBe(302);
    expect(cb.headers.location).toBe('/admin/users');
    const signedIn = sessionCookie(cb);
    expect(signedIn).not.toBe(preLogin);
    expect(([] as string[]).concat(cb.headers['set-cookie'] ?? []).join(';')).toMatch(/HttpOnly/i);
    expect(([] as string[]).concat(cb.headers['set-cookie'] ?? []).join(';')).toMatch(/SameSite=Lax/i);

    const me = await request(t.app).get('/api/session').set('Cookie', signedIn);
    expect(me.status).toBe(200);
    const session = SessionSchema.parse(me.body);
    expect(session.user.email).toBe('head@plinth.test');
    expect(session.current?.role).toBe('head');
    // The pre-sign-in session id no longer signs anyone in.
    expect((await request(t.app).get('/api/session').set('Cookie', preLogin)).status).toBe(401);

    const user = await t.db.db.selectFrom('users').selectAll().where('email', '=', 'head@plinth.test').executeTakeFirstOrThrow();
    expect(user.oidc_subject).toBe('demo-head-0001');
    expect(user.oidc_issuer).toBe(idp.issuer);
  });

  it('lets a person unknown to Plinth in with no seats (the "no access yet" case)', async () => {
    const { authUrl, cookie } = await startLogin();
    const { callbackUrl } = await signInAtIdp(authUrl, idp.issuer, 'newcomer@plinth.test', DEMO_PASSWORD);
    const cb = await request(t.app).get(callbackUrl.slice(ORIGIN.length)).set('Cookie', cookie);
    expect(cb.status).toBe(302);
    const me = SessionSchema.parse((await request(t.app).get('/api/session').set('Cookie', sessionCookie(cb))).body);
    expect(me.seats).toEqual([]);
    expect(me.current).toBeNull();
    expect((await request(t.app).get('/api/users').set('Cookie', sessionCookie(cb))).status).toBe(403);
  });

  it('links a performer whose confirmed e-mail is the verified e-mail of the sign-in, with the performer role', async () => {
    const performer = await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', 'Halvard Imre Solberg').executeTakeFirstOrThrow();
    // The newcomer has no role yet: a sign-in with no staff role may stand for a performer; the performer confirmed the address.
    await t.db.db.updateTable('performers').set({ email: 'newcomer@plinth.test', email_confirmed_at: new Date() }).where('id', '=', performer.id).execute();
    const { authUrl, cookie } = await startLogin();
    const { callbackUrl } = await signInAtIdp(authUrl, idp.issuer, 'newcomer@plinth.test', DEMO_PASSWORD);
    const cb = await request(t.app).get(callbackUrl.slice(ORIGIN.length)).set('Cookie', cookie);
    const me = SessionSchema.parse((await request(t.app).get('/api/session').set('Cookie', sessionCookie(cb))).body);
    expect(me.performerIds).toEqual([performer.id]);
    expect(me.seats.some((s) => s.role === 'performer' && s.productionName === 'The Lantern Keeper')).toBe(true);
    const own = await request(t.app).get(`/api/performers/${performer.id}`).set('Cookie', sessionCookie(cb));
    expect(own.status).toBe(200);
  });

  it('refuses a callback whose state does not match: 401, no user, no signed-in session', async () => {
    const users = await t.db.db.selectFrom('users').select((eb) => eb.fn.countAll<string>().as('n')).executeTakeFirstOrThrow();
    const { authUrl, cookie } = await startLogin();
    const { callbackUrl } = await signInAtIdp(authUrl, idp.issuer, 'artist@plinth.test', DEMO_PASSWORD);
    const forged = new URL(callbackUrl);
    forged.searchParams.set('state', 'not-the-state-we-sent');
    const cb = await request(t.app).get(forged.pathname + forged.search).set('Cookie', cookie);
    expect(cb.status).toBe(401);
    expect(cb.text).toContain('Back to sign in');
    expect((await request(t.app).get('/api/session').set('Cookie', cookie)).status).toBe(401);
    const after = await t.db.db.selectFrom('users').select((eb) => eb.fn.countAll<string>().as('n')).executeTakeFirstOrThrow();
    expect(after.n).toBe(users.n);
    const artist = await t.db.db.selectFrom('users').select('oidc_subject').where('email', '=', 'artist@plinth.test').executeTakeFirstOrThrow();
    expect(artist.oidc_subject).toBeNull();
  });

  it('refuses a callback that arrives with no sign-in in progress', async () => {
    const { authUrl } = await startLogin();
    const { callbackUrl } = await signInAtIdp(authUrl, idp.issuer, 'artist@plinth.test', DEMO_PASSWORD);
    const cb = await request(t.app).get(callbackUrl.slice(ORIGIN.length));
    expect(cb.status).toBe(401);
  });

  it('refuses a callback replayed against a session whose nonce differs', async () => {
    const first = await startLogin();
    const second = await startLogin();
    const { callbackUrl } = await signInAtIdp(first.authUrl, idp.issuer, 'artist@plinth.test', DEMO_PASSWORD);
    // The code and state belong to the first attempt; the second session expects other values.
    const cb = await request(t.app).get(callbackUrl.slice(ORIGIN.length)).set('Cookie', second.cookie);
    expect(cb.status).toBe(401);
  });

  it('rejects a wrong password at the identity provider', async () => {
    const { authUrl } = await startLogin();
    const result = await signInAtIdp(authUrl, idp.issuer, 'head@plinth.test', 'wrong-password');
    expect(result.callbackUrl).toBe('');
    expect(result.status).toBe(401);
    expect(result.body).toContain('Email or password is not right.');
  });

  it('refuses a returnTo that leaves the site', async () => {
    const res = await request(t.app).get('/api/auth/login').query({ returnTo: '//evil.test/' });
    expect(res.status).toBe(400);
  });

  it('signs out: the session ends and the identity provider logout URL comes back', async () => {
    const { authUrl, cookie } = await startLogin();
    const { callbackUrl } = await signInAtIdp(authUrl, idp.issuer, 'archivist@plinth.test', DEMO_PASSWORD);
    const cb = await request(t.app).get(callbackUrl.slice(ORIGIN.length)).set('Cookie', cookie);
    const signedIn = sessionCookie(cb);
    const out = await request(t.app).post('/api/auth/logout').set('Cookie', signedIn);
    expect(out.status).toBe(200);
    const redirect = new URL(out.body.redirectTo);
    expect(redirect.origin).toBe(idp.issuer);
    expect(redirect.searchParams.get('post_logout_redirect_uri')).toBe(`${ORIGIN}/`);
    expect(redirect.searchParams.get('id_token_hint')).toBeTruthy();
    expect((await request(t.app).get('/api/session').set('Cookie', signedIn)).status).toBe(401);
  });
});

describe('when the identity provider is down', () => {
  it('answers sign-in with 503 in the error shape', async () => {
    const t2 = await createTestApp({ OIDC_ISSUER: 'http://127.0.0.1:9', APP_ORIGIN: ORIGIN }, { seed: false });
    try {
      const res = await request(t2.app).get('/api/auth/login');
      expect(res.status).toBe(503);
      expect(res.body.error.code).toBe('unavailable');
    } finally {
      await t2.close();
    }
  });
});
