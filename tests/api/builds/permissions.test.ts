import { describe, expect, it } from 'vitest';
import { BuildDetailSchema, PerformerBuildsSchema } from '#shared/schemas/builds.ts';
import type { Who } from '../../fixtures/performers.ts';
import { api, as, buildRowCounts, createAs, demoBuild, ids, t, useBuildApp, validBuild } from './setup.ts';

useBuildApp();

/** The demo lead is also an artist on The Lantern Keeper; without that role only the appointment is left. */
async function leadWithoutArtistRole(): Promise<void> {
  const lead = await t.userId('lead@plinth.test');
  await t.db.db.deleteFrom('memberships').where('user_id', '=', lead).where('production_id', '=', ids.lantern).execute();
}

/** Someone who works only on Saltglass Mile, where none of the demo performers is engaged. */
async function elsewhereStaff(): Promise<string> {
  const email = 'saltglass.artist@plinth.test';
  const user = await t.db.db.insertInto('users').values({ email, display_name: 'Ada Saltglass' }).returning('id').executeTakeFirstOrThrow();
  await t.db.db.insertInto('memberships').values({ user_id: user.id, production_id: ids.saltglass, role: 'artist' }).execute();
  return t.sessionFor(email);
}

describe('who reads builds', () => {
  const read = async (who: Who) => {
    const b = await demoBuild(ids.molds.junoFace);
    return [
      (await api().get('/api/appliance-builds').query({ productionId: ids.lantern }).set('Cookie', as[who])).status,
      (await api().get(`/api/appliance-builds/${b.id}`).set('Cookie', as[who])).status,
      (await api().get('/api/appliance-outlooks').query({ productionId: ids.lantern }).set('Cookie', as[who])).status,
      (await api().get('/api/appliance-molds').query({ productionId: ids.lantern }).set('Cookie', as[who])).status,
    ];
  };
  for (const who of ['head', 'lead', 'artist', 'artist2', 'archivist'] as const) {
    it(`${who} reads the production's builds, outlooks and molds`, async () => {
      expect(await read(who)).toEqual([200, 200, 200, 200]);
    });
  }
  for (const who of ['performer', 'admin', 'norole'] as const) {
    it(`${who} does not (403)`, async () => {
      expect(await read(who)).toEqual([403, 403, 403, 403]);
    });
  }
  it('the lead appointment alone reads builds, and says it may neither record nor plan them', async () => {
    await leadWithoutArtistRole();
    const b = BuildDetailSchema.parse((await api().get(`/api/appliance-builds/${(await demoBuild(ids.molds.junoFace)).id}`).set('Cookie', as.lead)).body);
    expect([b.canManage, b.canPlan]).toEqual([false, false]);
  });
  it('staff of another production read none of them, and answer 404 before 403 for a build that does not exist', async () => {
    const cookie = await elsewhereStaff();
    const b = await demoBuild(ids.molds.junoFace);
    expect((await api().get(`/api/appliance-builds/${b.id}`).set('Cookie', cookie)).status).toBe(403);
    expect((await api().get('/api/appliance-builds/00000000-0000-4000-8000-000000000000').set('Cookie', cookie)).status).toBe(404);
    expect((await api().get('/api/appliance-builds').query({ productionId: ids.lantern }).set('Cookie', cookie)).status).toBe(403);
    expect((await api().get(`/api/performers/${ids.juno}/appliance-builds`).set('Cookie', cookie)).status).toBe(403);
  });
});

describe('who records builds and marks pieces', () => {
  for (const who of ['head', 'artist', 'artist2'] as const) {
    it(`${who} records a build and marks its pieces`, async () => {
      const res = await createAs(who, validBuild());
      expect(res.status).toBe(201);
      const b = BuildDetailSchema.parse(res.body);
      expect((await api().put(`/api/appliance-pieces/${b.pieces[0]!.id}/status`).set('Cookie', as[who]).send({ status: 'used', version: 1 })).status).toBe(200);
    });
  }
  for (const who of ['archivist', 'performer', 'admin', 'norole'] as const) {
    it(`${who} is refused (403) and nothing is written`, async () => {
      const before = await buildRowCounts();
      expect((await createAs(who, validBuild())).status).toBe(403);
      const b = await demoBuild(ids.molds.junoFace);
      expect((await api().put(`/api/appliance-builds/${b.id}`).set('Cookie', as[who]).send({ ...validBuild(), version: b.version })).status).toBe(403);
      expect(await buildRowCounts()).toEqual(before);
    });
  }
  it('the lead appointment alone records nothing', async () => {
    await leadWithoutArtistRole();
    expect((await createAs('lead', validBuild())).status).toBe(403);
  });
  it('a build for another production than the one the recorder works on is refused', async () => {
    // The head of Saltglass Mile (artist2) records there, but Juno is not engaged on it.
    const res = await createAs('artist2', validBuild({ productionId: ids.saltglass }));
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields.moldId[0]).toMatch(/Juno Castellane is not engaged on this production/);
    // And the artist of The Lantern Keeper may not record on Saltglass Mile at all.
    expect((await createAs('artist', validBuild({ productionId: ids.saltglass }))).status).toBe(403);
  });
});

describe("a performer's own pieces", () => {
  it('the performer reads every build of theirs with its materials and lots, and no other performer’s', async () => {
    const res = await api().get(`/api/performers/${ids.juno}/appliance-builds`).set('Cookie', as.performer);
    expect(res.status).toBe(200);
    const { items } = PerformerBuildsSchema.parse(res.body);
    expect(items.map((b) => b.mold.id).sort()).toEqual([ids.molds.junoFace, ids.molds.junoHand].sort());
    const face = items.find((b) => b.mold.id === ids.molds.junoFace)!;
    expect(face.materials.map((m) => `${m.product.name} ${m.lot.code}`)).toContain('Slack Tide silicone softener ST-2605');
    const oz = await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', 'Oswin Parfitt-Reyes').executeTakeFirstOrThrow();
    expect((await api().get(`/api/performers/${oz.id}/appliance-builds`).set('Cookie', as.performer)).status).toBe(403);
    // …and reads no build through the staff routes.
    expect((await api().get(`/api/appliance-builds/${face.id}`).set('Cookie', as.performer)).status).toBe(403);
  });
  it('staff of the performer’s production read them too; 404 for a performer who does not exist', async () => {
    expect(PerformerBuildsSchema.parse((await api().get(`/api/performers/${ids.juno}/appliance-builds`).set('Cookie', as.archivist)).body).items).toHaveLength(2);
    expect((await api().get('/api/performers/00000000-0000-4000-8000-000000000000/appliance-builds').set('Cookie', as.head)).status).toBe(404);
  });
});
