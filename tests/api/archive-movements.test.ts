// Movements against the location-and-movement control requirements of Spectrum 5.0 (Collections
// Trust): one current location per object, normal and current location kept apart, mover and
// authoriser recorded for every move, and the history of previous locations kept.
import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { ErrorBodySchema } from '#shared/errors.ts';
import { CastDetailSchema, PeopleSchema } from '#shared/schemas/archive.ts';
import { createTestApp, type TestApp } from '../support/app.ts';
import { archiveCounts, castByKey, castRow, placeByKey } from '../fixtures/archive.ts';
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
const DAY = 86_400_000;
const who = { movedBy: 'Nell Achterberg', authorisedBy: 'Marta Oyelaran' };
const move = (id: string, body: object, as_: Who = 'archivist') => api().post(`/api/casts/${id}/movements`).set('Cookie', as[as_]).send(body);
const fields = (res: request.Response) => ErrorBodySchema.parse(res.body).error.details?.fields ?? {};

/** Sends a refused move and checks it saved nothing: the cast row, its history and every table stay as they were. */
async function refused(id: string, body: object) {
  const before = { counts: await archiveCounts(t), row: await castRow(t, id) };
  const res = await move(id, body);
  expect(res.status).toBe(400);
  expect(ErrorBodySchema.parse(res.body).error.code).toBe('validation_failed');
  expect(await archiveCounts(t)).toEqual(before.counts);
  expect(await castRow(t, id)).toEqual(before.row);
  return res;
}

describe('check-out and check-in', () => {
  it('a check-out to a member of staff records holder, reason, due date, mover and authoriser; the normal home stays', async () => {
    const cast = await castByKey(t, 'tamsin-face-positive');
    const people = PeopleSchema.parse((await api().get(`/api/casts/${cast.id}/people`).set('Cookie', as.archivist)).body);
    const rafe = people.items.find((p) => p.name === 'Rafe Lindqvist')!;
    const due = new Date(Date.now() + 5 * DAY).toISOString();
    const res = await move(cast.id, { kind: 'check_out', version: cast.version, ...who, holderUserId: rafe.userId, reason: 'Sculpting the young Keeper’s brow', dueBackAt: due });
    expect(res.status).toBe(201);
    const d = CastDetailSchema.parse(res.body);
    expect(d.status).toBe('checked_out');
    expect(d.holder).toEqual({ name: 'Rafe Lindqvist', userId: rafe.userId });
    // Spectrum: "only one place … to record an object's location": no shelf while it is with a person.
    expect(d.currentLocation).toBeNull();
    expect(d.normalLocation?.path).toBe('GH/SOUTH/R1/1');
    expect(d.dueBackAt).toBe(due);
    expect(d.movements[0]).toMatchObject({ kind: 'check_out', movedBy: 'Nell Achterberg', authorisedBy: 'Marta Oyelaran', to: 'With Rafe Lindqvist', reason: 'Sculpting the young Keeper’s brow' });
    expect(d.movements[0]!.from).toMatch(/\(GH\/SOUTH\/R1\/1\)$/);
    const audit = await t.db.db.selectFrom('audit_log').select('details').where('action', '=', 'cast.move').where('entity_id', '=', cast.id).executeTakeFirstOrThrow();
    expect(audit.details).toMatchObject({ kind: 'check_out', statusAfter: 'checked_out', authorisedBy: 'Marta Oyelaran' });

    const back = await move(cast.id, { kind: 'check_in', version: d.version, ...who });
    const after = CastDetailSchema.parse(back.body);
    expect(after.status).toBe('in_store');
    expect(after.currentLocation?.path).toBe('GH/SOUTH/R1/1');
    expect(after.dueBackAt).toBeNull();
    expect(after.movements.map((m) => m.kind)).toEqual(['check_in', 'check_out']);
  });
  it('refuses to move a cast that is checked out, and to check in a cast that is not out', async () => {
    const out = await castByKey(t, 'juno-face-positive');
    const shelf = await placeByKey(t, 'south-r1-s2');
    const moving = await refused(out.id, { kind: 'relocation', version: out.version, ...who, to: shelf.id });
    expect(ErrorBodySchema.parse(moving.body).error.message).toBe('This cast is checked out to Sol Varga. Check it in before recording a relocation.');
    expect(fields(moving)['']).toEqual(['This cast is checked out to Sol Varga. Check it in before recording a relocation.']);
    const again = await refused(out.id, { kind: 'check_out', version: out.version, ...who, holder: 'Someone Else', reason: 'Fitting', dueBackAt: new Date(Date.now() + DAY).toISOString() });
    expect(ErrorBodySchema.parse(again.body).error.message).toMatch(/checked out to Sol Varga/);
    const inStore = await castByKey(t, 'cory-head-mold');
    const checkIn = await refused(inStore.id, { kind: 'check_in', version: inStore.version, ...who });
    expect(ErrorBodySchema.parse(checkIn.body).error.message).toBe('This cast is in store, not out, so there is nothing to check in. To move it to another shelf, record a relocation.');
  });
  it('names each missing piece of a check-out: who takes it, why, until when, who moves and who authorised', async () => {
    const cast = await castByKey(t, 'cory-head-mold');
    const res = await refused(cast.id, { kind: 'check_out', version: cast.version, movedBy: ' ', authorisedBy: '', holder: '', reason: '', dueBackAt: new Date(Date.now() - DAY).toISOString() });
    expect(fields(res)).toEqual({
      movedBy: ['Say who is moving the cast.'],
      authorisedBy: ['Say who authorised this move.'],
      holder: ['Say who is taking the cast.'],
      reason: ['Give the reason for the check-out.'],
      dueBackAt: ['The due-back date is in the past; choose a later one.'],
    });
  });
  it('a holder chosen from the list must work on the cast’s productions', async () => {
    const cast = await castByKey(t, 'cory-head-mold');
    const stranger = await t.db.db.insertInto('users').values({ email: 'stranger@plinth.test', display_name: 'A Stranger' }).returning('id').executeTakeFirstOrThrow();
    const res = await refused(cast.id, { kind: 'check_out', version: cast.version, ...who, holderUserId: stranger.id, reason: 'x', dueBackAt: new Date(Date.now() + DAY).toISOString() });
    expect(fields(res).holderUserId).toEqual(['Choose someone who works on this cast’s productions.']);
  });
  it('answers 409 to a move based on an old version of the cast, and records nothing', async () => {
    const cast = await castByKey(t, 'cory-head-mold');
    const before = await archiveCounts(t);
    const res = await move(cast.id, { kind: 'return_to_performer', version: cast.version + 5, ...who });
    expect(res.status).toBe(409);
    expect(await archiveCounts(t)).toEqual(before);
  });
});

describe('relocation', () => {
  it('moves a cast to another shelf; the normal home changes only when asked', async () => {
    const cast = await castByKey(t, 'cory-head-mold');
    const shelf = await placeByKey(t, 'north-r2-s3');
    const moved = CastDetailSchema.parse((await move(cast.id, { kind: 'relocation', version: cast.version, ...who, to: shelf.id, reason: 'Making room' })).body);
    expect(moved.currentLocation?.path).toBe('GH/NORTH/R2/3');
    expect(moved.normalLocation?.path).toBe('GH/NORTH/R2/2');
    const homed = CastDetailSchema.parse((await move(cast.id, { kind: 'relocation', version: moved.version, ...who, to: shelf.id, alsoNormal: true })).body);
    expect(homed.normalLocation?.path).toBe('GH/NORTH/R2/3');
    // History of previous locations kept, oldest last.
    expect(homed.movements.map((m) => m.from)).toEqual([expect.stringContaining('GH/NORTH/R2/3'), expect.stringContaining('GH/NORTH/R2/2')]);
  });
  it('refuses a room, an unknown place, and the shelf it is already on', async () => {
    const cast = await castByKey(t, 'cory-head-mold');
    const room = await placeByKey(t, 'south');
    expect(fields(await refused(cast.id, { kind: 'relocation', version: cast.version, ...who, to: room.id })).to?.[0]).toMatch(/not straight into a room/);
    expect(fields(await refused(cast.id, { kind: 'relocation', version: cast.version, ...who, to: '00000000-0000-4000-8000-000000000000' })).to).toEqual(['That place was not found.']);
    const here = await placeByKey(t, 'north-r2-s2');
    expect(fields(await refused(cast.id, { kind: 'relocation', version: cast.version, ...who, to: here.id })).to).toEqual(['The cast is already there.']);
    expect(fields(await refused(cast.id, { kind: 'relocation', version: cast.version, ...who })).to).toEqual(['Choose where the cast goes.']);
  });
});

describe('loan, return to performer, destruction', () => {
  it('a loan goes to another production until checked in', async () => {
    const cast = await castByKey(t, 'cory-leg-sculpt');
    const loaned = CastDetailSchema.parse((await move(cast.id, { kind: 'loan', version: cast.version, ...who, production: 'Saltglass Mile', contact: 'Sol Varga', reason: 'Matching shin', dueBackAt: new Date(Date.now() + 10 * DAY).toISOString() })).body);
    expect(loaned.status).toBe('on_loan');
    expect(loaned.where).toBe('On loan to Saltglass Mile');
    expect(loaned.movements[0]!.contact).toBe('Sol Varga');
    expect(loaned.allowedMovements).toEqual(['check_in']);
  });
  it('a return to the performer ends the archive’s hold and frees the shelf', async () => {
    const cast = await castByKey(t, 'halvard-teeth-positive');
    const gone = CastDetailSchema.parse((await move(cast.id, { kind: 'return_to_performer', version: cast.version, ...who, reason: 'Storage consent ended' })).body);
    expect(gone.status).toBe('returned_to_performer');
    expect(gone.normalLocation).toBeNull();
    expect(gone.retention.state).toBe('ended');
    expect(gone.allowedMovements).toEqual([]);
    const bin = await placeByKey(t, 'north-r1-s2-b1');
    // The destroyed mold and the returned positive no longer hold the bin: it can be removed.
    expect((await api().delete(`/api/archive/locations/${bin.id}?version=${bin.version}`).set('Cookie', as.archivist)).status).toBe(204);
  });
  it('a destruction needs a reason and a witness who is not the mover, then nothing can move the cast again', async () => {
    const cast = await castByKey(t, 'bea-arm-mold');
    const base = { kind: 'destruction', version: cast.version, ...who, method: 'Broken up and discarded' };
    const noWitness = await refused(cast.id, { ...base, reason: 'Storage consent withdrawn' });
    expect(fields(noWitness).witness).toEqual(['A destruction needs a witness.']);
    const selfWitness = await refused(cast.id, { ...base, witness: '  nell achterberg ', reason: 'Storage consent withdrawn' });
    expect(fields(selfWitness).witness).toEqual(['The witness must be someone other than the person destroying the cast.']);
    const noReason = await refused(cast.id, { ...base, witness: 'Ines Calloway' });
    expect(fields(noReason).reason).toEqual(['Give the reason for destroying the cast.']);
    const done = CastDetailSchema.parse((await move(cast.id, { ...base, witness: 'Ines Calloway', reason: 'Storage consent withdrawn' })).body);
    expect(done.status).toBe('destroyed');
    expect(done.movements[0]).toMatchObject({ kind: 'destruction', witness: 'Ines Calloway', method: 'Broken up and discarded', to: 'Destroyed' });
    const after = await refused(cast.id, { kind: 'relocation', version: done.version, ...who, to: (await placeByKey(t, 'north-r1-s1')).id });
    expect(ErrorBodySchema.parse(after.body).error.message).toBe('This cast has been destroyed; no further movement can be recorded.');
  });
  it('only the archivist records moves', async () => {
    const cast = await castByKey(t, 'cory-head-mold');
    for (const w of ['head', 'lead', 'artist', 'performer', 'admin'] as const) {
      expect((await move(cast.id, { kind: 'return_to_performer', version: cast.version, ...who }, w)).status, w).toBe(403);
    }
    expect((await move('00000000-0000-4000-8000-000000000000', { kind: 'return_to_performer', version: 1, ...who })).status).toBe(404);
  });
  it('an unknown kind of move is a 400 naming the kinds', async () => {
    const cast = await castByKey(t, 'cory-head-mold');
    const res = await move(cast.id, { kind: 'teleport', version: cast.version });
    expect(res.status).toBe(400);
    expect(JSON.stringify(fields(res))).toContain('Choose check-out, check-in, relocation, loan, return to performer or destruction.');
  });
});

describe('POST /api/casts/:id/condition-checks', () => {
  it('records a check; the newest is the cast’s condition', async () => {
    const cast = await castByKey(t, 'juno-face-mold');
    const today = new Date().toISOString().slice(0, 10);
    const res = await api().post(`/api/casts/${cast.id}/condition-checks`).set('Cookie', as.archivist).send({ checkedOn: today, checkedBy: 'Nell Achterberg', grade: 'damaged', notes: 'Edge of the left nostril chipped in the move.' });
    expect(res.status).toBe(201);
    const d = CastDetailSchema.parse(res.body);
    expect(d.condition).toBe('damaged');
    expect(d.conditionChecks.map((k) => k.grade)).toEqual(['damaged', 'good']);
  });
  it('refuses a date ahead, no checker, and poor or damaged without notes; saves nothing', async () => {
    const cast = await castByKey(t, 'juno-face-mold');
    const before = await archiveCounts(t);
    const ahead = new Date(Date.now() + 3 * DAY).toISOString().slice(0, 10);
    const res = await api().post(`/api/casts/${cast.id}/condition-checks`).set('Cookie', as.archivist).send({ checkedOn: ahead, checkedBy: '', grade: 'poor' });
    expect(res.status).toBe(400);
    expect(fields(res)).toEqual({
      checkedBy: ['Say who checked the cast.'],
      checkedOn: ['A condition check cannot be dated in the future.'],
      notes: ['Describe what is wrong, so later checks can tell new damage from old.'],
    });
    const grade = await api().post(`/api/casts/${cast.id}/condition-checks`).set('Cookie', as.archivist).send({ checkedOn: '2026-11-01', checkedBy: 'Nell', grade: 'splendid' });
    expect(fields(grade).grade).toEqual(['Choose good, fair, poor or damaged.']);
    expect(await archiveCounts(t)).toEqual(before);
    expect((await api().post(`/api/casts/${cast.id}/condition-checks`).set('Cookie', as.head).send({ checkedOn: '2026-11-01', checkedBy: 'M', grade: 'good' })).status).toBe(403);
  });
});
