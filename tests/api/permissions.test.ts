import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ErrorBodySchema } from '#shared/errors.ts';
import { allRoutes } from '../../api/routes.ts';
import { createTestApp, type TestApp } from '../support/app.ts';
import { concretePath } from '../support/routes.ts';

let t: TestApp;
const cookies = new Map<string, string>();
const STAFF = ['head@plinth.test', 'lead@plinth.test', 'artist@plinth.test', 'artist2@plinth.test', 'archivist@plinth.test', 'performer@plinth.test', 'norole@plinth.test'];

beforeAll(async () => {
  t = await createTestApp();
  await t.db.db.insertInto('users').values({ email: 'norole@plinth.test', display_name: 'No Role Yet' }).execute();
  for (const email of [...STAFF, 'admin@plinth.test']) cookies.set(email, await t.sessionFor(email));
});
afterAll(async () => {
  await t?.close();
});

describe('studio-wide routes (users, productions, memberships, lead, outbox)', () => {
  const adminRoutes = allRoutes.filter((r) => r.tag === 'admin');
  it('are all guarded by a declared admin-only permission', () => {
    expect(adminRoutes.every((r) => r.requires && ['users.manage', 'productions.manage', 'memberships.manage', 'lead.appoint', 'outbox.read'].includes(r.requires))).toBe(true);
    expect(adminRoutes.length).toBeGreaterThanOrEqual(15);
  });
  for (const route of adminRoutes) {
    for (const email of STAFF) {
      it(`${route.method.toUpperCase()} ${route.path} answers 403 to ${email}, whatever the input`, async () => {
        const res = await request(t.app)[route.method](concretePath(route)).set('Cookie', cookies.get(email)!).send({ junk: true });
        expect(res.status).toBe(403);
        expect(ErrorBodySchema.parse(res.body).error.code).toBe('forbidden');
      });
    }
    it(`${route.method.toUpperCase()} ${route.path} lets the studio administrator past the permission check`, async () => {
      const res = await request(t.app)[route.method](concretePath(route)).set('Cookie', cookies.get('admin@plinth.test')!).send({});
      expect([200, 201, 400, 404]).toContain(res.status);
    });
  }
});

describe('consent template editing (studio-wide: administrators, heads and leads)', () => {
  const templateWrites = allRoutes.filter((r) => r.requires === 'templates.manage');
  it('covers create, publish and archive', () => {
    expect(templateWrites.map((r) => `${r.method} ${r.path}`).sort()).toEqual(['post /api/consent-templates', 'put /api/consent-templates/:id', 'put /api/consent-templates/:id/archived']);
  });
  const refused = ['artist@plinth.test', 'archivist@plinth.test', 'performer@plinth.test', 'norole@plinth.test'];
  const allowed = ['admin@plinth.test', 'head@plinth.test', 'lead@plinth.test', 'artist2@plinth.test'];
  for (const route of templateWrites) {
    for (const email of refused) {
      it(`${route.method.toUpperCase()} ${route.path} answers 403 to ${email}`, async () => {
        const res = await request(t.app)[route.method](concretePath(route)).set('Cookie', cookies.get(email)!).send({ junk: true });
        expect(res.status).toBe(403);
      });
    }
    for (const email of allowed) {
      it(`${route.method.toUpperCase()} ${route.path} lets ${email} past the permission check`, async () => {
        const res = await request(t.app)[route.method](concretePath(route)).set('Cookie', cookies.get(email)!).send({});
        expect([400, 404]).toContain(res.status);
      });
    }
  }
});

describe('session routes', () => {
  for (const email of [...STAFF, 'admin@plinth.test']) {
    it(`GET /api/session and /api/home answer ${email}`, async () => {
      const s = await request(t.app).get('/api/session').set('Cookie', cookies.get(email)!);
      expect(s.status).toBe(200);
      expect(s.body.user.email).toBe(email);
      const h = await request(t.app).get('/api/home').set('Cookie', cookies.get(email)!);
      expect(h.status).toBe(200);
    });
  }
  it('a person with no role gets no seats and an empty home', async () => {
    const s = await request(t.app).get('/api/session').set('Cookie', cookies.get('norole@plinth.test')!);
    expect(s.body.seats).toEqual([]);
    expect(s.body.current).toBeNull();
  });
  it('the performer sees only their own performer link', async () => {
    const s = await request(t.app).get('/api/session').set('Cookie', cookies.get('performer@plinth.test')!);
    const own = await t.db.db.selectFrom('performers').select('id').where('email', '=', 'performer@plinth.test').executeTakeFirstOrThrow();
    expect(s.body.performerIds).toEqual([own.id]);
  });
});
