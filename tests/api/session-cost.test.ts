import type { Request, Response } from 'express';
import type pg from 'pg';
import request from 'supertest';
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { loadActor } from '../../api/http/actor.ts';
import { SessionStore } from '../../api/http/session.ts';
import { PREPARE_MAX_PARAMS } from '../../api/db/index.ts';
import { WORD_SIMILARITY_INDEX_CUTOFF, WORD_SIMILARITY_THRESHOLD } from '../../api/db/index.ts';
import { allRoutes } from '../../api/routes.ts';
import { createTestApp, type TestApp } from '../support/app.ts';

let t: TestApp;
let counter: ReturnType<typeof countStatements>;

/** Counts every statement this pool's clients send to PostgreSQL while `during` runs. */
function countStatements(pool: pg.Pool) {
  const wrapped = new WeakSet<object>();
  let log: string[] | null = null;
  pool.on('acquire', (client) => {
    if (wrapped.has(client)) return;
    wrapped.add(client);
    const query = client.query.bind(client) as (...args: unknown[]) => unknown;
    client.query = ((...args: unknown[]) => {
      log?.push(typeof args[0] === 'string' ? args[0] : String((args[0] as { text?: string }).text));
      return query(...args);
    }) as typeof client.query;
  });
  return {
    async during(fn: () => Promise<unknown>): Promise<string[]> {
      log = [];
      try {
        await fn();
        return log;
      } finally {
        log = null;
      }
    },
  };
}

const touchesSessions = (s: string) => /\bsessions\b/.test(s);
const writes = (s: string) => /^\s*(update|insert|delete)\b/i.test(s);

async function productionId(name: string): Promise<string> {
  return (await t.db.db.selectFrom('productions').select('id').where('name', '=', name).executeTakeFirstOrThrow()).id;
}
async function performerId(legalName: string): Promise<string> {
  return (await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', legalName).executeTakeFirstOrThrow()).id;
}
async function sessionOf(cookie: string) {
  const res = await request(t.app).get('/api/session').set('Cookie', cookie);
  expect(res.status).toBe(200);
  return res.body as { memberships: { productionId: string; role: string }[]; leadOf: string[]; performerIds: string[]; user: { isAdmin: boolean } };
}
function sidOf(cookie: string): string {
  return decodeURIComponent(cookie.split('=')[1]!).slice(2).split('.')[0]!;
}
/** The stored expiry of the session behind this cookie, in ms since the epoch. */
async function storedExpiry(cookie: string): Promise<number | null> {
  const sid = sidOf(cookie);
  const { rows } = await t.db.pool.query<{ ms: string }>('select extract(epoch from expire::timestamptz) * 1000 as ms from sessions where sid = $1', [sid]);
  return rows[0] ? Number(rows[0].ms) : null;
}

beforeAll(async () => {
  t = await createTestApp();
  counter = countStatements(t.db.pool);
});
afterAll(async () => {
  await t?.close();
});
afterEach(() => {
  vi.useRealTimers();
});

describe('round trips of a signed-in read', () => {
  it('GET /api/session: one statement, the session with its actor and profile', async () => {
    const cookie = await t.sessionFor('head@plinth.test');
    expect((await request(t.app).get('/api/session').set('Cookie', cookie)).status).toBe(200);
    let status = 0;
    const statements = await counter.during(async () => {
      status = (await request(t.app).get('/api/session').set('Cookie', cookie)).status;
    });
    expect(status).toBe(200);
    expect(statements).toHaveLength(1);
    expect(statements.filter(touchesSessions)).toHaveLength(1);
    expect(statements.filter(writes)).toEqual([]);
  });

  it('GET /api/users/:id (a primary-key read): at most two statements after the first request', async () => {
    const cookie = await t.sessionFor('admin@plinth.test');
    const id = await t.userId('head@plinth.test');
    expect((await request(t.app).get(`/api/users/${id}`).set('Cookie', cookie)).status).toBe(200);
    const statements = await counter.during(() => request(t.app).get(`/api/users/${id}`).set('Cookie', cookie).expect(200));
    expect(statements.length).toBeLessThanOrEqual(2);
    expect(statements.filter(writes)).toEqual([]);
  });

  it('GET /api/health, even with a signed-in session: the health check alone, no session read or cookie', async () => {
    const cookie = await t.sessionFor('head@plinth.test');
    await request(t.app).get('/api/health').set('Cookie', cookie).expect(200);
    let setCookie: unknown;
    const statements = await counter.during(async () => {
      setCookie = (await request(t.app).get('/api/health').set('Cookie', cookie).expect(200)).headers['set-cookie'];
    });
    expect(statements).toEqual(['select 1']);
    expect(setCookie).toBeUndefined();
    // The session itself is untouched: the next signed-in read still finds it.
    expect((await request(t.app).get('/api/session').set('Cookie', cookie)).status).toBe(200);
  });

  it('GET /api/performers/:id: two statements in all, the session and the whole record', async () => {
    const cookie = await t.sessionFor('head@plinth.test');
    const id = await performerId('Juno Castellane');
    await request(t.app).get(`/api/performers/${id}`).set('Cookie', cookie).expect(200);
    const viaHttp = await counter.during(() => request(t.app).get(`/api/performers/${id}`).set('Cookie', cookie).expect(200));

    const route = allRoutes.find((r) => r.method === 'get' && r.path === '/api/performers/:id')!;
    const { actor } = (await loadActor(t.ctx.db, await t.userId('head@plinth.test')))!;
    const req = { session: {} } as unknown as Request;
    const res = {} as Response;
    const byItself = await counter.during(() => route.handler({ req, res, ctx: t.ctx, actor, params: { id }, query: undefined, body: undefined }));
    // The whole page (engagements, consents, sessions, linked sign-in) is one statement.
    expect(byItself).toHaveLength(1);
    expect(viaHttp).toHaveLength(byItself.length + 1);
    expect(viaHttp.filter(touchesSessions)).toHaveLength(1);
  });

  it("the lead's home: its counts in one statement, and each list of sessions brings the consents its gate reads", async () => {
    const cookie = await t.sessionFor('lead@plinth.test');
    await request(t.app).get('/api/home').set('Cookie', cookie).expect(200);
    const statements = await counter.during(() => request(t.app).get('/api/home').set('Cookie', cookie).expect(200));
    // Expiring consents, open signing links, withdrawals not yet seen (with the last look) and performers engaged.
    const counts = statements.filter((s) => /\bsigning_requests\b/.test(s));
    expect(counts).toHaveLength(1);
    expect(counts[0]).toMatch(/\bstaff_seen\b/);
    expect(counts[0]).toMatch(/\bengagements\b/);
    expect(statements.filter((s) => /\bstaff_seen\b/.test(s))).toHaveLength(1);
    // No read of consents by performer ids after the sessions and tests are listed.
    expect(statements.filter((s) => s.trim().startsWith('select "performer_id", "production_id", "kind"'))).toEqual([]);
    // The session, the counts, the sessions, the tests under reading, the booked tests, and the appliance
    // outlook (at most three); the seat comes from the kept roles, with no read of production names.
    expect(statements.length).toBeLessThanOrEqual(8);
    expect(statements.filter((s) => /\bproductions\b/.test(s) && /json_agg/.test(s))).toEqual([]);
    expect(statements.filter(writes)).toEqual([]);
  });

  it('the first request reads the actor in one statement and keeps it with the session', async () => {
    const cookie = await t.sessionFor('lead@plinth.test');
    const first = await counter.during(() => request(t.app).get('/api/session').set('Cookie', cookie).expect(200));
    // session read, actor read (with the profile), actor kept
    expect(first).toHaveLength(3);
    expect(first.filter((s) => touchesSessions(s) && writes(s))).toHaveLength(1);
  });
});

describe('the session screen shows a changed name on the very next request', () => {
  it("the user's own name and address, changed by any path", async () => {
    const cookie = await t.sessionFor('archivist@plinth.test');
    const id = await t.userId('archivist@plinth.test');
    const before = (await request(t.app).get('/api/session').set('Cookie', cookie).expect(200)).body as { user: { displayName: string; email: string } };
    await request(t.app).get('/api/session').set('Cookie', cookie).expect(200);
    await t.db.db.updateTable('users').set({ display_name: 'Marisol Vantongeren', email: 'archive.desk@plinth.test' }).where('id', '=', id).execute();
    const after = (await request(t.app).get('/api/session').set('Cookie', cookie).expect(200)).body as { user: { displayName: string; email: string } };
    expect(after.user).toMatchObject({ displayName: 'Marisol Vantongeren', email: 'archive.desk@plinth.test' });
    await t.db.db.updateTable('users').set({ display_name: before.user.displayName, email: before.user.email }).where('id', '=', id).execute();
    expect(((await request(t.app).get('/api/session').set('Cookie', cookie).expect(200)).body as typeof before).user).toMatchObject(before.user);
  });

  it("a production's name, for its members and its lead, and no one else's stamp moves", async () => {
    const lantern = await productionId('The Lantern Keeper');
    const artist = await t.sessionFor('artist@plinth.test');
    const lead = await t.sessionFor('lead@plinth.test');
    const nameIn = async (cookie: string) => ((await request(t.app).get('/api/session').set('Cookie', cookie).expect(200)).body as { seats: { productionId: string | null; productionName: string | null }[] }).seats.find((x) => x.productionId === lantern)?.productionName;
    const old = await nameIn(artist);
    expect(old).toBe('The Lantern Keeper');
    expect(await nameIn(lead)).toBe(old);
    const stampOf = async (email: string) => (await t.db.db.selectFrom('users').select('access_version').where('email', '=', email).executeTakeFirstOrThrow()).access_version;
    const outsider = await stampOf('admin@plinth.test');
    await t.db.db.updateTable('productions').set({ name: 'The Lantern Keeper (second unit)' }).where('id', '=', lantern).execute();
    try {
      expect(await nameIn(artist)).toBe('The Lantern Keeper (second unit)');
      expect(await nameIn(lead)).toBe('The Lantern Keeper (second unit)');
      expect(await stampOf('admin@plinth.test')).toBe(outsider);
    } finally {
      await t.db.db.updateTable('productions').set({ name: 'The Lantern Keeper' }).where('id', '=', lantern).execute();
    }
    expect(await nameIn(artist)).toBe('The Lantern Keeper');
  });
});

describe('a changed role takes effect on the very next request of the same session', () => {
  it('a membership removed by the administrator', async () => {
    const artist = await t.sessionFor('artist@plinth.test');
    const admin = await t.sessionFor('admin@plinth.test');
    const lantern = await productionId('The Lantern Keeper');
    const juno = await performerId('Juno Castellane');
    expect((await sessionOf(artist)).memberships).toEqual([{ productionId: lantern, role: 'artist' }]);
    await request(t.app).get(`/api/performers/${juno}`).set('Cookie', artist).expect(200);

    const membership = await t.db.db.selectFrom('memberships').select('id').where('user_id', '=', await t.userId('artist@plinth.test')).where('production_id', '=', lantern).executeTakeFirstOrThrow();
    await request(t.app).delete(`/api/productions/${lantern}/memberships/${membership.id}`).set('Cookie', admin).set('Origin', t.config.appOrigin).expect(200);

    expect((await request(t.app).get(`/api/performers/${juno}`).set('Cookie', artist)).status).toBe(403);
    expect((await sessionOf(artist)).memberships).toEqual([]);
  });

  it('a membership deleted in the database by any other path', async () => {
    const archivist = await t.sessionFor('archivist@plinth.test');
    const saltglass = await productionId('Saltglass Mile');
    expect((await sessionOf(archivist)).memberships.map((m) => m.productionId)).toContain(saltglass);
    await t.db.db.deleteFrom('memberships').where('user_id', '=', await t.userId('archivist@plinth.test')).where('production_id', '=', saltglass).execute();
    expect((await sessionOf(archivist)).memberships.map((m) => m.productionId)).not.toContain(saltglass);
  });

  it('a lead appointment ended by the administrator', async () => {
    const lead = await t.sessionFor('lead@plinth.test');
    const admin = await t.sessionFor('admin@plinth.test');
    const lantern = await productionId('The Lantern Keeper');
    const juno = await performerId('Juno Castellane');
    expect((await sessionOf(lead)).leadOf).toEqual([lantern]);
    expect((await request(t.app).get(`/api/performers/${juno}`).set('Cookie', lead)).body.canSeeMedical).toBe(true);

    const { version } = await t.db.db.selectFrom('productions').select('version').where('id', '=', lantern).executeTakeFirstOrThrow();
    await request(t.app).delete(`/api/productions/${lantern}/lead?version=${version}`).set('Cookie', admin).set('Origin', t.config.appOrigin).expect(200);

    expect((await request(t.app).get(`/api/performers/${juno}`).set('Cookie', lead)).body.canSeeMedical).toBe(false);
    expect((await sessionOf(lead)).leadOf).toEqual([]);
  });

  it('the studio-admin flag cleared', async () => {
    const deputyId = (await t.db.db.insertInto('users').values({ email: 'deputy@plinth.test', display_name: 'Deputy Admin', is_admin: true }).returning('id').executeTakeFirstOrThrow()).id;
    const deputy = await t.sessionFor('deputy@plinth.test');
    const admin = await t.sessionFor('admin@plinth.test');
    await request(t.app).get('/api/users').set('Cookie', deputy).expect(200);
    const { version } = await t.db.db.selectFrom('users').select('version').where('id', '=', deputyId).executeTakeFirstOrThrow();
    await request(t.app).patch(`/api/users/${deputyId}`).set('Cookie', admin).set('Origin', t.config.appOrigin).send({ displayName: 'Deputy Admin', isAdmin: false, version }).expect(200);

    expect((await request(t.app).get('/api/users').set('Cookie', deputy)).status).toBe(403);
    expect((await sessionOf(deputy)).user.isAdmin).toBe(false);
  });

  it('a performer record unlinked from the sign-in', async () => {
    const performer = await t.sessionFor('performer@plinth.test');
    const juno = await performerId('Juno Castellane');
    expect((await sessionOf(performer)).performerIds).toEqual([juno]);
    await t.db.db.updateTable('performers').set({ user_id: null }).where('id', '=', juno).execute();
    expect((await sessionOf(performer)).performerIds).toEqual([]);
  });

  it('a role given is there on the next request too', async () => {
    await t.db.db.insertInto('users').values({ email: 'newrole@plinth.test', display_name: 'Newly Given A Role' }).execute();
    const newcomer = await t.sessionFor('newrole@plinth.test');
    const saltglass = await productionId('Saltglass Mile');
    expect((await sessionOf(newcomer)).memberships).toEqual([]);
    await t.db.db.insertInto('memberships').values({ user_id: await t.userId('newrole@plinth.test'), production_id: saltglass, role: 'artist' }).execute();
    expect((await sessionOf(newcomer)).memberships).toEqual([{ productionId: saltglass, role: 'artist' }]);
  });

  it('a lead appointment that begins later counts once its start has passed, with nothing else changed', async () => {
    const userId = await t.userId('artist2@plinth.test');
    const cookie = await t.sessionFor('artist2@plinth.test');
    const saltglass = await productionId('Saltglass Mile');
    await t.db.pool.query(`insert into lead_appointments (production_id, user_id, starts_at, ends_at) values ($1, $2, now() + interval '1 hour', now() + interval '3 hours')`, [saltglass, userId]);
    expect((await sessionOf(cookie)).leadOf).toEqual([]);
    expect((await sessionOf(cookie)).leadOf).toEqual([]);

    // Two hours on, as the clock would see it: the appointment and the time the kept actor holds
    // until both move back together, with the triggers that mark a change switched off.
    const sid = sidOf(cookie);
    const c = await t.db.pool.connect();
    try {
      await c.query('begin');
      await c.query('set local session_replication_role = replica');
      await c.query(`update lead_appointments set starts_at = starts_at - interval '2 hours', ends_at = ends_at - interval '2 hours' where user_id = $1 and production_id = $2`, [userId, saltglass]);
      const { rowCount } = await c.query(
        `update sessions set sess = jsonb_set(sess::jsonb, '{access,validUntil}', to_jsonb((sess->'access'->>'validUntil')::timestamptz - interval '2 hours'))::json where sid = $1 and sess->'access' is not null`,
        [sid],
      );
      expect(rowCount).toBe(1);
      await c.query('commit');
    } finally {
      c.release();
    }
    expect((await sessionOf(cookie)).leadOf).toEqual([saltglass]);
  });
});

describe('the stored expiry', () => {
  it('is not rewritten by a second request within a minute, and is refreshed once a minute has passed', async () => {
    const start = Date.now();
    vi.useFakeTimers({ toFake: ['Date'], now: start });
    const cookie = await t.sessionFor('head@plinth.test');
    const written = (await storedExpiry(cookie))!;
    await request(t.app).get('/api/session').set('Cookie', cookie).expect(200);
    expect(await storedExpiry(cookie)).toBe(written);

    vi.setSystemTime(start + 30_000);
    await request(t.app).get('/api/session').set('Cookie', cookie).expect(200);
    expect(await storedExpiry(cookie)).toBe(written);

    vi.setSystemTime(start + 61_000);
    await request(t.app).get('/api/session').set('Cookie', cookie).expect(200);
    const refreshed = (await storedExpiry(cookie))!;
    // sessionFor keeps a session for an hour; the store rounds the expiry up to the whole second.
    expect(refreshed - (start + 61_000 + 3600_000)).toBeGreaterThanOrEqual(0);
    expect(refreshed - (start + 61_000 + 3600_000)).toBeLessThan(1000);

    vi.setSystemTime(start + 90_000);
    await request(t.app).get('/api/session').set('Cookie', cookie).expect(200);
    expect(await storedExpiry(cookie)).toBe(refreshed);
  });

  it('keeps a session in use alive past its first expiry, and refuses it once it has been idle that long', async () => {
    const start = Date.now();
    vi.useFakeTimers({ toFake: ['Date'], now: start });
    const cookie = await t.sessionFor('head@plinth.test');
    vi.setSystemTime(start + 50 * 60_000);
    await request(t.app).get('/api/session').set('Cookie', cookie).expect(200);
    vi.setSystemTime(start + 70 * 60_000);
    await request(t.app).get('/api/session').set('Cookie', cookie).expect(200);
    // Idle for the whole lifetime (an hour) since that last request.
    vi.setSystemTime(start + 130 * 60_000 + 1000);
    const res = await request(t.app).get('/api/session').set('Cookie', cookie);
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('unauthenticated');
  });

  it('refuses a session left idle for its lifetime', async () => {
    const start = Date.now();
    vi.useFakeTimers({ toFake: ['Date'], now: start });
    const cookie = await t.sessionFor('head@plinth.test');
    await request(t.app).get('/api/session').set('Cookie', cookie).expect(200);
    vi.setSystemTime(start + 3600_000 + 1000);
    expect((await request(t.app).get('/api/session').set('Cookie', cookie)).status).toBe(401);
    expect((await request(t.app).get('/api/performers').set('Cookie', cookie)).status).toBe(401);
  });
});

describe('the lent tablet', () => {
  it('keeps neither the staff member nor their actor in the stored session, even when a request that began before tries to keep it', async () => {
    const cookie = await t.sessionFor('head@plinth.test');
    const headId = await t.userId('head@plinth.test');
    const lantern = await productionId('The Lantern Keeper');
    expect((await sessionOf(cookie)).memberships.length).toBeGreaterThan(0);
    const template = await t.db.db.selectFrom('consent_templates').select('id').where('kind', '=', 'application').executeTakeFirstOrThrow();
    const created = await request(t.app)
      .post('/api/signing-requests')
      .set('Cookie', cookie)
      .send({ performerId: await performerId('Juno Castellane'), templateId: template.id, productionId: lantern, mode: 'tablet' })
      .expect(201);
    await request(t.app).post(`/api/signing-requests/${created.body.id}/hand-over`).set('Cookie', cookie).expect(200);

    const stored = async () => (await t.db.pool.query<{ sess: Record<string, unknown> }>('select sess from sessions where sid = $1', [sidOf(cookie)])).rows[0]!.sess;
    expect(await stored()).toMatchObject({ tablet: { phase: 'signing', staffUserId: headId } });
    expect(await stored()).not.toHaveProperty('userId');
    expect(await stored()).not.toHaveProperty('access');

    // What a request still running with the staff member's session would write once its actor is read.
    const late = (await loadActor(t.ctx.db, headId))!;
    await new SessionStore(t.db.pool, { pruneSessionInterval: false }).keepAccess(sidOf(cookie), headId, late);
    expect(await stored()).not.toHaveProperty('access');
    const res = await request(t.app).get('/api/session').set('Cookie', cookie);
    expect(res.status).toBe(401);
    expect(res.body.error.details.tablet).toBe('signing');
  });
});

describe('what every connection starts with', () => {
  it('JIT off and the name search’s trigram cut-off, so no search needs a transaction to set them', async () => {
    const { rows } = await t.db.pool.query<{ jit: string; cutoff: string }>("select current_setting('jit') as jit, current_setting('pg_trgm.word_similarity_threshold') as cutoff");
    // PostgreSQL shows a loaded extension's real setting to six digits; the next test pins its exact effect.
    expect(rows[0]!.jit).toBe('off');
    expect(Number(rows[0]!.cutoff)).toBeCloseTo(WORD_SIMILARITY_INDEX_CUTOFF, 6);
  });

  it('`<%` at that cut-off is exactly word_similarity() above the threshold, a similarity of the threshold itself passing neither', async () => {
    const names = ['Juno Castellane', 'Cassian Drumdlewood', 'Mireille Cassian Lincombe', 'Castor Wend', 'Orla Quillfeather', 'Thistle Thorpe', 'Bram Thistlethorpe-Vey'];
    const terms = ['castelane', 'castellane', 'thistlethorpe', 'cassian', 'quilfeather'];
    const { rows } = await t.db.pool.query<{ term: string; name: string; op: boolean; above: boolean; at: boolean }>(
      `select term, name, term <% name as op, word_similarity(term, name) > $3::real as above, word_similarity(term, name) = $3::real as at
       from unnest($1::text[]) term cross join unnest($2::text[]) name`,
      [terms, names, WORD_SIMILARITY_THRESHOLD],
    );
    expect(rows).toHaveLength(terms.length * names.length);
    for (const r of rows) expect({ term: r.term, name: r.name, op: r.op }).toEqual({ term: r.term, name: r.name, op: r.above });
    // The edge is there to be tested: pairs at exactly the threshold (as a float4) and pairs above it.
    expect(rows.some((r) => r.at)).toBe(true);
    expect(rows.some((r) => r.op)).toBe(true);
  });

  it('a cast search by name is its statements alone: no begin, set or commit around them', async () => {
    const cookie = await t.sessionFor('archivist@plinth.test');
    await request(t.app).get('/api/casts?q=castellane').set('Cookie', cookie).expect(200);
    const statements = await counter.during(() => request(t.app).get('/api/casts?q=castellane').set('Cookie', cookie).expect(200));
    expect(statements.filter((s) => /^\s*(begin|commit|set)\b/i.test(s))).toEqual([]);
  });
});

describe('statements prepared once per connection', () => {
  it('a statement with parameters is prepared by its text; one without, or with a long list, goes as before', async () => {
    const client = await t.db.pool.connect();
    try {
      await client.query('select $1::int as n', [1]);
      expect((await client.query('select $1::int as n', [2])).rows).toEqual([{ n: 2 }]);
      // Several commands in one text still run (no parameters: the simple protocol).
      await client.query('select 1; select 2');
      const long = Array.from({ length: PREPARE_MAX_PARAMS + 1 }, (_, i) => `$${i + 1}::int`).join(' + ');
      await client.query(`select ${long} as n`, Array.from({ length: PREPARE_MAX_PARAMS + 1 }, () => 1));
      const { rows } = await client.query<{ name: string; statement: string }>('select name, statement from pg_prepared_statements');
      const ours = rows.filter((r) => r.name.startsWith('plinth_'));
      expect(ours.filter((r) => r.statement === 'select $1::int as n')).toHaveLength(1);
      expect(ours.some((r) => r.statement.includes('select 1; select 2'))).toBe(false);
      expect(ours.some((r) => r.statement.includes(`$${PREPARE_MAX_PARAMS + 1}`))).toBe(false);
    } finally {
      client.release();
    }
  });
});
