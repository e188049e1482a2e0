import { createHmac, randomBytes } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SESSION_COOKIE } from '../../api/http/session.ts';
import { createTestApp, TEST_SESSION_SECRET, type TestApp } from '../support/app.ts';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  await t?.close();
});

/** A stored session with chosen contents, as the store itself would have written it. */
async function rawSession(email: string, extra: Record<string, unknown>): Promise<string> {
  const sid = randomBytes(24).toString('base64url');
  const expires = new Date(Date.now() + 3600_000);
  const sess = { cookie: { originalMaxAge: 3600_000, expires: expires.toISOString(), httpOnly: true, path: '/', sameSite: 'lax' }, userId: await t.userId(email), ...extra };
  await t.db.db.insertInto('sessions').values({ sid, sess: JSON.stringify(sess), expire: expires }).execute();
  const sig = createHmac('sha256', TEST_SESSION_SECRET).update(sid).digest('base64').replace(/=+$/, '');
  return `${SESSION_COOKIE}=${encodeURIComponent(`s:${sid}.${sig}`)}`;
}

describe('how long a sign-in lasts', () => {
  it('defaults: 30 minutes idle, 12 hours at most, 10 minutes on the lent tablet', () => {
    expect(t.config.sessionTtlMs).toBe(30 * 60_000);
    expect(t.config.sessionMaxMs).toBe(12 * 3600_000);
    expect(t.config.tabletIdleMs).toBe(10 * 60_000);
  });

  it('a busy session still ends at the absolute limit', async () => {
    const fresh = await rawSession('artist@plinth.test', { signedInAt: Date.now() - 60_000 });
    expect((await request(t.app).get('/api/session').set('Cookie', fresh)).status).toBe(200);
    const old = await rawSession('artist@plinth.test', { signedInAt: Date.now() - 12 * 3600_000 - 60_000 });
    expect((await request(t.app).get('/api/session').set('Cookie', old)).status).toBe(401);
    // And it stays ended: the sign-in was taken out of the session.
    expect((await request(t.app).get('/api/session').set('Cookie', old)).status).toBe(401);
    const undated = await rawSession('artist@plinth.test', {});
    expect((await request(t.app).get('/api/session').set('Cookie', undated)).status).toBe(401);
  });

  it('the lent tablet keeps its session a shorter time', async () => {
    const cookie = await t.sessionFor('head@plinth.test');
    const production = (await t.db.db.selectFrom('productions').select('id').where('name', '=', 'The Lantern Keeper').executeTakeFirstOrThrow()).id;
    const performer = (await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', 'Oswin Parfitt-Reyes').executeTakeFirstOrThrow()).id;
    const template = (await t.db.db.selectFrom('consent_templates').select('id').where('kind', '=', 'application').executeTakeFirstOrThrow()).id;
    const r = await request(t.app).post('/api/signing-requests').set('Cookie', cookie).send({ performerId: performer, templateId: template, productionId: production, mode: 'tablet' });
    const before = Date.now();
    await request(t.app).post(`/api/signing-requests/${r.body.id}/hand-over`).set('Cookie', cookie).expect(200);
    const sid = decodeURIComponent(cookie.split('=')[1]!).slice(2).split('.')[0]!;
    const row = await t.db.db.selectFrom('sessions').select(['expire']).where('sid', '=', sid).executeTakeFirstOrThrow();
    const left = new Date(row.expire).getTime() - before;
    expect(left).toBeLessThanOrEqual(10 * 60_000 + 2000);
    expect(left).toBeGreaterThan(9 * 60_000);
  });
});

describe('ending every session of a user', () => {
  it('signs the person out on every device at once; only an administrator may', async () => {
    const tablet = await t.sessionFor('artist@plinth.test');
    const laptop = await t.sessionFor('artist@plinth.test');
    const other = await t.sessionFor('archivist@plinth.test');
    for (const c of [tablet, laptop, other]) expect((await request(t.app).get('/api/session').set('Cookie', c)).status).toBe(200);
    const artist = await t.userId('artist@plinth.test');
    expect((await request(t.app).post(`/api/users/${artist}/sessions/end`).set('Cookie', await t.sessionFor('head@plinth.test'))).status).toBe(403);
    const res = await request(t.app).post(`/api/users/${artist}/sessions/end`).set('Cookie', await t.sessionFor('admin@plinth.test'));
    expect(res.status).toBe(200);
    expect(res.body.ended).toBeGreaterThanOrEqual(2);
    expect((await request(t.app).get('/api/session').set('Cookie', tablet)).status).toBe(401);
    expect((await request(t.app).get('/api/session').set('Cookie', laptop)).status).toBe(401);
    // Nobody else is touched.
    expect((await request(t.app).get('/api/session').set('Cookie', other)).status).toBe(200);
    const audit = await t.db.db.selectFrom('audit_log').select('details').where('action', '=', 'user.sessions_end').where('entity_id', '=', artist).executeTakeFirstOrThrow();
    expect(audit.details).toMatchObject({ ended: res.body.ended });
  });
});
