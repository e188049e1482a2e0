import { readFileSync, readdirSync } from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ErrorBodySchema } from '#shared/errors.ts';
import { allRoutes } from '../../api/routes.ts';
import { createTestApp, type TestApp } from '../support/app.ts';
import { concretePath } from '../support/routes.ts';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  await t?.close();
});

describe('GET /api/health', () => {
  it('answers 200 with the database reachable', async () => {
    const res = await request(t.app).get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ status: 'ok', database: 'ok' });
  });
});

describe('every route that needs a session', () => {
  const sessionRoutes = allRoutes.filter((r) => r.auth === 'session');
  it('covers the admin and session routes', () => {
    expect(sessionRoutes.length).toBeGreaterThan(10);
  });
  for (const route of sessionRoutes) {
    it(`${route.method.toUpperCase()} ${route.path} answers 401 in the error shape without a session`, async () => {
      const res = await request(t.app)[route.method](concretePath(route)).send({});
      expect(res.status).toBe(401);
      expect(ErrorBodySchema.parse(res.body).error.code).toBe('unauthenticated');
    });
  }
  it('answers 401 to a tampered session cookie', async () => {
    const cookie = await t.sessionFor('head@plinth.test');
    const tampered = cookie.replace(/.$/, (c) => (c === 'A' ? 'B' : 'A'));
    expect((await request(t.app).get('/api/session').set('Cookie', cookie)).status).toBe(200);
    const res = await request(t.app).get('/api/session').set('Cookie', tampered);
    expect(res.status).toBe(401);
  });
  it('answers 401 once the session has expired', async () => {
    const cookie = await t.sessionFor('head@plinth.test');
    await t.db.db.updateTable('sessions').set({ expire: new Date(Date.now() - 1000) }).execute();
    const res = await request(t.app).get('/api/session').set('Cookie', cookie);
    expect(res.status).toBe(401);
  });
});

describe('error shape', () => {
  it('names each bad field in a 400', async () => {
    const cookie = await t.sessionFor('admin@plinth.test');
    const res = await request(t.app).post('/api/users').set('Cookie', cookie).send({ email: 'not-an-email', displayName: '' });
    expect(res.status).toBe(400);
    const body = ErrorBodySchema.parse(res.body);
    expect(body.error.code).toBe('validation_failed');
    expect(Object.keys(body.error.details?.fields ?? {}).sort()).toEqual(['displayName', 'email']);
  });
  it('answers malformed JSON with a 400, not a 500', async () => {
    const cookie = await t.sessionFor('admin@plinth.test');
    const res = await request(t.app).post('/api/users').set('Cookie', cookie).set('Content-Type', 'application/json').send('{"email":');
    expect(res.status).toBe(400);
    expect(ErrorBodySchema.parse(res.body).error.code).toBe('validation_failed');
  });
  it('answers an oversized body with 413', async () => {
    const cookie = await t.sessionFor('admin@plinth.test');
    const res = await request(t.app).post('/api/users').set('Cookie', cookie).send({ email: 'a@b.test', displayName: 'x'.repeat(1_100_000) });
    expect(res.status).toBe(413);
    expect(ErrorBodySchema.parse(res.body).error.code).toBe('payload_too_large');
  });
  it('answers an unknown API path with 404 in the error shape', async () => {
    const res = await request(t.app).get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect(ErrorBodySchema.parse(res.body).error.code).toBe('not_found');
  });
  it('answers a bad path parameter with 400', async () => {
    const cookie = await t.sessionFor('admin@plinth.test');
    const res = await request(t.app).get('/api/users/not-a-uuid').set('Cookie', cookie);
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields.id).toBeDefined();
  });
  it('refuses a write from another site', async () => {
    const cookie = await t.sessionFor('admin@plinth.test');
    const res = await request(t.app).post('/api/users').set('Cookie', cookie).set('Origin', 'http://evil.test').send({ email: 'x@y.test', displayName: 'X' });
    expect(res.status).toBe(403);
    expect(await t.db.db.selectFrom('users').select('id').where('email', '=', 'x@y.test').executeTakeFirst()).toBeUndefined();
  });
});

describe('a 500', () => {
  it('sends the error shape and never a stack trace', async () => {
    const cookie = await t.sessionFor('admin@plinth.test');
    // A column the code expects is gone: an unexpected database error.
    await t.db.pool.query('alter table audit_log rename column details to details_gone');
    try {
      const res = await request(t.app).get('/api/audit').set('Cookie', cookie);
      expect(res.status).toBe(500);
      expect(res.body).toEqual({ error: { code: 'internal', message: expect.any(String) } });
      expect(res.text).not.toMatch(/at .*\.ts:\d+|stack|column/i);
    } finally {
      await t.db.pool.query('alter table audit_log rename column details_gone to details');
    }
  });
});

describe('GET /api/openapi.json', () => {
  it('is an OpenAPI 3.1 document with every mounted route', async () => {
    const res = await request(t.app).get('/api/openapi.json');
    expect(res.status).toBe(200);
    expect(res.body.openapi).toBe('3.1.0');
    // Read the routes from the live Express router, not from our own list.
    const mounted: string[] = [];
    type Layer = { route?: { path: string; methods: Record<string, boolean> }; handle?: { stack?: Layer[] } };
    const walk = (stack: Layer[]) => {
      for (const layer of stack) {
        if (layer.handle?.stack) walk(layer.handle.stack);
        if (!layer.route) continue;
        for (const m of Object.keys(layer.route.methods)) mounted.push(`${m} ${layer.route.path.replace(/:([A-Za-z0-9_]+)/g, '{$1}')}`);
      }
    };
    walk((t.app as unknown as { router: { stack: Layer[] } }).router.stack);
    const apiMounted = mounted.filter((m) => m.split(' ')[1]!.startsWith('/api/'));
    expect(apiMounted.length).toBe(allRoutes.length);
    for (const m of apiMounted) {
      const [method, p] = m.split(' ') as [string, string];
      expect(res.body.paths[p]?.[method], m).toBeDefined();
    }
  });
  it('documents request bodies from the zod schemas', async () => {
    const res = await request(t.app).get('/api/openapi.json');
    const post = res.body.paths['/api/users'].post;
    const schema = post.requestBody.content['application/json'].schema;
    expect(schema.required).toEqual(expect.arrayContaining(['email', 'displayName']));
    expect(post.responses['401']).toBeDefined();
  });
});

describe('when PostgreSQL goes away', () => {
  it('health says 503, other routes fail in the error shape, and both recover on their own', async () => {
    // A TCP relay in front of the real database that we can cut and restore.
    const target = new URL(t.db.url);
    const sockets = new Set<net.Socket>();
    const relay = net.createServer((client) => {
      const upstream = net.connect(Number(target.port), target.hostname);
      sockets.add(client).add(upstream);
      client.pipe(upstream).pipe(client);
      const drop = () => { client.destroy(); upstream.destroy(); };
      client.on('error', drop); upstream.on('error', drop); client.on('close', drop); upstream.on('close', drop);
    });
    await new Promise<void>((r) => relay.listen(0, '127.0.0.1', () => r()));
    const relayPort = (relay.address() as net.AddressInfo).port;
    const viaRelay = new URL(t.db.url);
    viaRelay.port = String(relayPort);
    const t2 = await createTestApp({ DATABASE_URL: viaRelay.href }, { seed: false });
    // Point the second app at the first one's seeded database, through the relay.
    const { createDb } = await import('../../api/db/index.ts');
    const { createApp } = await import('../../api/app.ts');
    const handle = createDb(viaRelay.href, { log: () => {} });
    const app = createApp({ ctx: { ...t2.ctx, db: handle.db }, pool: handle.pool });
    const cookie = await t.sessionFor('admin@plinth.test');
    try {
      expect((await request(app).get('/api/health')).status).toBe(200);
      expect((await request(app).get('/api/users').set('Cookie', cookie)).status).toBe(200);

      const closed = new Promise<void>((r) => relay.close(() => r()));
      for (const s of sockets) s.destroy();
      sockets.clear();
      await closed;

      const down = await request(app).get('/api/health');
      expect(down.status).toBe(503);
      expect(down.body).toEqual({ status: 'degraded', database: 'unreachable' });
      const failed = await request(app).get('/api/users').set('Cookie', cookie);
      expect(failed.status).toBe(503);
      expect(ErrorBodySchema.parse(failed.body).error.code).toBe('unavailable');

      await new Promise<void>((r) => relay.listen(relayPort, '127.0.0.1', () => r()));
      expect((await request(app).get('/api/health')).status).toBe(200);
      expect((await request(app).get('/api/users').set('Cookie', cookie)).status).toBe(200);
    } finally {
      relay.close();
      for (const s of sockets) s.destroy();
      await handle.close();
      await t2.close();
    }
  });
});

describe('source conventions', () => {
  const root = path.resolve(import.meta.dirname, '../..');
  /** Every TypeScript source under a folder, as paths from the repository root. */
  const sources = (dir: string) =>
    readdirSync(path.join(root, dir), { recursive: true, encoding: 'utf8' })
      .filter((f) => /\.tsx?$/.test(f))
      .map((f) => path.posix.join(dir, f.split(path.sep).join('/')));
  const holding = (files: string[], pattern: RegExp) => files.filter((f) => pattern.test(readFileSync(path.join(root, f), 'utf8')));

  it('checks a unique-key violation only through isUniqueViolation', () => {
    const files = sources('api');
    expect(files).toContain('api/http/errors.ts');
    expect(holding(files, /23505/)).toEqual(['api/http/errors.ts']);
  });
  it('lets no client feature define its own invalidate', () => {
    const files = sources('app/features');
    expect(files.length).toBeGreaterThan(50);
    expect(holding(files, /\b(?:function|const|let|var)\s+invalidate\b/)).toEqual([]);
    expect(holding(['app/lib/query-keys.ts'], /export function invalidate\b/)).toEqual(['app/lib/query-keys.ts']);
  });
  it('types forms by their schema, with no cast around a resolver', () => {
    const files = sources('app');
    expect(holding(files, /\bas unknown as\b|\bas Resolver\b/)).toEqual([]);
  });
});
