import { Kysely, PostgresDialect } from 'kysely';
import { describe, expect, it } from 'vitest';
import { ErrorBodySchema } from '#shared/errors.ts';
import { ApplianceOutlookListSchema, ApplianceOutlookSchema, BuildDetailSchema, BuildPageSchema } from '#shared/schemas/builds.ts';
import { HomeSchema } from '#shared/schemas/session.ts';
import type { Database } from '../../../api/db/schema.ts';
import { findApplianceMaterials } from '../../../api/features/builds/index.ts';
import { cameraJpeg } from '../../fixtures/images.ts';
import { api, as, createAs, demoBuild, ids, t, useBuildApp, validBuild } from './setup.ts';

useBuildApp();

const detail = async (id: string) => BuildDetailSchema.parse((await api().get(`/api/appliance-builds/${id}`).set('Cookie', as.head)).body);
const mark = (pieceId: string, body: object, who: 'artist' | 'head' | 'archivist' = 'artist') => api().put(`/api/appliance-pieces/${pieceId}/status`).set('Cookie', as[who]).send(body);
const plan = (body: object, who: 'head' | 'artist' | 'lead' = 'head') => api().put('/api/appliance-plans').set('Cookie', as[who]).send(body);

describe('the demo builds', () => {
  it('count pieces made, used, spoiled and left, newest build first', async () => {
    const page = BuildPageSchema.parse((await api().get('/api/appliance-builds').query({ productionId: ids.lantern }).set('Cookie', as.head)).body);
    expect(page.items.map((b) => [b.performer.name, b.tally])).toEqual([
      ['Juno Castellane', { made: 6, used: 0, spoiled: 0, remaining: 6 }],
      ['Oz Parfitt', { made: 10, used: 2, spoiled: 0, remaining: 8 }],
      ['Juno Castellane', { made: 8, used: 3, spoiled: 1, remaining: 4 }],
    ]);
    expect(page.items[2]!.silicone).toEqual({ productName: 'Slipway platinum silicone base', lotCode: 'SP-2606' });
  });

  it('show one appliance short of the shoot days planned plus spares, and one covered', async () => {
    const res = await api().get('/api/appliance-outlooks').query({ productionId: ids.lantern }).set('Cookie', as.head);
    const { items, canPlan } = ApplianceOutlookListSchema.parse(res.body);
    expect(canPlan).toBe(true);
    const byMold = new Map(items.map((o) => [o.mold.id, o]));
    // 10 shoot days at one piece a day and 2 spares need 12; 4 are left (common practice, no published source).
    expect(byMold.get(ids.molds.junoFace)!.shortfall).toEqual({ needed: 12, remaining: 4, shortBy: 8, short: true });
    // 5 days and 2 spares need 7; 8 are left.
    expect(byMold.get(ids.molds.ozHead)!.shortfall).toEqual({ needed: 7, remaining: 8, shortBy: 0, short: false });
    expect(byMold.get(ids.molds.junoHand)!.plan).toBeNull();
  });
});

describe('PUT /api/appliance-pieces/:id/status', () => {
  it('marks a piece used with its application, spoiled, and back on the shelf; the tally follows', async () => {
    const b = await detail((await demoBuild(ids.molds.junoHand)).id);
    const piece = b.pieces[0]!;
    // The demo's logged application; a piece may name only a logged one.
    const applicationId = (await t.db.db.selectFrom('applications').select('id').executeTakeFirstOrThrow()).id;
    const unknown = await mark(piece.id, { status: 'used', applicationId: '5f0c8a2e-2d1b-4c3a-9e8f-7a6b5c4d3e2f', version: piece.version });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.details.fields.applicationId).toEqual(['No such logged application.']);
    const used = BuildDetailSchema.parse((await mark(piece.id, { status: 'used', applicationId, version: piece.version })).body);
    expect(used.pieces[0]).toMatchObject({ status: 'used', applicationId, statusBy: 'Rafe Lindqvist' });
    expect(used.tally).toEqual({ made: 6, used: 1, spoiled: 0, remaining: 5 });
    const spoiled = BuildDetailSchema.parse((await mark(b.pieces[1]!.id, { status: 'spoiled', note: 'Bubble at the brow', version: 1 })).body);
    expect(spoiled.pieces[1]).toMatchObject({ status: 'spoiled', note: 'Bubble at the brow' });
    expect(spoiled.tally.remaining).toBe(4);
    const back = BuildDetailSchema.parse((await mark(piece.id, { status: 'on_hand', version: piece.version + 1 })).body);
    expect(back.pieces[0]).toMatchObject({ status: 'on_hand', applicationId: null });
    expect(back.tally).toEqual({ made: 6, used: 0, spoiled: 1, remaining: 5 });
    const audit = await t.db.db.selectFrom('audit_log').select('details').where('action', '=', 'piece.mark').where('entity_id', '=', piece.id).execute();
    expect(audit.map((a) => (a.details as { to: string }).to)).toEqual(['used', 'on_hand']);
  });

  it('links an application only to a used piece, and answers a stale mark with 409', async () => {
    const b = await detail((await demoBuild(ids.molds.junoHand)).id);
    const piece = b.pieces[0]!;
    const wrong = await mark(piece.id, { status: 'spoiled', applicationId: '5f0c8a2e-2d1b-4c3a-9e8f-7a6b5c4d3e2f', version: piece.version });
    expect(wrong.status).toBe(400);
    expect(ErrorBodySchema.parse(wrong.body).error.details?.fields?.applicationId).toEqual(['Only a used piece is linked to an application']);
    expect((await mark(piece.id, { status: 'used', version: piece.version })).status).toBe(200);
    const stale = await mark(piece.id, { status: 'spoiled', version: piece.version });
    expect(stale.status).toBe(409);
    expect((await detail(b.id)).pieces[0]!.status).toBe('used');
  });

  it('answers 404 for a piece that does not exist and 403 to the archivist, who reads builds only', async () => {
    expect((await mark('00000000-0000-4000-8000-000000000000', { status: 'used', version: 1 })).status).toBe(404);
    const b = await detail((await demoBuild(ids.molds.junoHand)).id);
    expect((await mark(b.pieces[0]!.id, { status: 'used', version: 1 }, 'archivist')).status).toBe(403);
  });
});

describe('PUT /api/appliance-plans: shoot days still to come', () => {
  it('a head plans an appliance; the outlook counts every build of that mold on the production', async () => {
    expect((await createAs('artist', validBuild({ moldId: ids.molds.junoFace, piecesMade: 5 }))).status).toBe(201);
    const current = ApplianceOutlookListSchema.parse((await api().get('/api/appliance-outlooks').query({ productionId: ids.lantern }).set('Cookie', as.head)).body).items.find(
      (o) => o.mold.id === ids.molds.junoFace,
    )!;
    expect(current.builds).toBe(2);
    expect(current.tally.remaining).toBe(9);
    const res = await plan({ productionId: ids.lantern, moldId: ids.molds.junoFace, shootDaysPlanned: 6, spares: { kind: 'perDay', sparesPerDay: 1 }, piecesPerDay: 1, version: current.plan!.version });
    expect(res.status).toBe(200);
    // 6 days with a spare a day need 12 (common practice, no published source); 9 are left.
    expect(ApplianceOutlookSchema.parse(res.body).shortfall).toEqual({ needed: 12, remaining: 9, shortBy: 3, short: true });
  });

  it('a first plan needs version null; a second first plan or a stale version is a 409', async () => {
    const first = { productionId: ids.lantern, moldId: ids.molds.junoHand, shootDaysPlanned: 4, spares: { kind: 'total', spares: 1 }, version: null };
    const res = await plan(first);
    expect(res.status).toBe(200);
    const o = ApplianceOutlookSchema.parse(res.body);
    expect(o.plan).toMatchObject({ shootDaysPlanned: 4, piecesPerDay: 1, updatedBy: 'Marta Oyelaran', version: 1 });
    expect(o.shortfall).toEqual({ needed: 5, remaining: 6, shortBy: 0, short: false });
    expect((await plan(first)).status).toBe(409);
    expect((await plan({ ...first, shootDaysPlanned: 9, version: 2 })).status).toBe(409);
    expect((await plan({ ...first, shootDaysPlanned: 9, version: 1 })).status).toBe(200);
  });

  it('refuses an artist and the lead (403), a cast that is not a mold and negative days (400)', async () => {
    const body = { productionId: ids.lantern, moldId: ids.molds.junoHand, shootDaysPlanned: 4, spares: { kind: 'total', spares: 1 }, version: null };
    expect((await plan(body, 'artist')).status).toBe(403);
    expect((await plan(body, 'lead')).status).toBe(403);
    const positive = await plan({ ...body, moldId: ids.molds.junoFacePositive });
    expect(ErrorBodySchema.parse(positive.body).error.details?.fields?.moldId?.[0]).toMatch(/is a positive, not a mold/);
    const negative = await plan({ ...body, shootDaysPlanned: -1 });
    expect(ErrorBodySchema.parse(negative.body).error.details?.fields?.shootDaysPlanned).toEqual(['Shoot days cannot be negative']);
  });
});

describe('the head’s home', () => {
  const task = async (who: 'head' | 'lead') => HomeSchema.parse((await api().get('/api/home').set('Cookie', as[who])).body).tasks.find((x) => x.id === 'appliance-pieces-short');

  it('warns when the pieces left will not cover the shoot days planned plus spares, and stops once they do', async () => {
    const warning = await task('head');
    expect(warning?.count).toBe(1);
    expect(warning?.detail).toContain('Juno Castellane’s face');
    expect(warning?.detail).toContain('4 left for 12 needed, short by 8');
    const juno = ApplianceOutlookListSchema.parse((await api().get('/api/appliance-outlooks').query({ productionId: ids.lantern }).set('Cookie', as.head)).body).items.find(
      (o) => o.mold.id === ids.molds.junoFace,
    )!;
    expect((await plan({ productionId: ids.lantern, moldId: ids.molds.junoFace, shootDaysPlanned: 2, spares: { kind: 'total', spares: 2 }, version: juno.plan!.version })).status).toBe(200);
    expect((await task('head'))?.count).toBe(0);
  });
});

describe('photos', () => {
  it('an artist sets a build’s photo, stored without its metadata; a new one replaces it and the old files go', async () => {
    const b = (await demoBuild(ids.molds.junoHand)).id;
    const put = () => api().put(`/api/appliance-builds/${b}/photo`).set('Cookie', as.artist);
    const first = BuildDetailSchema.parse((await put().attach('photo', await cameraJpeg(), 'piece.jpg')).body);
    expect(first.photo?.thumbnailUrl).toContain('size=thumbnail');
    const img = await api().get(first.photo!.url).set('Cookie', as.archivist).buffer(true);
    expect(img.status).toBe(200);
    expect(img.headers['content-type']).toBe('image/jpeg');
    expect(img.body.includes(Buffer.from('PlinthTestCam'))).toBe(false);
    const firstFiles = await t.db.db.selectFrom('appliance_builds').select(['photo_file_id', 'photo_thumb_file_id']).where('id', '=', b).executeTakeFirstOrThrow();
    const second = BuildDetailSchema.parse((await put().attach('photo', await cameraJpeg(), 'again.jpg')).body);
    expect(second.photo!.url).not.toBe(first.photo!.url);
    const left = await t.db.db.selectFrom('files').select('id').where('id', 'in', [firstFiles.photo_file_id!, firstFiles.photo_thumb_file_id!]).execute();
    expect(left).toEqual([]);
    // The performer sees the photo of their own pieces; nobody else without a role on the production does.
    expect((await api().get(second.photo!.thumbnailUrl).set('Cookie', as.performer)).status).toBe(200);
    expect((await api().get(second.photo!.thumbnailUrl).set('Cookie', as.norole)).status).toBe(403);
  });

  it('refuses the archivist before reading the upload, and a file that is not a photo', async () => {
    const b = (await demoBuild(ids.molds.junoHand)).id;
    expect((await api().put(`/api/appliance-builds/${b}/photo`).set('Cookie', as.archivist).attach('photo', await cameraJpeg(), 'x.jpg')).status).toBe(403);
    const bad = await api().put(`/api/appliance-builds/${b}/photo`).set('Cookie', as.artist).attach('photo', Buffer.from('not an image'), 'x.jpg');
    expect(bad.status).toBe(400);
    expect(ErrorBodySchema.parse(bad.body).error.details?.fields?.photo?.[0]).toMatch(/not a photo/);
  });
});

describe('findApplianceMaterials, for the artist’s check', () => {
  it('answers the products, lots and formulations of pieces and builds in one query', async () => {
    const face = await detail((await demoBuild(ids.molds.junoFace)).id);
    const head = await detail((await demoBuild(ids.molds.ozHead)).id);
    let queries = 0;
    const counted = new Kysely<Database>({ dialect: new PostgresDialect({ pool: t.db.pool }), log: (e) => void (e.level === 'query' && queries++) });
    const found = await findApplianceMaterials(counted, { pieceIds: [face.pieces[4]!.id, face.pieces[5]!.id], buildIds: [head.id] });
    expect(queries).toBe(1);
    const byBuild = new Map(found.map((f) => [f.buildId, f]));
    expect(byBuild.get(face.id)!.pieceIds.sort()).toEqual([face.pieces[4]!.id, face.pieces[5]!.id].sort());
    expect(byBuild.get(face.id)!.performerId).toBe(ids.juno);
    expect(byBuild.get(face.id)!.materials.map((m) => [m.role, m.lotId, m.formulationId])).toEqual(face.materials.map((m) => [m.role, m.lot.id, ids.formulations[m.lot.code]]));
    expect(byBuild.get(head.id)!.pieceIds).toEqual([]);
    expect(byBuild.get(head.id)!.materials.map((m) => m.productId)).toContain(ids.products.slackTide);
    expect(await findApplianceMaterials(t.db.db, { pieceIds: ['00000000-0000-4000-8000-000000000000'] })).toEqual([]);
    expect(await findApplianceMaterials(t.db.db, {})).toEqual([]);
  });
});
