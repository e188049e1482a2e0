import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { ErrorBodySchema } from '#shared/errors.ts';
import { isValidLabelCode } from '#shared/domain/label-codes.ts';
import { LocationDetailSchema, LocationTreeSchema } from '#shared/schemas/archive.ts';
import { createTestApp, type TestApp } from '../support/app.ts';
import { archiveCounts, castByKey, placeByKey } from '../fixtures/archive.ts';
import { sessions, type Who } from '../fixtures/performers.ts';
import { snapshotData } from '../fixtures/snapshot.ts';

let t: TestApp;
let as: Record<Who, string>;
let restore: () => Promise<void>;

beforeAll(async () => {
  t = await createTestApp();
  as = await sessions(t);
  restore = await snapshotData(t);
});
beforeEach(async () => {
  await restore();
});
afterAll(async () => {
  await t?.close();
});

const api = () => request(t.app);
const tree = async (who: Who) => api().get('/api/archive/locations').set('Cookie', as[who]);
const create = (who: Who, body: object) => api().post('/api/archive/locations').set('Cookie', as[who]).send(body);
const patch = (who: Who, id: string, body: object) => api().patch(`/api/archive/locations/${id}`).set('Cookie', as[who]).send(body);
const message = (res: request.Response) => ErrorBodySchema.parse(res.body).error;

describe('GET /api/archive/locations', () => {
  it('gives the whole store with code paths, breadcrumbs and casts counted below each place', async () => {
    const res = await tree('archivist');
    expect(res.status).toBe(200);
    const body = LocationTreeSchema.parse(res.body);
    expect(body.canManage).toBe(true);
    const bin = body.items.find((l) => l.path === 'GH/NORTH/R1/2/B1')!;
    expect(bin.breadcrumb).toBe('Gullhaven Studio Store › North Store › Rack 1 (molds) › Shelf 2 › Bin B1 (small molds)');
    // The teeth positive is in the bin; the teeth mold was destroyed.
    expect(bin.castsHere).toBe(1);
    const site = body.items.find((l) => l.path === 'GH')!;
    expect(site.level).toBe('site');
    const inStore = Number((await t.db.db.selectFrom('casts').select((eb) => eb.fn.countAll<string>().as('n')).where('status', '=', 'in_store').executeTakeFirstOrThrow()).n);
    expect(site.castsBelow).toBe(inStore);
    expect(body.items.every((l) => isValidLabelCode(l.labelCode))).toBe(true);
  });
  it('is open to staff who read casts, but only the archivist manages places; the performer and administrator are refused', async () => {
    expect(LocationTreeSchema.parse((await tree('head')).body).canManage).toBe(false);
    expect((await tree('artist')).status).toBe(200);
    expect((await tree('performer')).status).toBe(403);
    expect((await tree('admin')).status).toBe(403);
    expect((await tree('norole')).status).toBe(403);
  });
});

describe('GET /api/archive/locations/:id', () => {
  it('lists what is on the shelf, what belongs there but is out, and the places above it', async () => {
    const shelf = await placeByKey(t, 'south-r1-s1');
    const res = await api().get(`/api/archive/locations/${shelf.id}`).set('Cookie', as.archivist);
    expect(res.status).toBe(200);
    const body = LocationDetailSchema.parse(res.body);
    expect(body.ancestors.map((a) => a.code)).toEqual(['GH', 'SOUTH', 'R1']);
    const juno = await castByKey(t, 'juno-face-positive');
    // Juno's face positive lives here but is checked out; Tamsin's positive and Oz's older one sit here.
    expect(body.away.map((c) => c.id)).toEqual([juno.id]);
    expect(body.away[0]!.where).toBe('With Sol Varga');
    const tamsin = await castByKey(t, 'tamsin-face-positive');
    expect(body.casts.map((c) => c.id)).toContain(tamsin.id);
    expect(body.casts.every((c) => c.currentLocationId === shelf.id)).toBe(true);
  });
  it('a room lists the casts on all its shelves', async () => {
    const room = await placeByKey(t, 'north');
    const body = LocationDetailSchema.parse((await api().get(`/api/archive/locations/${room.id}`).set('Cookie', as.archivist)).body);
    expect(body.casts.length).toBe(body.castsBelow);
    expect(body.casts.every((c) => c.currentPath?.startsWith('GH/NORTH/'))).toBe(true);
    expect(body.children.map((c) => c.code)).toEqual(['R1', 'R2']);
  });
  it('answers 404 for a place that does not exist', async () => {
    const res = await api().get('/api/archive/locations/00000000-0000-4000-8000-000000000000').set('Cookie', as.archivist);
    expect(res.status).toBe(404);
  });
});

describe('POST /api/archive/locations', () => {
  it('adds a shelf to a rack with a checked label code, and audits it', async () => {
    const rack = await placeByKey(t, 'south-r2');
    const res = await create('archivist', { parentId: rack.id, level: 'shelf', code: ' 3 ', name: 'Shelf 3', environment: 'Bottom shelf: pad with foam.' });
    expect(res.status).toBe(201);
    const body = LocationDetailSchema.parse(res.body);
    expect(body.path).toBe('GH/SOUTH/R2/3');
    expect(isValidLabelCode(body.labelCode)).toBe(true);
    expect(body.labelCode.startsWith('L-')).toBe(true);
    const audit = await t.db.db.selectFrom('audit_log').select('details').where('action', '=', 'location.create').where('entity_id', '=', body.id).executeTakeFirstOrThrow();
    expect(audit.details).toMatchObject({ level: 'shelf', path: 'GH/SOUTH/R2/3' });
  });
  it('refuses a shelf put straight into a room, a bad code, a code a sibling has and an unknown parent, naming the field, saving nothing', async () => {
    const before = await archiveCounts(t);
    const room = await placeByKey(t, 'south');
    const rack = await placeByKey(t, 'south-r1');
    const wrongLevel = await create('archivist', { parentId: room.id, level: 'shelf', code: 'S9', name: 'Loose shelf' });
    expect(wrongLevel.status).toBe(400);
    expect(message(wrongLevel).details?.fields?.parentId).toEqual(['A shelf goes inside a rack.']);
    const badCode = await create('archivist', { parentId: rack.id, level: 'shelf', code: 'shelf #4', name: 'Shelf 4' });
    expect(badCode.status).toBe(400);
    expect(message(badCode).details?.fields?.code?.[0]).toMatch(/capital letters, digits and inner hyphens/);
    const clash = await create('archivist', { parentId: rack.id, level: 'shelf', code: '2', name: 'Another shelf 2' });
    expect(clash.status).toBe(400);
    expect(message(clash).details?.fields?.code).toEqual(['Shelf 2 already has the code 2 here; choose another.']);
    const unknown = await create('archivist', { parentId: '00000000-0000-4000-8000-000000000000', level: 'shelf', code: '7', name: 'Shelf 7' });
    expect(unknown.status).toBe(400);
    expect(message(unknown).details?.fields?.parentId).toEqual(['That place was not found.']);
    const site = await create('archivist', { parentId: room.id, level: 'site', code: 'X', name: 'Nested site' });
    expect(message(site).details?.fields?.parentId).toEqual(['A site is the top of the tree and cannot sit inside another place.']);
    expect(await archiveCounts(t)).toEqual(before);
  });
  it('is the archivist’s alone', async () => {
    const rack = await placeByKey(t, 'south-r1');
    for (const who of ['head', 'lead', 'artist', 'performer', 'admin'] as const) {
      const res = await create(who, { parentId: rack.id, level: 'shelf', code: '9', name: 'Shelf 9' });
      expect(res.status, who).toBe(403);
    }
  });
});

describe('PATCH /api/archive/locations/:id', () => {
  it('moves a bin from one shelf to another and renames it', async () => {
    const bin = await placeByKey(t, 'north-r1-s2-b1');
    const shelf = await placeByKey(t, 'north-r1-s3');
    const res = await patch('archivist', bin.id, { parentId: shelf.id, code: 'B1', name: 'Bin B1 (teeth)', environment: null, version: bin.version });
    expect(res.status).toBe(200);
    expect(LocationDetailSchema.parse(res.body).path).toBe('GH/NORTH/R1/3/B1');
    // The casts in it went with it.
    expect(LocationDetailSchema.parse(res.body).castsHere).toBe(1);
  });
  it('refuses a cycle in the tree: a rack under one of its own shelves, or a place under itself, and nothing changes', async () => {
    const rack = await placeByKey(t, 'north-r1');
    const ownShelf = await placeByKey(t, 'north-r1-s1');
    const under = await patch('archivist', rack.id, { parentId: ownShelf.id, code: 'R1', name: 'Rack 1 (molds)', environment: null, version: rack.version });
    expect(under.status).toBe(400);
    expect(message(under).details?.fields?.parentId).toEqual(['A rack goes inside a room.']);
    const self = await patch('archivist', ownShelf.id, { parentId: ownShelf.id, code: '1', name: 'Shelf 1', environment: null, version: ownShelf.version });
    expect(self.status).toBe(400);
    expect(message(self).details?.fields?.parentId).toEqual(['A shelf goes inside a rack.']);
    const row = await t.db.db.selectFrom('archive_locations').select(['parent_id', 'version']).where('id', '=', rack.id).executeTakeFirstOrThrow();
    expect(row.version).toBe(rack.version);
    const room = await placeByKey(t, 'north');
    expect(row.parent_id).toBe(room.id);
  });
  it('answers 409 to an edit based on an old version', async () => {
    const shelf = await placeByKey(t, 'north-r1-s1');
    const rack = await placeByKey(t, 'north-r1');
    expect((await patch('archivist', shelf.id, { parentId: rack.id, code: '1', name: 'Shelf one', version: shelf.version })).status).toBe(200);
    const stale = await patch('archivist', shelf.id, { parentId: rack.id, code: '1', name: 'Shelf uno', version: shelf.version });
    expect(stale.status).toBe(409);
    expect(message(stale).code).toBe('conflict');
  });
});

describe('DELETE /api/archive/locations/:id', () => {
  it('refuses a place that still holds casts, places, or casts that call it home, and keeps it', async () => {
    const bin = await placeByKey(t, 'north-r1-s2-b1');
    const holds = await api().delete(`/api/archive/locations/${bin.id}?version=${bin.version}`).set('Cookie', as.archivist);
    expect(holds.status).toBe(409);
    expect(message(holds).message).toBe('This place still holds 1 cast; move them first.');
    const rack = await placeByKey(t, 'north-r1');
    const parent = await api().delete(`/api/archive/locations/${rack.id}?version=${rack.version}`).set('Cookie', as.archivist);
    expect(message(parent).message).toBe('This place still holds 3 places; move or remove them first.');
    // Juno's face positive is checked out, but its home shelf waits for it.
    const home = await placeByKey(t, 'south-r1-s1');
    const homed = await api().delete(`/api/archive/locations/${home.id}?version=${home.version}`).set('Cookie', as.archivist);
    expect(homed.status).toBe(409);
    expect(await t.db.db.selectFrom('archive_locations').select('id').where('id', 'in', [bin.id, rack.id, home.id]).execute()).toHaveLength(3);
  });
  it('removes an empty place, and audits it', async () => {
    const rack = await placeByKey(t, 'south-r2');
    const made = LocationDetailSchema.parse((await create('archivist', { parentId: rack.id, level: 'shelf', code: '9', name: 'Spare shelf' })).body);
    const res = await api().delete(`/api/archive/locations/${made.id}?version=${made.version}`).set('Cookie', as.archivist);
    expect(res.status).toBe(204);
    expect(await t.db.db.selectFrom('archive_locations').select('id').where('id', '=', made.id).executeTakeFirst()).toBeUndefined();
    expect(await t.db.db.selectFrom('audit_log').select('id').where('action', '=', 'location.delete').where('entity_id', '=', made.id).executeTakeFirst()).toBeDefined();
  });
});
