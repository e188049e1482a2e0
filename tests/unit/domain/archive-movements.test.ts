import { describe, expect, it } from 'vitest';
import { CAST_STATUSES, type CastStatus } from '#shared/domain/archive-casts.ts';
import type { LocationNode } from '#shared/domain/archive-locations.ts';
import {
  applyMovement,
  hasBeenAt,
  initialCastState,
  locationHistory,
  MOVEMENT_KINDS,
  movementAllowed,
  placeAt,
  replayMovements,
  type CastState,
  type Movement,
  type MovementKind,
  type PlaceRef,
} from '#shared/domain/archive-movements.ts';
import { castsAtLocation, castsHomedAt, findByLabelCode } from '#shared/domain/archive-search.ts';
import { labelCodeFromNumber } from '#shared/domain/label-codes.ts';

const d = (iso: string) => new Date(iso);
const SHELF: PlaceRef = { id: 's3', level: 'shelf' };
const BIN: PlaceRef = { id: 'b4', level: 'bin' };
const OTHER_SHELF: PlaceRef = { id: 's1', level: 'shelf' };
const ROOM: PlaceRef = { id: 'north', level: 'room' };
const NOW = d('2026-10-10T12:00:00Z');

const who = { movedBy: 'Nell Achterberg', authorisedBy: 'Marta Oyelaran' };

function stored(at = d('2026-10-01T09:00:00Z')): CastState {
  const r = initialCastState(SHELF, at);
  if (!r.ok) throw new Error('fixture');
  return r.state;
}

const checkOut = (at: string, extra: Partial<Extract<Movement, { kind: 'check_out' }>> = {}): Movement => ({
  kind: 'check_out',
  ...who,
  at: d(at),
  holder: 'Rafe Lindqvist',
  reason: 'Sculpting a brow appliance',
  dueBackAt: d('2026-10-20T17:00:00Z'),
  ...extra,
});

function must(state: CastState, m: Movement, now = NOW) {
  const r = applyMovement(state, m, now);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r;
}

function stateIn(status: CastStatus): CastState {
  const base = stored();
  switch (status) {
    case 'in_store':
      return base;
    case 'checked_out':
      return must(base, checkOut('2026-10-02T09:00:00Z')).state;
    case 'on_loan':
      return must(base, { kind: 'loan', ...who, at: d('2026-10-02T09:00:00Z'), production: 'Saltglass Mile', dueBackAt: d('2026-11-30T17:00:00Z') }).state;
    case 'returned_to_performer':
      return must(base, { kind: 'return_to_performer', ...who, at: d('2026-10-02T09:00:00Z') }).state;
    case 'destroyed':
      return must(base, { kind: 'destruction', ...who, at: d('2026-10-02T09:00:00Z'), witness: 'Ines Calloway', reason: 'Mold torn beyond repair' }).state;
  }
}

function sampleMove(kind: MovementKind, at = '2026-10-05T09:00:00Z'): Movement {
  const base = { ...who, at: d(at) };
  switch (kind) {
    case 'check_out':
      return checkOut(at);
    case 'check_in':
      return { kind, ...base };
    case 'relocation':
      return { kind, ...base, to: BIN };
    case 'loan':
      return { kind, ...base, production: 'Saltglass Mile', dueBackAt: d('2026-12-01T17:00:00Z') };
    case 'return_to_performer':
      return { kind, ...base };
    case 'destruction':
      return { kind, ...base, witness: 'Ines Calloway', reason: 'Consent withdrawn' };
  }
}

describe('which moves each status allows', () => {
  // common practice, no published source: what leaves the store starts in store; a check-in brings
  // back what is out; a returned or destroyed cast is no longer held.
  const expected: Record<MovementKind, CastStatus[]> = {
    check_out: ['in_store'],
    check_in: ['checked_out', 'on_loan'],
    relocation: ['in_store'],
    loan: ['in_store'],
    return_to_performer: ['in_store'],
    destruction: ['in_store'],
  };
  it('matches the table for every kind and status, and applyMovement agrees with it', () => {
    for (const kind of MOVEMENT_KINDS) {
      for (const status of CAST_STATUSES) {
        const allowed = expected[kind].includes(status);
        expect(movementAllowed(kind, status), `${kind} from ${status}`).toBe(allowed);
        const r = applyMovement(stateIn(status), sampleMove(kind));
        expect(r.ok ? true : !('' in r.errors), `${kind} from ${status} applied`).toBe(allowed);
      }
    }
  });
});

describe('what each move does', () => {
  it('a new cast goes in store at a storage place, which becomes its home', () => {
    expect(stored()).toMatchObject({ status: 'in_store', normalLocationId: 's3', current: { kind: 'location', locationId: 's3' } });
    const r = initialCastState(ROOM, NOW);
    expect(r.ok ? null : r.errors).toEqual({ locationId: [expect.stringMatching(/shelf or in a bin/)] });
  });
  it('check-out puts the cast with a person, not on a shelf, until its due-back date', () => {
    const r = must(stored(), checkOut('2026-10-02T09:00:00Z'));
    expect(r.state.status).toBe('checked_out');
    expect(r.state.current).toEqual({ kind: 'person', holder: 'Rafe Lindqvist' });
    expect(r.state.dueBackAt).toEqual(d('2026-10-20T17:00:00Z'));
    expect(r.record).toMatchObject({ from: { kind: 'location', locationId: 's3' }, to: { kind: 'person', holder: 'Rafe Lindqvist' }, reason: 'Sculpting a brow appliance' });
  });
  it('loan puts the cast with another production until its due date', () => {
    const s = stateIn('on_loan');
    expect(s).toMatchObject({ status: 'on_loan', current: { kind: 'production', production: 'Saltglass Mile' }, dueBackAt: d('2026-11-30T17:00:00Z') });
  });
  it('return to performer and destruction are final and free the cast’s home', () => {
    expect(stateIn('returned_to_performer')).toMatchObject({ status: 'returned_to_performer', current: { kind: 'performer' }, normalLocationId: null });
    expect(stateIn('destroyed')).toMatchObject({ status: 'destroyed', current: { kind: 'destroyed' }, normalLocationId: null });
  });
  it('does not change the state it was given', () => {
    const s = Object.freeze(stored());
    must(s, checkOut('2026-10-02T09:00:00Z'));
    expect(s.status).toBe('in_store');
  });
});

describe('location and movement control', () => {
  // Spectrum 5.0 (Collections Trust): "only one place in your documentation system to record an
  // object's location"; units of information: Current location, "Record once for any object at any one time".
  it('one current location per cast: out with a person, the shelf no longer lists it', () => {
    const out = must(stored(), checkOut('2026-10-02T09:00:00Z')).state;
    const casts = [{ id: 'c1', ...out }];
    const nodes: LocationNode[] = [{ id: 's3', parentId: null, level: 'shelf', code: '3', name: 'Shelf 3' }];
    expect(castsAtLocation(casts, 's3', nodes)).toEqual([]);
    expect(out.current.kind).toBe('person');
  });

  // Collections Trust minimum requirements: record the normal location, and the location when not at normal.
  it('normal vs current location: a check-out keeps the home, a check-in returns to it by default', () => {
    const out = must(stored(), checkOut('2026-10-02T09:00:00Z')).state;
    expect(out.normalLocationId).toBe('s3');
    expect(castsHomedAt([{ id: 'c1', ...out }], 's3').map((c) => c.id)).toEqual(['c1']);
    const back = must(out, { kind: 'check_in', ...who, at: d('2026-10-03T09:00:00Z') }).state;
    expect(back).toMatchObject({ status: 'in_store', current: { kind: 'location', locationId: 's3' }, normalLocationId: 's3', dueBackAt: null });
  });
  it('normal vs current location: a check-in elsewhere, or a plain relocation, leaves the home alone', () => {
    const out = must(stored(), checkOut('2026-10-02T09:00:00Z')).state;
    const elsewhere = must(out, { kind: 'check_in', ...who, at: d('2026-10-03T09:00:00Z'), to: BIN }).state;
    expect(elsewhere).toMatchObject({ current: { kind: 'location', locationId: 'b4' }, normalLocationId: 's3' });
    const moved = must(stored(), { kind: 'relocation', ...who, at: d('2026-10-03T09:00:00Z'), to: OTHER_SHELF }).state;
    expect(moved).toMatchObject({ current: { kind: 'location', locationId: 's1' }, normalLocationId: 's3' });
  });
  it('normal vs current location: a relocation may move the home too', () => {
    const moved = must(stored(), { kind: 'relocation', ...who, at: d('2026-10-03T09:00:00Z'), to: OTHER_SHELF, alsoNormal: true }).state;
    expect(moved).toMatchObject({ current: { kind: 'location', locationId: 's1' }, normalLocationId: 's1' });
    // Making the place it already sits on its home is a move of the home alone.
    const away = must(stored(), { kind: 'relocation', ...who, at: d('2026-10-03T09:00:00Z'), to: OTHER_SHELF }).state;
    const rehomed = must(away, { kind: 'relocation', ...who, at: d('2026-10-04T09:00:00Z'), to: OTHER_SHELF, alsoNormal: true }).state;
    expect(rehomed.normalLocationId).toBe('s1');
  });

  // Collections Trust minimum requirements: record the mover and the authoriser.
  it('mover and authoriser are recorded, and a move without either is refused', () => {
    const r = must(stored(), checkOut('2026-10-02T09:00:00Z'));
    expect(r.record).toMatchObject({ movedBy: 'Nell Achterberg', authorisedBy: 'Marta Oyelaran', at: d('2026-10-02T09:00:00Z') });
    const bad = applyMovement(stored(), checkOut('2026-10-02T09:00:00Z', { movedBy: ' ', authorisedBy: '' }), NOW);
    expect(bad.ok ? null : Object.keys(bad.errors).sort()).toEqual(['authorisedBy', 'movedBy']);
  });

  // Collections Trust minimum requirements: keep the history of previous locations.
  it('history is kept: every place with its dates, and where the cast was at any moment', () => {
    const moves: Movement[] = [
      checkOut('2026-10-02T09:00:00Z'),
      { kind: 'check_in', ...who, at: d('2026-10-03T09:00:00Z'), to: BIN },
      { kind: 'relocation', ...who, at: d('2026-10-04T09:00:00Z'), to: SHELF },
    ];
    const r = replayMovements(stored(), moves, NOW);
    if (!r.ok) throw new Error('replay');
    expect(r.records).toHaveLength(3);
    expect(locationHistory(r.records).map((s) => [s.place.kind === 'location' ? s.place.locationId : s.place.kind, s.from?.toISOString().slice(0, 10) ?? null])).toEqual([
      ['s3', null],
      ['person', '2026-10-02'],
      ['b4', '2026-10-03'],
      ['s3', '2026-10-04'],
    ]);
    expect(placeAt(r.records, d('2026-10-01T12:00:00Z'))).toEqual({ kind: 'location', locationId: 's3' });
    expect(placeAt(r.records, d('2026-10-02T10:00:00Z'))).toEqual({ kind: 'person', holder: 'Rafe Lindqvist' });
    expect(placeAt(r.records, d('2026-10-03T12:00:00Z'))).toEqual({ kind: 'location', locationId: 'b4' });
    expect(hasBeenAt(r.records, { kind: 'location', locationId: 'b4' })).toBe(true);
    expect(hasBeenAt(r.records, { kind: 'location', locationId: 's1' })).toBe(false);
  });
  it('history replay stops at the first refused move and says which', () => {
    const r = replayMovements(stored(), [checkOut('2026-10-02T09:00:00Z'), checkOut('2026-10-03T09:00:00Z')], NOW);
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.index).toBe(1);
      expect(r.records).toHaveLength(1);
    }
  });

  // Collections Trust minimum requirements: access by object number and by location name.
  it('lookup by object number: a label code typed any way finds the cast, a misread one finds nothing', () => {
    const casts = [
      { id: 'c1', labelCode: labelCodeFromNumber('cast', 0) },
      { id: 'c2', labelCode: labelCodeFromNumber('cast', 7_654_321) },
    ];
    const typed = casts[1]!.labelCode.toLowerCase().replace('-', ' ');
    expect(findByLabelCode(casts, typed)?.id).toBe('c2');
    const body = casts[1]!.labelCode.slice(2);
    const misread = `C-${body[0] === 'Z' ? 'Y' : 'Z'}${body.slice(1)}`;
    expect(findByLabelCode(casts, misread)).toBeNull();
  });
  it('lookup by location: a room lists the casts on all its shelves and bins', () => {
    const nodes: LocationNode[] = [
      { id: 'north', parentId: null, level: 'room', code: 'NORTH', name: 'North Room' },
      { id: 'r2', parentId: 'north', level: 'rack', code: 'R2', name: 'Rack 2' },
      { id: 's3', parentId: 'r2', level: 'shelf', code: '3', name: 'Shelf 3' },
      { id: 'b4', parentId: 's3', level: 'bin', code: 'B4', name: 'Bin B4' },
      { id: 's1', parentId: null, level: 'shelf', code: '1', name: 'Loose shelf' },
    ];
    const casts = [
      { id: 'on-shelf', current: { kind: 'location' as const, locationId: 's3' } },
      { id: 'in-bin', current: { kind: 'location' as const, locationId: 'b4' } },
      { id: 'elsewhere', current: { kind: 'location' as const, locationId: 's1' } },
      { id: 'out', current: { kind: 'person' as const, holder: 'Sol Varga' } },
    ];
    expect(castsAtLocation(casts, 'north', nodes).map((c) => c.id)).toEqual(['on-shelf', 'in-bin']);
    expect(castsAtLocation(casts, 's3', nodes, { includeBelow: false }).map((c) => c.id)).toEqual(['on-shelf']);
  });
});
