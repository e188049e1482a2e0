import { describe, expect, it } from 'vitest';
import { chooseSeat, chooseSeatByRoles, seatsFor } from '#shared/domain/seats.ts';
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

describe('chooseSeatByRoles (no production names read)', () => {
  const C = 'cccccccc-cccc-4ccc-8ccc-cccccccccccc';
  const actors = [
    actor({ memberships: [{ productionId: B, role: 'artist' }, { productionId: A, role: 'head' }] }),
    actor({ memberships: [{ productionId: A, role: 'archivist' }, { productionId: B, role: 'archivist' }, { productionId: B, role: 'artist' }] }),
    actor({ memberships: [{ productionId: A, role: 'head' }, { productionId: B, role: 'head' }], leadOf: [C] }),
    actor({ isAdmin: true, memberships: [{ productionId: A, role: 'head' }] }),
    actor({ memberships: [{ productionId: A, role: 'head' }, { productionId: B, role: 'head' }] }),
    actor({}),
  ];
  const wants = [undefined, { productionId: A }, { productionId: B, role: 'head' }, { productionId: B, role: 'artist' }, { productionId: C }, { productionId: null, role: 'admin' }];
  // Both orders of the names: whatever the names say, a seat answered without them is the one chooseSeat picks.
  const namings = [names, new Map([[A, 'Amber Tide'], [B, 'Zephyr Row'], [C, 'Mid Harbour']])];

  it('answers a seat only where every naming of the productions picks that same seat', () => {
    let answered = 0;
    let undecided = 0;
    for (const a of actors) {
      for (const w of wants) {
        const quick = chooseSeatByRoles(a, w);
        const picks = namings.map((n) => chooseSeat(seatsFor(a, n), w));
        if (quick === undefined) {
          // Names only break a tie between productions: the role is the same under every naming.
          expect(new Set(picks.map((p) => p?.role)).size).toBe(1);
          undecided += 1;
          continue;
        }
        answered += 1;
        for (const p of picks) expect(quick ? { productionId: quick.productionId, role: quick.role } : null).toEqual(p ? { productionId: p.productionId, role: p.role } : null);
      }
    }
    expect(answered).toBeGreaterThan(20);
    expect(undecided).toBeGreaterThan(0);
  });

  it('leaves the choice to the names when the best role is held on two productions and none was asked for', () => {
    const twoHeads = actor({ memberships: [{ productionId: A, role: 'head' }, { productionId: B, role: 'head' }] });
    expect(chooseSeatByRoles(twoHeads, undefined)).toBeUndefined();
    expect(chooseSeat(seatsFor(twoHeads, names), undefined)?.productionId).toBe(B);
    expect(chooseSeatByRoles(twoHeads, { productionId: A, role: 'head' })).toMatchObject({ productionId: A, role: 'head' });
    expect(chooseSeatByRoles(actor({}), undefined)).toBeNull();
  });
});
