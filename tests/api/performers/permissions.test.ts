import { beforeEach, describe, expect, it } from 'vitest';
import request from 'supertest';
import { ErrorBodySchema } from '#shared/errors.ts';
import { cameraJpeg } from '../../fixtures/images.ts';
import { performerId, type Who } from '../../fixtures/performers.ts';
import { usePerformerApp, t, as, lantern, api, list, detail, count, version, performerBody, editBody } from './setup.ts';

usePerformerApp();

describe('every performer route × every role', () => {
  type Case = { route: string; run: (who: Who) => Promise<request.Response> };
  const small = () => cameraJpeg();
  const csv = () => Buffer.from('legal_name,email\nMatrix Person,matrix.person@example.test\n');
  let oz: string;
  beforeEach(async () => {
    oz = await performerId(t, 'Oswin Parfitt-Reyes');
    const set = await api().put(`/api/performers/${oz}/portrait`).set('Cookie', as.head).attach('portrait', await small(), 'p.jpg');
    expect(set.status).toBe(200);
  });
  const cases: Case[] = [
    { route: 'GET /api/performers', run: (who) => list(who) },
    { route: 'GET /api/performers/export.csv', run: (who) => api().get('/api/performers/export.csv').set('Cookie', as[who]) },
    { route: 'GET /api/performers/:id', run: (who) => detail(who, oz) },
    { route: 'POST /api/performers', run: (who) => api().post('/api/performers').set('Cookie', as[who]).send(performerBody({ email: `${who}.made@example.test`, engagements: [{ productionId: lantern }] })) },
    { route: 'PATCH /api/performers/:id', run: async (who) => api().patch(`/api/performers/${oz}`).set('Cookie', as[who]).send(await editBody(oz, { notes: `edited by ${who}` })) },
    { route: 'PUT /api/performers/:id/account', run: async (who) => api().put(`/api/performers/${oz}/account`).set('Cookie', as[who]).send({ userId: null, version: await version(oz) }) },
    { route: 'PUT /api/performers/:id/portrait', run: async (who) => api().put(`/api/performers/${oz}/portrait`).set('Cookie', as[who]).attach('portrait', await small(), 'p.jpg') },
    { route: 'DELETE /api/performers/:id/portrait', run: (who) => api().delete(`/api/performers/${oz}/portrait`).set('Cookie', as[who]) },
    { route: 'GET /api/performers/:id/portrait', run: (who) => api().get(`/api/performers/${oz}/portrait`).set('Cookie', as[who]) },
    { route: 'GET /api/performers/:id/portrait/thumbnail', run: (who) => api().get(`/api/performers/${oz}/portrait/thumbnail`).set('Cookie', as[who]) },
    { route: 'GET /api/performers/:id/health-reads', run: (who) => api().get(`/api/performers/${oz}/health-reads`).set('Cookie', as[who]) },
    { route: 'GET /api/performers/:id/records.zip', run: (who) => api().get(`/api/performers/${oz}/records.zip`).set('Cookie', as[who]) },
    { route: 'POST /api/performers/import', run: (who) => api().post(`/api/performers/import?productionId=${lantern}`).set('Cookie', as[who]).attach('file', csv(), 'p.csv') },
  ];
  // Lantern's head and lead manage; its artists (artist2 is head of Saltglass only) and archivist view;
  // Juno (performer) sees only her own record; the administrator holds no production role here.
  const ok = { view: ['head', 'lead', 'artist', 'archivist', 'artist2'], manage: ['head', 'lead'] } as const;
  const expected: Record<string, { allowed: readonly Who[]; status: number }> = {
    'GET /api/performers': { allowed: ok.view, status: 200 },
    'GET /api/performers/export.csv': { allowed: ok.view, status: 200 },
    'GET /api/performers/:id': { allowed: ok.view, status: 200 },
    'POST /api/performers': { allowed: ok.manage, status: 201 },
    'PATCH /api/performers/:id': { allowed: ok.manage, status: 200 },
    'PUT /api/performers/:id/account': { allowed: [...ok.manage, 'admin'], status: 200 },
    'PUT /api/performers/:id/portrait': { allowed: ok.manage, status: 200 },
    'DELETE /api/performers/:id/portrait': { allowed: ok.manage, status: 204 },
    'GET /api/performers/:id/portrait': { allowed: ok.view, status: 200 },
    'GET /api/performers/:id/portrait/thumbnail': { allowed: ok.view, status: 200 },
    'POST /api/performers/import': { allowed: ok.manage, status: 200 },
    // Health data: the lead only (Oz, the performer here, has no sign-in of his own).
    'GET /api/performers/:id/health-reads': { allowed: ['lead'], status: 200 },
    'GET /api/performers/:id/records.zip': { allowed: ['lead'], status: 200 },
  };
  const everyone: Who[] = ['head', 'lead', 'artist', 'archivist', 'artist2', 'performer', 'admin', 'norole'];
  for (const c of cases) {
    for (const who of everyone) {
      const e = expected[c.route]!;
      const allowed = e.allowed.includes(who);
      it(`${c.route} answers ${allowed ? e.status : 403} to ${who}`, async () => {
        const performersBefore = await count('performers');
        const versionBefore = await version(oz);
        const res = await c.run(who);
        expect(res.status).toBe(allowed ? e.status : 403);
        if (!allowed) {
          expect(ErrorBodySchema.parse(res.body).error.code).toBe('forbidden');
          expect(await count('performers')).toBe(performersBefore);
          expect(await version(oz)).toBe(versionBefore);
        }
      });
    }
  }
  it('covers every performer route', async () => {
    const { allRoutes } = await import('../../../api/routes.ts');
    const mine = allRoutes.filter((r) => r.tag === 'performers').map((r) => `${r.method.toUpperCase()} ${r.path}`);
    expect(mine.sort()).toEqual(cases.map((c) => c.route).sort());
  });
});
