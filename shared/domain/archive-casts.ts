/** What a life cast is in the archive: its kind, region, status, where it is now, and its condition. */
import type { FieldErrors } from '../errors.ts';

/** Cast kinds: a mold is taken from the performer, positives and cores are poured from it. */
export const CAST_KINDS = ['mold', 'positive', 'core', 'other'] as const;
/** One of the cast kinds. */
export type CastKind = (typeof CAST_KINDS)[number];

/** Cast kinds in the product's words. */
export const CAST_KIND_LABELS: Record<CastKind, string> = {
  mold: 'Mold',
  positive: 'Positive',
  core: 'Core',
  other: 'Other',
};

/** Body regions a life cast is taken of; the archive is searched by them. */
export const BODY_REGIONS = ['face', 'head', 'head_and_shoulders', 'torso', 'arm', 'hand', 'leg', 'foot', 'teeth', 'other'] as const;
/** One of the body regions. */
export type BodyRegion = (typeof BODY_REGIONS)[number];

/** Body regions in the product's words. */
export const BODY_REGION_LABELS: Record<BodyRegion, string> = {
  face: 'Face',
  head: 'Head',
  head_and_shoulders: 'Head and shoulders',
  torso: 'Torso',
  arm: 'Arm',
  hand: 'Hand',
  leg: 'Leg',
  foot: 'Foot',
  teeth: 'Teeth',
  other: 'Other',
};

/** Generic material names offered as suggestions; the field stays free text for anything else. */
export const CAST_MATERIAL_SUGGESTIONS = [
  'Alginate',
  'Plaster',
  'Plaster bandage',
  'Gypsum stone',
  'Silicone',
  'Polyurethane resin',
  'Fibreglass-reinforced resin',
  'Epoxy resin',
  'Foam latex',
  'Clay',
  'Wax',
] as const;

/** Where a cast stands with the archive; the status decides which movements are allowed. */
export const CAST_STATUSES = ['in_store', 'checked_out', 'on_loan', 'returned_to_performer', 'destroyed'] as const;
/** One of the cast statuses. */
export type CastStatus = (typeof CAST_STATUSES)[number];

/** Cast statuses in the product's words. */
export const CAST_STATUS_LABELS: Record<CastStatus, string> = {
  in_store: 'In store',
  checked_out: 'Checked out',
  on_loan: 'On loan',
  returned_to_performer: 'Returned to performer',
  destroyed: 'Destroyed',
};

/** Once a cast has gone back to its performer or been destroyed, the archive no longer holds it. */
export const FINAL_CAST_STATUSES: readonly CastStatus[] = ['returned_to_performer', 'destroyed'];

/** Whether the archive's hold on a cast has ended for good. */
export function isFinalStatus(status: CastStatus): boolean {
  return FINAL_CAST_STATUSES.includes(status);
}

/**
 * Where a cast is right now. One value per cast, so it can never be in two places at once: on a
 * storage place, with a named person, with another production, back with its performer, or gone.
 */
export type CurrentPlace =
  | { kind: 'location'; locationId: string }
  | { kind: 'person'; holder: string }
  | { kind: 'production'; production: string }
  | { kind: 'performer' }
  | { kind: 'destroyed' };

/** The current place in words; `locationName` turns a place id into its breadcrumb or code path. */
export function currentPlaceLabel(place: CurrentPlace, locationName: (id: string) => string): string {
  switch (place.kind) {
    case 'location':
      return locationName(place.locationId);
    case 'person':
      return `With ${place.holder}`;
    case 'production':
      return `On loan to ${place.production}`;
    case 'performer':
      return 'Returned to the performer';
    case 'destroyed':
      return 'Destroyed';
  }
}

/** Two places are the same place (used to refuse a move that moves nothing). */
export function samePlace(a: CurrentPlace, b: CurrentPlace): boolean {
  if (a.kind !== b.kind) return false;
  switch (a.kind) {
    case 'location':
      return a.locationId === (b as typeof a).locationId;
    case 'person':
      return a.holder === (b as typeof a).holder;
    case 'production':
      return a.production === (b as typeof a).production;
    default:
      return true;
  }
}

/** What the poured-from rule needs to know about a cast. */
export interface CastLink {
  id: string;
  kind: CastKind;
  performerKey: string;
}

/**
 * A positive or a core is poured from a mold of the same performer; nothing else is "poured from".
 * Because only molds are sources and molds have no source, the links can never loop.
 */
export function pouredFromRefusal(cast: CastLink, source: CastLink): string | null {
  if (cast.id === source.id) return 'A cast cannot be poured from itself.';
  if (cast.kind !== 'positive' && cast.kind !== 'core') return 'Only a positive or a core is poured from a mold.';
  if (source.kind !== 'mold') return 'Choose the mold this cast was poured from.';
  if (cast.performerKey !== source.performerKey) return 'The mold belongs to a different performer.';
  return null;
}

/** Condition grades, from sound to damaged. */
export const CONDITION_GRADES = ['good', 'fair', 'poor', 'damaged'] as const;
/** One of the condition grades. */
export type ConditionGrade = (typeof CONDITION_GRADES)[number];

/** Condition grades in the product's words. */
export const CONDITION_GRADE_LABELS: Record<ConditionGrade, string> = {
  good: 'Good',
  fair: 'Fair',
  poor: 'Poor',
  damaged: 'Damaged',
};

/** One look at a cast: when, by whom, the grade, and what was seen. */
export interface ConditionCheck {
  checkedOn: Date;
  checkedBy: string;
  grade: ConditionGrade;
  notes?: string | null;
  photoIds?: readonly string[];
}

/** The newest check wins: condition is what was last seen, not the best or worst ever seen. */
export function latestCondition<T extends ConditionCheck>(checks: readonly T[]): T | null {
  let best: T | null = null;
  for (const c of checks) if (!best || c.checkedOn.getTime() > best.checkedOn.getTime()) best = c;
  return best;
}

/**
 * A condition check names who looked and when (not in the future); "poor" and "damaged" say what
 * is wrong, or the next person cannot tell new damage from old.
 */
export function conditionCheckRefusal(check: Partial<ConditionCheck>, now: Date): FieldErrors | null {
  const errors: FieldErrors = {};
  if (!check.checkedBy?.trim()) errors.checkedBy = ['Say who checked the cast.'];
  if (!check.checkedOn) errors.checkedOn = ['Give the date of the check.'];
  else if (check.checkedOn.getTime() > now.getTime()) errors.checkedOn = ['A condition check cannot be dated in the future.'];
  if (!check.grade || !CONDITION_GRADES.includes(check.grade)) errors.grade = ['Choose good, fair, poor or damaged.'];
  else if ((check.grade === 'poor' || check.grade === 'damaged') && !check.notes?.trim()) {
    errors.notes = ['Describe what is wrong, so later checks can tell new damage from old.'];
  }
  return Object.keys(errors).length > 0 ? errors : null;
}
