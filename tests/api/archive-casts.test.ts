import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { ErrorBodySchema } from '#shared/errors.ts';
import { isValidLabelCode, labelUrl } from '#shared/domain/label-codes.ts';
import { CastDetailSchema, CastPageSchema, PerformerCastsSchema, RetentionListSchema } from '#shared/schemas/archive.ts';
import { HomeSchema } from '#shared/schemas/session.ts';
import { createTestApp, type TestApp } from '../support/app.ts';
import { archiveCounts, castByKey, demoCastLabel, placeByKey } from '../fixtures/archive.ts';
import { performerId, productionId, sessions, type Who } from '../fixtures/performers.ts';
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
const find = async (who: Who, query: Record<string, string>) => api().get('/api/casts').query(query).set('Cookie', as[who]);
const labels = (body: unknown) => CastPageSchema.parse(body).items.map((i) => i.labelCode).sort();
const keysToLabels = (keys: string[]) => keys.map(demoCastLabel).sort();

describe('GET /api/casts: one search box', () => {
  it('finds a performer by a misspelt name (pg_trgm), best match first, with thumbnails', async () => {
    const res = await find('archivist', { q: 'Castelane' });
    expect(res.status).toBe(200);
    const page = CastPageSchema.parse(res.body);
    expect(page.matched).toBe('text');
    expect(page.items.map((i) => i.labelCode).sort()).toEqual(keysToLabels(['juno-face-mold', 'juno-face-positive', 'juno-face-core', 'juno-hand-mold', 'juno-hand-positive']));
    expect(page.items.every((i) => i.thumbnailUrl?.startsWith(`/api/casts/${i.id}/photos/`))).toBe(true);
  });
  it('narrows with every word: a name and a region, a kind in British spelling, a production, a place code', async () => {
    expect(labels((await find('archivist', { q: 'juno hand' })).body)).toEqual(keysToLabels(['juno-hand-mold', 'juno-hand-positive']));
    // "head" is both the head and the head and shoulders.
    expect(labels((await find('archivist', { q: 'parfitt head' })).body)).toEqual(keysToLabels(['oz-head-mold', 'oz-head-positive', 'oz-shoulders-mold', 'oz-shoulders-positive']));
    expect(labels((await find('archivist', { q: 'moulds tamsin' })).body)).toEqual(keysToLabels(['tamsin-face-mold', 'tamsin-foot-mold']));
    expect(labels((await find('archivist', { q: 'glass orchard' })).body)).toEqual(keysToLabels(['oz-shoulders-mold', 'oz-shoulders-positive', 'halvard-teeth-mold', 'halvard-teeth-positive']));
    // B2 is the crate in the North Store's second rack.
    expect(labels((await find('archivist', { q: 'b2' })).body)).toEqual(keysToLabels(['tamsin-foot-mold']));
    expect((await find('archivist', { q: 'qqqqzzzz' })).body.total).toBe(0);
  });
  it('a code path lists what is at that place and below it', async () => {
    const page = CastPageSchema.parse((await find('archivist', { q: 'gh/south/r2' })).body);
    expect(page.matched).toBe('code_path');
    expect(page.place?.breadcrumb).toBe('Gullhaven Studio Store › South Store › Rack 2 (heads and busts)');
    expect(page.items.every((i) => i.currentPath?.startsWith('GH/SOUTH/R2'))).toBe(true);
    expect(page.items.map((i) => i.labelCode).sort()).toEqual(keysToLabels(['oz-shoulders-positive', 'tamsin-face-mold']));
  });
  it('a label code, typed any way or read from a scanned label, finds its cast; a misread one is a 400 naming the box', async () => {
    const code = demoCastLabel('bea-arm-mold');
    expect(labels((await find('archivist', { q: code.toLowerCase().replace('-', '') })).body)).toEqual([code]);
    const scanned = CastPageSchema.parse((await find('archivist', { q: labelUrl(t.config.appOrigin, code) })).body);
    expect(scanned.matched).toBe('label');
    expect(scanned.items.map((i) => i.labelCode)).toEqual([code]);
    const misread = `${code.slice(0, -1)}${code.endsWith('0') ? '1' : '0'}`;
    const bad = await find('archivist', { q: misread });
    expect(bad.status).toBe(400);
    expect(ErrorBodySchema.parse(bad.body).error.details?.fields?.q?.[0]).toMatch(/does not check out/);
    const shelf = await placeByKey(t, 'north-r1-s1');
    const byShelfLabel = CastPageSchema.parse((await find('archivist', { q: shelf.labelCode })).body);
    expect(byShelfLabel.place?.path).toBe('GH/NORTH/R1/1');
    expect(byShelfLabel.items.map((i) => i.labelCode).sort()).toEqual(keysToLabels(['juno-face-mold']));
  });
  it('filters by region, kind, status and overdue, and pages on the server', async () => {
    expect(labels((await find('archivist', { region: 'teeth' })).body)).toEqual(keysToLabels(['halvard-teeth-mold', 'halvard-teeth-positive']));
    expect(labels((await find('archivist', { status: 'destroyed' })).body)).toEqual(keysToLabels(['halvard-teeth-mold']));
    expect(labels((await find('archivist', { kind: 'core' })).body)).toEqual(keysToLabels(['juno-face-core']));
    const overdue = CastPageSchema.parse((await find('archivist', { overdue: 'true' })).body);
    expect(overdue.items.map((i) => i.labelCode)).toEqual([demoCastLabel('oz-head-positive')]);
    expect(overdue.items[0]!.overdue).toBe(true);
    expect(overdue.items[0]!.where).toBe('With Rafe Lindqvist');
    const p1 = CastPageSchema.parse((await find('archivist', { pageSize: '7', sort: 'labelCode' })).body);
    const p3 = CastPageSchema.parse((await find('archivist', { pageSize: '7', page: '3', sort: 'labelCode' })).body);
    expect(p1.total).toBe(20);
    expect(p1.items).toHaveLength(7);
    expect(p3.items).toHaveLength(6);
    // The last, partial page carries the total as well as a full one; so does a page past the end.
    expect(p3.total).toBe(20);
    const past = CastPageSchema.parse((await find('archivist', { pageSize: '7', page: '4', sort: 'labelCode' })).body);
    expect(past.items).toHaveLength(0);
    expect(past.total).toBe(20);
    const exact = CastPageSchema.parse((await find('archivist', { pageSize: '10', page: '2', sort: 'labelCode' })).body);
    expect(exact.items).toHaveLength(10);
    expect(exact.total).toBe(20);
    expect(p1.items.map((i) => i.labelCode)).toEqual(keysToLabels(ARCHIVE_KEYS).slice(0, 7));
  });
  it('is open to staff who read casts; the performer and the administrator get 403', async () => {
    expect((await find('head', {})).body.total).toBe(20);
    expect((await find('artist', {})).body.total).toBe(20);
    expect((await find('performer', {})).status).toBe(403);
    expect((await find('admin', {})).status).toBe(403);
  });
  it('staff of a production with no business with the casts see none of them', async () => {
    // Sol Varga heads Saltglass Mile, where no cast comes from and none of their performers is engaged…
    const other = await t.db.db.insertInto('productions').values({ name: 'Unrelated Film', kind: 'film' }).returning('id').executeTakeFirstOrThrow();
    const user = await t.db.db.insertInto('users').values({ email: 'stranger@plinth.test', display_name: 'A Stranger' }).returning('id').executeTakeFirstOrThrow();
    await t.db.db.insertInto('memberships').values({ user_id: user.id, production_id: other.id, role: 'archivist' }).execute();
    const cookie = await t.sessionFor('stranger@plinth.test');
    const res = await api().get('/api/casts').set('Cookie', cookie);
    expect(res.body.total).toBe(0);
    const cast = await castByKey(t, 'juno-face-mold');
    expect((await api().get(`/api/casts/${cast.id}`).set('Cookie', cookie)).status).toBe(403);
  });
});

describe('GET /api/casts, the two ways a cast is in scope', () => {
  it('a cast made for another production, of a performer engaged here, is listed and counted once; that production sees it as its own', async () => {
    const juno = await t.db.db.selectFrom('casts').select(['performer_id', 'current_location_id', 'normal_location_id']).where('id', '=', (await castByKey(t, 'juno-face-mold')).id).executeTakeFirstOrThrow();
    const other = await t.db.db.insertInto('productions').values({ name: 'Lamplit Crossing', kind: 'film' }).returning('id').executeTakeFirstOrThrow();
    const made = await t.db.db
      .insertInto('casts')
      .values({ label_code: 'C-ELSEWHERE-1', performer_id: juno.performer_id, production_id: other.id, region: 'hand', kind: 'mold', material: 'Alginate over plaster bandage', made_on: '2026-10-01', made_by: 'Visiting lab', status: 'in_store', current_location_id: juno.current_location_id, normal_location_id: juno.normal_location_id, since: new Date() })
      .returning('id')
      .executeTakeFirstOrThrow();
    try {
      const all = CastPageSchema.parse((await find('archivist', { pageSize: '100' })).body);
      expect(all.total).toBe(21);
      expect(all.items.filter((i) => i.labelCode === 'C-ELSEWHERE-1')).toHaveLength(1);
      // The same with a filter the count reads off the covering indexes, and on a short last page.
      const hands = CastPageSchema.parse((await find('archivist', { region: 'hand', kind: 'mold' })).body);
      expect(hands.items.map((i) => i.labelCode).sort()).toEqual([...keysToLabels(['juno-hand-mold']), 'C-ELSEWHERE-1'].sort());
      expect(hands.total).toBe(2);
      const firstOfTwo = CastPageSchema.parse((await find('archivist', { region: 'hand', kind: 'mold', pageSize: '1' })).body);
      expect(firstOfTwo.items).toHaveLength(1);
      expect(firstOfTwo.total).toBe(2);
      // Staff of that production alone see it as theirs, and none of this production's casts.
      const user = await t.db.db.insertInto('users').values({ email: 'lamplit-archivist@plinth.test', display_name: 'Lamplit Archivist' }).returning('id').executeTakeFirstOrThrow();
      await t.db.db.insertInto('memberships').values({ user_id: user.id, production_id: other.id, role: 'archivist' }).execute();
      const theirs = CastPageSchema.parse((await api().get('/api/casts').set('Cookie', await t.sessionFor('lamplit-archivist@plinth.test'))).body);
      expect(theirs.items.map((i) => i.labelCode)).toEqual(['C-ELSEWHERE-1']);
      expect(theirs.total).toBe(1);
    } finally {
      await t.db.db.deleteFrom('cast_movements').where('cast_id', '=', made.id).execute();
      await t.db.db.deleteFrom('casts').where('id', '=', made.id).execute();
    }
  });
});

const ARCHIVE_KEYS = [
  'juno-face-mold', 'juno-face-positive', 'juno-face-core', 'juno-hand-mold', 'juno-hand-positive', 'oz-head-mold', 'oz-head-positive', 'oz-shoulders-mold', 'oz-shoulders-positive', 'halvard-teeth-mold',
  'halvard-teeth-positive', 'bea-torso-mold', 'bea-torso-positive', 'bea-arm-mold', 'tamsin-face-mold', 'tamsin-face-positive', 'tamsin-foot-mold', 'cory-head-mold', 'cory-head-positive', 'cory-leg-sculpt',
];

describe('GET /api/casts/:id', () => {
  it('shows where it is and normally lives, its whole history newest first, condition, photos, related casts and label address', async () => {
    const cast = await castByKey(t, 'juno-face-positive');
    const res = await api().get(`/api/casts/${cast.id}`).set('Cookie', as.archivist);
    expect(res.status).toBe(200);
    const d = CastDetailSchema.parse(res.body);
    expect(d.status).toBe('checked_out');
    expect(d.holder?.name).toBe('Sol Varga');
    expect(d.currentLocation).toBeNull();
    expect(d.normalLocation?.path).toBe('GH/SOUTH/R1/1');
    expect(d.movements.map((m) => m.kind)).toEqual(['check_out', 'check_in', 'check_out']);
    expect(d.movements.every((m) => m.movedBy === 'Nell Achterberg' && m.authorisedBy === 'Marta Oyelaran')).toBe(true);
    expect(d.movements[0]!.to).toBe('With Sol Varga');
    expect(d.movements[1]!.to).toBe('Gullhaven Studio Store › South Store › Rack 1 (positives) › Shelf 1 (GH/SOUTH/R1/1)');
    expect(d.pouredFrom?.labelCode).toBe(demoCastLabel('juno-face-mold'));
    expect(d.photos).toHaveLength(1);
    expect(d.allowedMovements).toEqual(['check_in']);
    expect(d.labelUrl).toBe(`${t.config.appOrigin}/archive/labels/${cast.labelCode}`);
    const mold = CastDetailSchema.parse((await api().get(`/api/casts/${d.pouredFrom!.id}`).set('Cookie', as.archivist)).body);
    expect(mold.pouredInto.map((c) => c.kind).sort()).toEqual(['core', 'positive']);
    expect(mold.condition).toBe('good');
  });
  it('the retention review follows the storage consent given to the cast’s own production', async () => {
    const teeth = CastDetailSchema.parse((await api().get(`/api/casts/${(await castByKey(t, 'halvard-teeth-positive')).id}`).set('Cookie', as.archivist)).body);
    expect(teeth.retention.state).toBe('due');
    expect(teeth.retention.reason).toMatch(/has passed/);
    expect(teeth.condition).toBe('poor');
    expect(teeth.conditionChecks[0]!.photos).toHaveLength(1);
    const juno = CastDetailSchema.parse((await api().get(`/api/casts/${(await castByKey(t, 'juno-face-mold')).id}`).set('Cookie', as.archivist)).body);
    expect(juno.retention.state).toBe('kept');
    // Five years (1825 days) from signing 38 days ago.
    expect(new Date(juno.retention.reviewOn!).getTime()).toBeGreaterThan(Date.now() + 1780 * 86_400_000);
  });
  it('staff who only read (head, artist) get no commands', async () => {
    const cast = await castByKey(t, 'juno-face-mold');
    const d = CastDetailSchema.parse((await api().get(`/api/casts/${cast.id}`).set('Cookie', as.artist)).body);
    expect(d.canManage).toBe(false);
    expect(d.allowedMovements).toEqual([]);
    expect((await api().get(`/api/casts/${cast.id}`).set('Cookie', as.performer)).status).toBe(403);
    expect((await api().get(`/api/casts/${cast.id}/people`).set('Cookie', as.head)).status).toBe(403);
  });
});

describe('POST /api/casts and PATCH /api/casts/:id', () => {
  async function body(over: Record<string, unknown> = {}) {
    return {
      performerId: await performerId(t, 'Beatrix Nwachukwu'),
      productionId: await productionId(t, 'The Lantern Keeper'),
      region: 'hand',
      kind: 'mold',
      material: 'Alginate',
      madeOn: '2026-11-20',
      madeBy: 'Rafe Lindqvist',
      locationId: (await placeByKey(t, 'north-r1-s3')).id,
      notes: 'Left hand, relaxed.',
      ...over,
    };
  }
  it('records a cast on a shelf with a new label code; the shelf is also its home', async () => {
    const res = await api().post('/api/casts').set('Cookie', as.archivist).send(await body());
    expect(res.status).toBe(201);
    const d = CastDetailSchema.parse(res.body);
    expect(isValidLabelCode(d.labelCode) && d.labelCode.startsWith('C-')).toBe(true);
    expect(d.currentLocation?.path).toBe('GH/NORTH/R1/3');
    expect(d.normalLocation?.path).toBe('GH/NORTH/R1/3');
    expect(d.status).toBe('in_store');
    expect(d.movements).toEqual([]);
  });
  it('refuses a cast put in a room, an unknown place, a positive as a source and a mold of another performer, saving nothing', async () => {
    const before = await archiveCounts(t);
    const room = await api().post('/api/casts').set('Cookie', as.archivist).send(await body({ locationId: (await placeByKey(t, 'north')).id }));
    expect(room.status).toBe(400);
    expect(ErrorBodySchema.parse(room.body).error.details?.fields?.locationId?.[0]).toMatch(/on a shelf or in a bin/);
    const unknown = await api().post('/api/casts').set('Cookie', as.archivist).send(await body({ locationId: '00000000-0000-4000-8000-000000000000' }));
    expect(ErrorBodySchema.parse(unknown.body).error.details?.fields?.locationId).toEqual(['That place was not found.']);
    const positive = await castByKey(t, 'bea-torso-positive');
    const fromPositive = await api().post('/api/casts').set('Cookie', as.archivist).send(await body({ kind: 'positive', pouredFromId: positive.id }));
    expect(ErrorBodySchema.parse(fromPositive.body).error.details?.fields?.pouredFromId).toEqual(['Choose the mold this cast was poured from.']);
    const othersMold = await castByKey(t, 'juno-hand-mold');
    const wrongPerformer = await api().post('/api/casts').set('Cookie', as.archivist).send(await body({ kind: 'positive', pouredFromId: othersMold.id }));
    expect(ErrorBodySchema.parse(wrongPerformer.body).error.details?.fields?.pouredFromId).toEqual(['The mold belongs to a different performer.']);
    expect(await archiveCounts(t)).toEqual(before);
  });
  it('only an archivist records casts', async () => {
    for (const who of ['head', 'lead', 'artist', 'performer', 'admin'] as const) {
      expect((await api().post('/api/casts').set('Cookie', as[who]).send(await body())).status, who).toBe(403);
    }
  });
  it('corrects a cast at its version; a stale edit is 409; a mold others were poured from stays a mold', async () => {
    const mold = await castByKey(t, 'bea-torso-mold');
    const fields = { region: 'torso', kind: 'mold', material: 'Plaster bandage over clingfilm', madeOn: '2026-10-01', madeBy: 'Rafe Lindqvist', pouredFromId: null, notes: null };
    const ok = await api().patch(`/api/casts/${mold.id}`).set('Cookie', as.archivist).send({ ...fields, version: mold.version });
    expect(ok.status).toBe(200);
    expect(CastDetailSchema.parse(ok.body).material).toBe('Plaster bandage over clingfilm');
    const stale = await api().patch(`/api/casts/${mold.id}`).set('Cookie', as.archivist).send({ ...fields, material: 'Other', version: mold.version });
    expect(stale.status).toBe(409);
    const kind = await api().patch(`/api/casts/${mold.id}`).set('Cookie', as.archivist).send({ ...fields, kind: 'other', version: mold.version + 1 });
    expect(ErrorBodySchema.parse(kind.body).error.details?.fields?.kind).toEqual(['Casts were poured from this mold; it stays a mold.']);
  });
});

describe('GET /api/performers/:id/casts', () => {
  it('staff who may see the performer see the archive’s lines; the performer sees their own and where each is kept', async () => {
    const juno = await performerId(t, 'Juno Castellane');
    const staff = PerformerCastsSchema.parse((await api().get(`/api/performers/${juno}/casts`).set('Cookie', as.artist)).body);
    expect(staff.view).toBe('staff');
    if (staff.view !== 'staff') return;
    expect(staff.items).toHaveLength(5);
    expect(staff.canAdd).toBe(false);
    const own = await api().get(`/api/performers/${juno}/casts`).set('Cookie', as.performer);
    const mine = PerformerCastsSchema.parse(own.body);
    expect(mine.view).toBe('own');
    if (mine.view !== 'own') return;
    expect(mine.items.map((c) => c.labelCode).sort()).toEqual(keysToLabels(['juno-face-mold', 'juno-face-positive', 'juno-face-core', 'juno-hand-mold', 'juno-hand-positive']));
    const out = mine.items.find((c) => c.labelCode === demoCastLabel('juno-face-positive'))!;
    expect(out.where).toBe('Out of the store with the department, for work on the production');
    expect(own.text).not.toContain('Sol Varga');
    expect(mine.items.find((c) => c.labelCode === demoCastLabel('juno-face-mold'))!.where).toMatch(/^Gullhaven Studio Store › North Store/);
    const oz = await performerId(t, 'Oswin Parfitt-Reyes');
    expect((await api().get(`/api/performers/${oz}/casts`).set('Cookie', as.performer)).status).toBe(403);
    expect((await api().get(`/api/performers/${oz}/casts`).set('Cookie', as.admin)).status).toBe(403);
    const archivist = PerformerCastsSchema.parse((await api().get(`/api/performers/${oz}/casts`).set('Cookie', as.archivist)).body);
    expect(archivist.view === 'staff' && archivist.canAdd).toBe(true);
  });
});

describe('GET /api/archive/retention and the archivist’s home', () => {
  it('lists the cast past its review date as due, and those whose consent ends within weeks as soon', async () => {
    const res = await api().get('/api/archive/retention').set('Cookie', as.archivist);
    const list = RetentionListSchema.parse(res.body);
    expect(list.due.map((r) => r.cast.labelCode)).toEqual([demoCastLabel('halvard-teeth-positive')]);
    expect(list.soon.map((r) => r.cast.labelCode).sort()).toEqual(keysToLabels(['oz-shoulders-mold', 'oz-shoulders-positive']));
  });
  it('a withdrawn storage consent makes the performer’s casts due at once', async () => {
    const bea = await performerId(t, 'Beatrix Nwachukwu');
    await t.db.db.updateTable('consents').set({ withdrawn_at: new Date(Date.now() - 60_000) }).where('performer_id', '=', bea).where('kind', '=', 'cast_storage').execute();
    const list = RetentionListSchema.parse((await api().get('/api/archive/retention').set('Cookie', as.archivist)).body);
    const beas = list.due.filter((r) => r.cast.performerId === bea);
    // Bea's torso positive is on loan, but it is hers all the same.
    expect(beas.map((r) => r.cast.labelCode).sort()).toEqual(keysToLabels(['bea-torso-mold', 'bea-torso-positive', 'bea-arm-mold']));
    expect(beas[0]!.retention.reason).toMatch(/withdrew their storage consent/);
  });
  it('the archivist’s home counts the overdue check-out and the cast due for review, with links', async () => {
    const home = HomeSchema.parse((await api().get('/api/home').set('Cookie', as.archivist)).body);
    expect(home.role).toBe('archivist');
    const overdue = home.tasks.find((x) => x.id === 'casts-overdue')!;
    expect(overdue.count).toBe(1);
    expect(overdue.detail).toContain(`${demoCastLabel('oz-head-positive')} (Rafe Lindqvist)`);
    expect(overdue.href).toBe('/archive?overdue=true');
    expect(home.tasks.find((x) => x.id === 'casts-retention-due')!.count).toBe(1);
  });
});
