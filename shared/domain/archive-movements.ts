/**
 * Movements of a cast: check-out, check-in, relocation, loan, return to performer, destruction.
 * Every move names who moved it and who authorised it, keeps one current place per cast, and
 * leaves a record behind so the full history can be read back.
 */
import type { FieldErrors } from '../errors.ts';
import { castPlacementRefusal, type LocationLevel } from './archive-locations.ts';
import { CAST_STATUS_LABELS, samePlace, type CastStatus, type CurrentPlace } from './archive-casts.ts';

/** The kinds of movement a cast can have. */
export const MOVEMENT_KINDS = ['check_out', 'check_in', 'relocation', 'loan', 'return_to_performer', 'destruction'] as const;
/** One of the movement kinds. */
export type MovementKind = (typeof MOVEMENT_KINDS)[number];

/** Movement kinds in the product's words. */
export const MOVEMENT_KIND_LABELS: Record<MovementKind, string> = {
  check_out: 'Check-out',
  check_in: 'Check-in',
  relocation: 'Relocation',
  loan: 'Loan',
  return_to_performer: 'Return to performer',
  destruction: 'Destruction',
};

/**
 * The statuses each kind of move may start from. Anything that leaves the store starts in store;
 * a check-in brings back what is out; nothing moves once the cast is returned or destroyed.
 */
export const MOVEMENT_ALLOWED_FROM: Record<MovementKind, readonly CastStatus[]> = {
  check_out: ['in_store'],
  check_in: ['checked_out', 'on_loan'],
  relocation: ['in_store'],
  loan: ['in_store'],
  return_to_performer: ['in_store'],
  destruction: ['in_store'],
};

/** Whether a kind of move may be recorded for a cast in this status (for showing or hiding commands). */
export function movementAllowed(kind: MovementKind, status: CastStatus): boolean {
  return MOVEMENT_ALLOWED_FROM[kind].includes(status);
}

/** What the archive knows about a cast's whereabouts: one current place, a normal home, a due date when out. */
export interface CastState {
  status: CastStatus;
  /** Where the cast lives when it is not out; kept through check-outs so a check-in knows where to go. */
  normalLocationId: string | null;
  current: CurrentPlace;
  /** Set while checked out or on loan. */
  dueBackAt: Date | null;
  /** When the cast arrived at its current place; a later move cannot be dated before it. */
  since: Date | null;
}

/** A storage place as the move needs it: its id and level, so a cast is never put somewhere too coarse. */
export interface PlaceRef {
  id: string;
  level: LocationLevel;
}

interface MovementBase {
  movedBy: string;
  authorisedBy: string;
  at: Date;
  note?: string | null;
}

/** A move as entered: who moved it, who authorised it, when, and what each kind needs besides. */
export type Movement =
  | (MovementBase & { kind: 'check_out'; holder: string; reason: string; dueBackAt: Date | null })
  | (MovementBase & { kind: 'check_in'; to?: PlaceRef | null })
  | (MovementBase & { kind: 'relocation'; to: PlaceRef | null; alsoNormal?: boolean; reason?: string | null })
  | (MovementBase & { kind: 'loan'; production: string; contact?: string | null; reason?: string | null; dueBackAt: Date | null })
  | (MovementBase & { kind: 'return_to_performer'; reason?: string | null })
  | (MovementBase & { kind: 'destruction'; witness: string | null; reason: string; method?: string | null });

/** One line of a cast's history: the move as recorded, with where it went from and to. */
export interface MovementRecord {
  kind: MovementKind;
  at: Date;
  movedBy: string;
  authorisedBy: string;
  from: CurrentPlace;
  to: CurrentPlace;
  statusBefore: CastStatus;
  statusAfter: CastStatus;
  normalLocationBefore: string | null;
  normalLocationAfter: string | null;
  reason: string | null;
  dueBackAt: Date | null;
  witness: string | null;
  note: string | null;
}

/** A recorded move (new state and history line) or the field-keyed reasons it was refused. */
export type MovementOutcome = { ok: true; state: CastState; record: MovementRecord } | { ok: false; errors: FieldErrors };

/** A new cast enters the archive in store at a storage place, which also becomes its normal home. */
export function initialCastState(place: PlaceRef, at: Date): { ok: true; state: CastState } | { ok: false; errors: FieldErrors } {
  const refusal = castPlacementRefusal(place.level);
  if (refusal) return { ok: false, errors: { locationId: [refusal] } };
  return { ok: true, state: { status: 'in_store', normalLocationId: place.id, current: { kind: 'location', locationId: place.id }, dueBackAt: null, since: at } };
}

const blank = (s: string | null | undefined): boolean => !s || s.trim().length === 0;
const validDate = (d: Date | null | undefined): d is Date => d instanceof Date && !Number.isNaN(d.getTime());
const samePerson = (a: string, b: string): boolean => a.trim().toLowerCase() === b.trim().toLowerCase();

function whereItIs(state: CastState): string {
  switch (state.current.kind) {
    case 'person':
      return `checked out to ${state.current.holder}`;
    case 'production':
      return `on loan to ${state.current.production}`;
    default:
      return CAST_STATUS_LABELS[state.status].toLowerCase();
  }
}

/** The words shown when the cast's status rules this kind of move out; null when allowed. */
export function statusRefusal(kind: MovementKind, state: CastState): string | null {
  if (movementAllowed(kind, state.status)) return null;
  if (state.status === 'destroyed') return 'This cast has been destroyed; no further movement can be recorded.';
  if (state.status === 'returned_to_performer') return 'This cast has been returned to its performer; the archive no longer holds it, so no further movement can be recorded.';
  if (kind === 'check_in') return 'This cast is in store, not out, so there is nothing to check in. To move it to another shelf, record a relocation.';
  const action = MOVEMENT_KIND_LABELS[kind].toLowerCase();
  return `This cast is ${whereItIs(state)}. Check it in before recording a ${action}.`;
}

function checkDueBack(errors: FieldErrors, dueBackAt: Date | null, at: Date, now: Date | undefined, leaving: string): void {
  if (!validDate(dueBackAt)) errors.dueBackAt = ['Give a due-back date.'];
  else if (now && dueBackAt.getTime() <= now.getTime()) errors.dueBackAt = ['The due-back date is in the past; choose a later one.'];
  else if (validDate(at) && dueBackAt.getTime() <= at.getTime()) errors.dueBackAt = [`The due-back date must come after the ${leaving}.`];
}

function checkTarget(errors: FieldErrors, to: PlaceRef | null | undefined): void {
  if (!to) {
    errors.to = ['Choose where the cast goes.'];
    return;
  }
  const refusal = castPlacementRefusal(to.level);
  if (refusal) errors.to = [refusal];
}

/** Every field-level reason this move cannot be recorded as given; empty when it can. */
export function movementErrors(state: CastState, m: Movement, now?: Date): FieldErrors {
  const errors: FieldErrors = {};
  const statusMessage = statusRefusal(m.kind, state);
  if (statusMessage) return { '': [statusMessage] };

  if (blank(m.movedBy)) errors.movedBy = ['Say who is moving the cast.'];
  if (blank(m.authorisedBy)) errors.authorisedBy = ['Say who authorised this move.'];
  if (!validDate(m.at)) errors.at = ['Give the date and time of the move.'];
  else if (now && m.at.getTime() > now.getTime()) errors.at = ['A move cannot be recorded ahead of time.'];
  else if (state.since && m.at.getTime() < state.since.getTime()) {
    errors.at = ['This is dated before the cast arrived where it is now; check the date and time.'];
  }

  switch (m.kind) {
    case 'check_out':
      if (blank(m.holder)) errors.holder = ['Say who is taking the cast.'];
      if (blank(m.reason)) errors.reason = ['Give the reason for the check-out.'];
      checkDueBack(errors, m.dueBackAt, m.at, now, 'check-out');
      break;
    case 'check_in':
      if (m.to) checkTarget(errors, m.to);
      else if (!state.normalLocationId) errors.to = ['This cast has no normal location yet; choose where it goes.'];
      break;
    case 'relocation':
      checkTarget(errors, m.to);
      if (m.to && !errors.to && state.current.kind === 'location' && state.current.locationId === m.to.id) {
        if (!m.alsoNormal || state.normalLocationId === m.to.id) errors.to = ['The cast is already there.'];
      }
      break;
    case 'loan':
      if (blank(m.production)) errors.production = ['Name the production the cast is lent to.'];
      checkDueBack(errors, m.dueBackAt, m.at, now, 'loan');
      break;
    case 'return_to_performer':
      break;
    case 'destruction':
      if (blank(m.witness)) errors.witness = ['A destruction needs a witness.'];
      else if (!blank(m.movedBy) && samePerson(m.witness!, m.movedBy)) {
        errors.witness = ['The witness must be someone other than the person destroying the cast.'];
      }
      if (blank(m.reason)) errors.reason = ['Give the reason for destroying the cast.'];
      break;
  }
  return errors;
}

function effect(state: CastState, m: Movement): Pick<CastState, 'status' | 'normalLocationId' | 'current' | 'dueBackAt'> {
  switch (m.kind) {
    case 'check_out':
      return { status: 'checked_out', normalLocationId: state.normalLocationId, current: { kind: 'person', holder: m.holder.trim() }, dueBackAt: m.dueBackAt };
    case 'check_in': {
      const to = m.to?.id ?? state.normalLocationId!;
      return { status: 'in_store', normalLocationId: state.normalLocationId ?? to, current: { kind: 'location', locationId: to }, dueBackAt: null };
    }
    case 'relocation':
      return {
        status: 'in_store',
        normalLocationId: m.alsoNormal ? m.to!.id : state.normalLocationId,
        current: { kind: 'location', locationId: m.to!.id },
        dueBackAt: null,
      };
    case 'loan':
      return { status: 'on_loan', normalLocationId: state.normalLocationId, current: { kind: 'production', production: m.production.trim() }, dueBackAt: m.dueBackAt };
    // The archive no longer keeps a home for a cast it no longer holds, so its shelf can be emptied and removed.
    case 'return_to_performer':
      return { status: 'returned_to_performer', normalLocationId: null, current: { kind: 'performer' }, dueBackAt: null };
    case 'destruction':
      return { status: 'destroyed', normalLocationId: null, current: { kind: 'destroyed' }, dueBackAt: null };
  }
}

function text(s: string | null | undefined): string | null {
  return blank(s) ? null : s!.trim();
}

/**
 * Records a move against a cast: the new state and its history line, or the reasons it is refused,
 * keyed by field ("" for the cast as a whole). Pass `now` to refuse moves dated ahead of time.
 */
export function applyMovement(state: CastState, m: Movement, now?: Date): MovementOutcome {
  const errors = movementErrors(state, m, now);
  if (Object.keys(errors).length > 0) return { ok: false, errors };
  const next = effect(state, m);
  const record: MovementRecord = {
    kind: m.kind,
    at: m.at,
    movedBy: m.movedBy.trim(),
    authorisedBy: m.authorisedBy.trim(),
    from: state.current,
    to: next.current,
    statusBefore: state.status,
    statusAfter: next.status,
    normalLocationBefore: state.normalLocationId,
    normalLocationAfter: next.normalLocationId,
    reason: 'reason' in m ? text(m.reason) : null,
    dueBackAt: next.dueBackAt,
    witness: m.kind === 'destruction' ? text(m.witness) : null,
    note: text(m.note),
  };
  return { ok: true, state: { ...next, since: m.at }, record };
}

/** Plays a cast's moves in order; stops at the first refused one and says which. */
export function replayMovements(
  initial: CastState,
  movements: readonly Movement[],
  now?: Date,
): { ok: true; state: CastState; records: MovementRecord[] } | { ok: false; index: number; errors: FieldErrors; state: CastState; records: MovementRecord[] } {
  let state = initial;
  const records: MovementRecord[] = [];
  for (const [index, m] of movements.entries()) {
    const out = applyMovement(state, m, now);
    if (!out.ok) return { ok: false, index, errors: out.errors, state, records };
    state = out.state;
    records.push(out.record);
  }
  return { ok: true, state, records };
}

/** A cast that is out (with a person or another production) past its due-back time. */
export function isOverdue(cast: Pick<CastState, 'status' | 'dueBackAt'>, now: Date): boolean {
  if (cast.status !== 'checked_out' && cast.status !== 'on_loan') return false;
  return cast.dueBackAt != null && now.getTime() > cast.dueBackAt.getTime();
}

/** Whole days past the due-back time (0 when not overdue), for sorting the overdue list. */
export function daysOverdue(cast: Pick<CastState, 'status' | 'dueBackAt'>, now: Date): number {
  if (!isOverdue(cast, now)) return 0;
  return Math.floor((now.getTime() - cast.dueBackAt!.getTime()) / 86_400_000);
}

/** A stretch of a cast's history spent in one place. */
export interface PlaceSpan {
  place: CurrentPlace;
  /** null: before the first recorded move. */
  from: Date | null;
  /** null: still there. */
  until: Date | null;
}

/** Every place a cast has been, oldest first, each with when it arrived and left. */
export function locationHistory(records: readonly MovementRecord[]): PlaceSpan[] {
  const first = records[0];
  if (!first) return [];
  const spans: PlaceSpan[] = [{ place: first.from, from: null, until: first.at }];
  records.forEach((r, i) => spans.push({ place: r.to, from: r.at, until: records[i + 1]?.at ?? null }));
  return spans;
}

/** Where the cast was at a given moment, from its history; null when it has no recorded moves. */
export function placeAt(records: readonly MovementRecord[], at: Date): CurrentPlace | null {
  const spans = locationHistory(records);
  const hit = spans.findLast((s) => s.from == null || s.from.getTime() <= at.getTime());
  return hit?.place ?? null;
}

/** Whether a cast has ever been at a place, current place included: the history answers "was it ever on that shelf?". */
export function hasBeenAt(records: readonly MovementRecord[], place: CurrentPlace): boolean {
  return locationHistory(records).some((s) => samePlace(s.place, place));
}
