import { describe, expect, it } from 'vitest';
import {
  applyMovement,
  daysOverdue,
  initialCastState,
  isOverdue,
  MOVEMENT_KINDS,
  type CastState,
  type Movement,
  type MovementKind,
} from '#shared/domain/archive-movements.ts';

const d = (iso: string) => new Date(iso);
const NOW = d('2026-10-10T12:00:00Z');
const who = { movedBy: 'Nell Achterberg', authorisedBy: 'Marta Oyelaran' };
const at = d('2026-10-09T09:00:00Z');

function stored(): CastState {
  const r = initialCastState({ id: 's3', level: 'shelf' }, d('2026-10-01T09:00:00Z'));
  if (!r.ok) throw new Error('fixture');
  return r.state;
}

function errorsOf(state: CastState, m: Movement, now: Date | null = NOW) {
  const r = applyMovement(state, m, now ?? undefined);
  if (r.ok) throw new Error(`expected a refusal for ${m.kind}`);
  return r.errors;
}

function after(state: CastState, m: Movement): CastState {
  const r = applyMovement(state, m, NOW);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.state;
}

const checkedOut = () =>
  after(stored(), { kind: 'check_out', ...who, at: d('2026-10-02T09:00:00Z'), holder: 'Rafe Lindqvist', reason: 'Sculpting', dueBackAt: d('2026-10-20T17:00:00Z') });

function anyMove(kind: MovementKind): Movement {
  const base = { ...who, at };
  switch (kind) {
    case 'check_out':
      return { kind, ...base, holder: 'Sol Varga', reason: 'Fitting', dueBackAt: d('2026-10-30T17:00:00Z') };
    case 'check_in':
      return { kind, ...base };
    case 'relocation':
      return { kind, ...base, to: { id: 'b4', level: 'bin' } };
    case 'loan':
      return { kind, ...base, production: 'Saltglass Mile', dueBackAt: d('2026-12-01T17:00:00Z') };
    case 'return_to_performer':
      return { kind, ...base };
    case 'destruction':
      return { kind, ...base, witness: 'Ines Calloway', reason: 'Crumbling' };
  }
}

describe('refused moves', () => {
  it('moving a cast that is checked out: relocation, loan, destruction and return all wait for a check-in', () => {
    const out = checkedOut();
    for (const kind of ['relocation', 'loan', 'destruction', 'return_to_performer', 'check_out'] as const) {
      const e = errorsOf(out, anyMove(kind));
      expect(Object.keys(e), kind).toEqual(['']);
      expect(e['']![0], kind).toMatch(/^This cast is checked out to Rafe Lindqvist\. Check it in before recording a /);
    }
  });
  it('checking in a cast that is not out', () => {
    expect(errorsOf(stored(), anyMove('check_in'))).toEqual({
      '': ['This cast is in store, not out, so there is nothing to check in. To move it to another shelf, record a relocation.'],
    });
  });
  it('a destruction without a witness, or witnessed by the mover, or without a reason', () => {
    const base = { kind: 'destruction' as const, ...who, at };
    expect(errorsOf(stored(), { ...base, witness: null, reason: 'Crumbling' })).toEqual({ witness: ['A destruction needs a witness.'] });
    expect(errorsOf(stored(), { ...base, witness: '  ', reason: 'Crumbling' })).toEqual({ witness: ['A destruction needs a witness.'] });
    expect(errorsOf(stored(), { ...base, witness: ' nell achterberg ', reason: 'Crumbling' })).toEqual({
      witness: ['The witness must be someone other than the person destroying the cast.'],
    });
    expect(errorsOf(stored(), { ...base, witness: 'Ines Calloway', reason: '' })).toEqual({ reason: ['Give the reason for destroying the cast.'] });
    expect(Object.keys(errorsOf(stored(), { ...base, witness: null, reason: '' })).sort()).toEqual(['reason', 'witness']);
  });
  it('the witness may be the authoriser, and is kept on the record', () => {
    const r = applyMovement(stored(), { kind: 'destruction', ...who, at, witness: 'Marta Oyelaran', reason: 'Crumbling' }, NOW);
    expect(r.ok && r.record.witness).toBe('Marta Oyelaran');
  });
  it('any move on a destroyed or returned cast', () => {
    const destroyed = after(stored(), anyMove('destruction'));
    const returned = after(stored(), anyMove('return_to_performer'));
    const later = d('2026-10-09T10:00:00Z');
    for (const kind of MOVEMENT_KINDS) {
      expect(errorsOf(destroyed, { ...anyMove(kind), at: later })[''], kind).toEqual(['This cast has been destroyed; no further movement can be recorded.']);
      expect(errorsOf(returned, { ...anyMove(kind), at: later })['']?.[0], kind).toMatch(/returned to its performer; the archive no longer holds it/);
    }
  });
  it('a check-out without a holder, a reason or a due-back date', () => {
    const m = { kind: 'check_out' as const, ...who, at, holder: '', reason: ' ', dueBackAt: null };
    expect(errorsOf(stored(), m)).toEqual({
      holder: ['Say who is taking the cast.'],
      reason: ['Give the reason for the check-out.'],
      dueBackAt: ['Give a due-back date.'],
    });
  });
  it('a due-back date in the past, or not after the check-out itself', () => {
    const m = { kind: 'check_out' as const, ...who, at, holder: 'Sol Varga', reason: 'Fitting' };
    expect(errorsOf(stored(), { ...m, dueBackAt: d('2026-10-10T11:59:59Z') })).toEqual({ dueBackAt: ['The due-back date is in the past; choose a later one.'] });
    // Without a clock the check still holds against the move's own time.
    expect(errorsOf(stored(), { ...m, dueBackAt: at }, null)).toEqual({ dueBackAt: ['The due-back date must come after the check-out.'] });
    expect(applyMovement(stored(), { ...m, dueBackAt: d('2026-10-10T17:00:00Z') }, NOW).ok).toBe(true);
  });
  it('a loan without a production or a due date, or due in the past', () => {
    const m = { kind: 'loan' as const, ...who, at };
    expect(errorsOf(stored(), { ...m, production: '', dueBackAt: null })).toEqual({
      production: ['Name the production the cast is lent to.'],
      dueBackAt: ['Give a due-back date.'],
    });
    expect(errorsOf(stored(), { ...m, production: 'Saltglass Mile', dueBackAt: d('2026-09-01T00:00:00Z') })).toHaveProperty('dueBackAt');
  });
  it('a relocation or check-in to somewhere too coarse, to nowhere, or to where it already is', () => {
    const m = { kind: 'relocation' as const, ...who, at };
    expect(errorsOf(stored(), { ...m, to: { id: 'north', level: 'room' } }).to?.[0]).toMatch(/shelf or in a bin/);
    expect(errorsOf(stored(), { ...m, to: null })).toEqual({ to: ['Choose where the cast goes.'] });
    expect(errorsOf(stored(), { ...m, to: { id: 's3', level: 'shelf' } })).toEqual({ to: ['The cast is already there.'] });
    expect(errorsOf(stored(), { ...m, to: { id: 's3', level: 'shelf' }, alsoNormal: true })).toEqual({ to: ['The cast is already there.'] });
    expect(errorsOf(checkedOut(), { kind: 'check_in', ...who, at, to: { id: 'r2', level: 'rack' } }).to?.[0]).toMatch(/not straight into a rack/);
  });
  it('a move dated ahead of time, or before the cast reached where it is', () => {
    expect(errorsOf(stored(), { ...anyMove('relocation'), at: d('2026-10-11T09:00:00Z') })).toEqual({ at: ['A move cannot be recorded ahead of time.'] });
    expect(errorsOf(stored(), { ...anyMove('relocation'), at: d('2026-09-30T09:00:00Z') }).at?.[0]).toMatch(/dated before the cast arrived/);
    expect(errorsOf(stored(), { ...anyMove('relocation'), at: new Date('nonsense') })).toEqual({ at: ['Give the date and time of the move.'] });
  });
});

describe('isOverdue', () => {
  const out = (status: CastState['status'], due: string | null) => ({ status, dueBackAt: due ? d(due) : null });
  it('a check-out or loan past its due-back time is overdue; at the due time it is not yet', () => {
    expect(isOverdue(out('checked_out', '2026-10-09T17:00:00Z'), NOW)).toBe(true);
    expect(isOverdue(out('on_loan', '2026-10-01T17:00:00Z'), NOW)).toBe(true);
    expect(isOverdue(out('checked_out', '2026-10-10T12:00:00Z'), NOW)).toBe(false);
    expect(isOverdue(out('checked_out', '2026-10-11T17:00:00Z'), NOW)).toBe(false);
  });
  it('nothing in store or no longer held is overdue', () => {
    for (const status of ['in_store', 'returned_to_performer', 'destroyed'] as const) expect(isOverdue(out(status, '2026-01-01T00:00:00Z'), NOW)).toBe(false);
  });
  it('counts whole days late', () => {
    expect(daysOverdue(out('checked_out', '2026-10-07T11:00:00Z'), NOW)).toBe(3);
    expect(daysOverdue(out('checked_out', '2026-10-10T11:00:00Z'), NOW)).toBe(0);
    expect(daysOverdue(out('in_store', null), NOW)).toBe(0);
  });
  it('the check-out made now is overdue once its due-back time passes', () => {
    const s = checkedOut();
    expect(isOverdue(s, NOW)).toBe(false);
    expect(isOverdue(s, d('2026-10-21T09:00:00Z'))).toBe(true);
  });
});
