import { describe, expect, it } from 'vitest';
import { chooseSeat, seatsFor } from '#shared/domain/seats.ts';
import type { Actor } from '#shared/policy.ts';

const A = 'aaaaaaaa-aaaa-4aaa-8aaa-aaaaaaaaaaaa';
const B = 'bbbbbbbb-bbbb-4bbb-8bbb-bbbbbbbbbbbb';
const names = new Map([
  [A, 'Zephyr Row'],
  [B, 'Amber Tide'],
]);

function actor(p: Partial<Actor>): Actor {
  return { userId: 'u', isAdmin: false, memberships: [], leadOf: [], performerIds: [], ...p };
}

describe('seatsFor', () => {
  it('lists the admin seat first, then productions by name, the lead seat before others', () => {
    const seats = seatsFor(actor({ isAdmin: true, memberships: [{ productionId: A, role: 'artist' }, { productionId: B, role: 'head' }], leadOf: [A] }), names);
    expect(seats.map((s) => `${s.productionName ?? '-'}:${s.role}`)).toEqual(['-:admin', 'Amber Tide:head', 'Zephyr Row:lead', 'Zephyr Row:artist']);
  });
  it('gives nobody a seat without a role', () => {
    expect(seatsFor(actor({}), names)).toEqual([]);
  });
});

describe('chooseSeat', () => {
  const seats = seatsFor(actor({ memberships: [{ productionId: B, role: 'artist' }, { productionId: A, role: 'head' }] }), names);
  it('keeps the seat the person picked while they still hold it', () => {
    expect(chooseSeat(seats, { productionId: B, role: 'artist' })?.productionId).toBe(B);
  });
  it('falls back to the most responsible seat when the picked one is gone', () => {
    expect(chooseSeat(seats, { productionId: B, role: 'head' })).toMatchObject({ productionId: A, role: 'head' });
    expect(chooseSeat(seats, undefined)).toMatchObject({ role: 'head' });
  });
  it('answers null when there are no seats', () => {
    expect(chooseSeat([], undefined)).toBeNull();
  });
});

describe('chooseSeat with only a production (the one last worked on)', () => {
  const seats = seatsFor(actor({ memberships: [{ productionId: A, role: 'archivist' }, { productionId: B, role: 'archivist' }, { productionId: B, role: 'artist' }] }), names);
  it('lands on that production, in the most responsible seat there', () => {
    expect(chooseSeat(seats, { productionId: A })).toMatchObject({ productionId: A, role: 'archivist' });
    expect(chooseSeat(seats, { productionId: B })).toMatchObject({ productionId: B, role: 'artist' });
  });
  it('falls back to the most responsible seat overall when the person no longer works on it', () => {
    expect(chooseSeat(seats, { productionId: 'cccccccc-cccc-4ccc-8ccc-cccccccccccc' })).toMatchObject({ role: 'artist' });
  });
});
