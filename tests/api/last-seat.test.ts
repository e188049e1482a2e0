import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SessionSchema } from '#shared/schemas/session.ts';
import { DEMO_PASSWORD } from '../../fake-idp/accounts.ts';
import { type RunningIdp, startIdp } from '../../fake-idp/server.ts';
import { createTestApp, type TestApp } from '../support/app.ts';
import { signInAtIdp } from '../support/oidc-flow.ts';

const ORIGIN = 'http://127.0.0.1:3998';
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
  const c = ([] as string[]).concat(res.headers['set-cookie'] ?? []).find((l) => l.startsWith('plinth.sid='));
  if (!c) throw new Error('no session cookie set');
  return c.split(';')[0]!;
}

/** A whole sign-in through the identity provider; answers the new session's cookie. */
async function signIn(email: string): Promise<string> {
  const login = await request(t.app).get('/api/auth/login');
  const { callbackUrl } = await signInAtIdp(login.headers.location as string, idp.issuer, email, DEMO_PASSWORD);
  const cb = await request(t.app).get(callbackUrl.slice(ORIGIN.length)).set('Cookie', sessionCookie(login));
  expect(cb.status).toBe(302);
  return sessionCookie(cb);
}

async function current(cookie: string) {
  const res = await request(t.app).get('/api/session').set('Cookie', cookie);
  expect(res.status).toBe(200);
  return SessionSchema.parse(res.body).current;
}

async function ids() {
  const productions = await t.db.db.selectFrom('productions').select(['id', 'name']).execute();
  const byName = (name: string) => productions.find((p) => p.name === name)!.id;
  const archivist = await t.db.db.selectFrom('users').select('id').where('email', '=', 'archivist@plinth.test').executeTakeFirstOrThrow();
  return { lantern: byName('The Lantern Keeper'), saltglass: byName('Saltglass Mile'), archivistId: archivist.id };
}

describe('where a sign-in lands', () => {
  it('puts the archivist on the production of their latest work in the audit log', async () => {
    const { lantern, saltglass, archivistId } = await ids();
    for (const productionId of [lantern, saltglass]) {
      await t.db.db
        .insertInto('audit_log')
        .values({ actor_user_id: archivistId, action: 'cast.update', entity_type: 'cast', production_id: productionId, details: '{}' })
        .execute();
      expect(await current(await signIn('archivist@plinth.test'))).toMatchObject({ productionId, role: 'archivist' });
    }
  });

  it('puts a person back on the production and role they last chose, over the audit log', async () => {
    const { lantern, saltglass } = await ids();
    const first = await signIn('head@plinth.test');
    expect(await current(first)).toMatchObject({ productionId: lantern, role: 'head' });
    const put = await request(t.app).put('/api/session/current').set('Cookie', first).set('Origin', ORIGIN).send({ productionId: saltglass, role: 'artist' });
    expect(put.status).toBe(200);
    const again = await signIn('head@plinth.test');
    expect(await current(again)).toMatchObject({ productionId: saltglass, role: 'artist' });
  });

  it('falls back to the most responsible seat once the remembered one is no longer held', async () => {
    const { lantern, saltglass } = await ids();
    const head = await t.db.db.selectFrom('users').select('id').where('email', '=', 'head@plinth.test').executeTakeFirstOrThrow();
    await t.db.db.deleteFrom('memberships').where('user_id', '=', head.id).where('production_id', '=', saltglass).execute();
    expect(await current(await signIn('head@plinth.test'))).toMatchObject({ productionId: lantern, role: 'head' });
  });
});
