import { describe, expect, it } from 'vitest';
import {
  BODY_REGION_LABELS,
  BODY_REGIONS,
  CAST_KIND_LABELS,
  CAST_STATUS_LABELS,
  conditionCheckRefusal,
  currentPlaceLabel,
  isFinalStatus,
  latestCondition,
  pouredFromRefusal,
  samePlace,
} from '#shared/domain/archive-casts.ts';

const d = (iso: string) => new Date(iso);

describe('names', () => {
  it('uses the product’s own words for kinds, regions and statuses', () => {
    expect(Object.values(CAST_KIND_LABELS)).toEqual(['Mold', 'Positive', 'Core', 'Other']);
    expect(BODY_REGIONS).toHaveLength(10);
    expect(BODY_REGION_LABELS.head_and_shoulders).toBe('Head and shoulders');
    expect(Object.values(CAST_STATUS_LABELS)).toEqual(['In store', 'Checked out', 'On loan', 'Returned to performer', 'Destroyed']);
    expect(isFinalStatus('destroyed') && isFinalStatus('returned_to_performer')).toBe(true);
    expect(isFinalStatus('on_loan')).toBe(false);
  });
});

describe('current place', () => {
  it('reads as words wherever the cast is', () => {
    const name = (id: string) => `GH/NORTH/R1/${id}`;
    expect(currentPlaceLabel({ kind: 'location', locationId: '2' }, name)).toBe('GH/NORTH/R1/2');
    expect(currentPlaceLabel({ kind: 'person', holder: 'Rafe Lindqvist' }, name)).toBe('With Rafe Lindqvist');
    expect(currentPlaceLabel({ kind: 'production', production: 'Saltglass Mile' }, name)).toBe('On loan to Saltglass Mile');
    expect(currentPlaceLabel({ kind: 'performer' }, name)).toBe('Returned to the performer');
  });
  it('compares places by what they name', () => {
    expect(samePlace({ kind: 'location', locationId: 'a' }, { kind: 'location', locationId: 'a' })).toBe(true);
    expect(samePlace({ kind: 'location', locationId: 'a' }, { kind: 'location', locationId: 'b' })).toBe(false);
    expect(samePlace({ kind: 'person', holder: 'A' }, { kind: 'production', production: 'A' })).toBe(false);
    expect(samePlace({ kind: 'destroyed' }, { kind: 'destroyed' })).toBe(true);
  });
});

describe('poured from', () => {
  // Spectrum mapping: each mold and each positive is a separate object, linked as related (from memory).
  const mold = { id: 'm', kind: 'mold' as const, performerKey: 'juno' };
  it('a positive or a core of the same performer is poured from a mold', () => {
    expect(pouredFromRefusal({ id: 'p', kind: 'positive', performerKey: 'juno' }, mold)).toBeNull();
    expect(pouredFromRefusal({ id: 'c', kind: 'core', performerKey: 'juno' }, mold)).toBeNull();
  });
  it('refuses any other link', () => {
    expect(pouredFromRefusal(mold, mold)).toMatch(/itself/);
    expect(pouredFromRefusal({ id: 'm2', kind: 'mold', performerKey: 'juno' }, mold)).toMatch(/Only a positive or a core/);
    expect(pouredFromRefusal({ id: 'p', kind: 'positive', performerKey: 'juno' }, { id: 'p2', kind: 'positive', performerKey: 'juno' })).toMatch(/Choose the mold/);
    expect(pouredFromRefusal({ id: 'p', kind: 'positive', performerKey: 'oz' }, mold)).toMatch(/different performer/);
  });
});

describe('condition checks', () => {
  const now = d('2026-10-10T12:00:00Z');
  it('the newest check is the cast’s condition', () => {
    const checks = [
      { checkedOn: d('2026-01-01T00:00:00Z'), checkedBy: 'a', grade: 'damaged' as const },
      { checkedOn: d('2026-06-01T00:00:00Z'), checkedBy: 'a', grade: 'fair' as const },
      { checkedOn: d('2026-03-01T00:00:00Z'), checkedBy: 'a', grade: 'good' as const },
    ];
    expect(latestCondition(checks)?.grade).toBe('fair');
    expect(latestCondition([])).toBeNull();
  });
  it('names who and when, never a future date, and describes poor or damaged casts', () => {
    expect(conditionCheckRefusal({ checkedOn: now, checkedBy: 'Nell', grade: 'good' }, now)).toBeNull();
    expect(conditionCheckRefusal({ grade: 'good' }, now)).toEqual({ checkedBy: ['Say who checked the cast.'], checkedOn: ['Give the date of the check.'] });
    expect(conditionCheckRefusal({ checkedOn: d('2026-10-11T00:00:00Z'), checkedBy: 'Nell', grade: 'good' }, now)).toHaveProperty('checkedOn');
    // common practice, no published source: a poor or damaged grade is recorded with what is wrong.
    expect(conditionCheckRefusal({ checkedOn: now, checkedBy: 'Nell', grade: 'damaged', notes: ' ' }, now)).toHaveProperty('notes');
    expect(conditionCheckRefusal({ checkedOn: now, checkedBy: 'Nell', grade: 'poor', notes: 'Chipped rim' }, now)).toBeNull();
    expect(conditionCheckRefusal({ checkedOn: now, checkedBy: 'Nell', grade: 'broken' as never }, now)).toHaveProperty('grade');
  });
});
