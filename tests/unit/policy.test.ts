import { describe, expect, it } from 'vitest';
import { type Action, type Actor, can, canSomewhere, rolesOn } from '#shared/policy.ts';

const P1 = '11111111-1111-4111-8111-111111111111';
const P2 = '22222222-2222-4222-8222-222222222222';
const PERF = '33333333-3333-4333-8333-333333333333';
const OTHER_PERF = '44444444-4444-4444-8444-444444444444';

function actor(partial: Partial<Actor>): Actor {
  return { userId: 'u', isAdmin: false, memberships: [], leadOf: [], performerIds: [], ...partial };
}

const admin = actor({ isAdmin: true });
const head = actor({ memberships: [{ productionId: P1, role: 'head' }] });
const lead = actor({ memberships: [{ productionId: P1, role: 'artist' }], leadOf: [P1] });
const artist = actor({ memberships: [{ productionId: P1, role: 'artist' }] });
const archivist = actor({ memberships: [{ productionId: P1, role: 'archivist' }] });
const performer = actor({ memberships: [{ productionId: P1, role: 'performer' }], performerIds: [PERF] });
const nobody = actor({});

// Expected answers on production P1, one row per action: admin, head, lead, artist, archivist, performer, nobody.
const TABLE: [Action, boolean[]][] = [
  ['users.manage', [true, false, false, false, false, false, false]],
  ['productions.manage', [true, false, false, false, false, false, false]],
  ['lead.appoint', [true, false, false, false, false, false, false]],
  ['audit.read', [true, false, false, false, false, false, false]],
  ['outbox.read', [true, false, false, false, false, false, false]],
  ['performers.manage', [false, true, true, false, false, false, false]],
  ['consents.request', [false, true, true, false, false, false, false]],
  ['patchtests.book', [false, true, true, false, false, false, false]],
  ['medical.read', [false, false, true, false, false, false, false]],
  ['medical.write', [false, false, true, false, false, false, false]],
  ['clearance.check', [false, true, true, true, false, false, false]],
  ['applications.log', [false, false, true, true, false, false, false]],
  ['reactions.report', [false, false, true, true, false, false, false]],
  ['casts.manage', [false, false, false, false, true, false, false]],
  // Everyone who works with the performer's casts reads them; only the archivist records their moves.
  ['casts.read', [false, true, true, true, true, false, false]],
  ['production.view', [false, true, true, true, true, true, false]],
];

describe('can() on one production', () => {
  const actors = [admin, head, lead, artist, archivist, performer, nobody];
  const names = ['admin', 'head', 'lead', 'artist', 'archivist', 'performer', 'nobody'];
  for (const [action, expected] of TABLE) {
    actors.forEach((a, i) => {
      it(`${names[i]} ${expected[i] ? 'may' : 'may not'} ${action}`, () => {
        expect(can(a, action, { productionId: P1 })).toBe(expected[i]);
      });
    });
  }
});

describe('medical data', () => {
  it('is open to the lead only on the production they lead', () => {
    expect(can(lead, 'medical.read', { productionId: P2 })).toBe(false);
  });
  it('is open to the performer for their own record, never for another performer', () => {
    expect(can(performer, 'medical.read', { performerId: PERF })).toBe(true);
    expect(can(performer, 'medical.read', { performerId: OTHER_PERF, productionId: P1 })).toBe(false);
  });
  it('is closed to a head who is not the lead, and to the studio administrator', () => {
    expect(can(head, 'medical.read', { productionId: P1, performerId: PERF })).toBe(false);
    expect(can(admin, 'medical.read', { productionId: P1, performerId: PERF })).toBe(false);
  });
  it('follows a studio-wide performer record to any production the performer is engaged on', () => {
    expect(can(lead, 'medical.read', { performerId: PERF, performerProductionIds: [P2, P1] })).toBe(true);
    expect(can(lead, 'medical.read', { performerId: PERF, performerProductionIds: [P2] })).toBe(false);
  });
});

describe('the life-cast archive', () => {
  const CAST = { productionId: P2, performerId: PERF, performerProductionIds: [P1] };
  it('a cast from an earlier production is read by staff of a production its performer is engaged on', () => {
    for (const a of [head, lead, artist, archivist]) expect(can(a, 'casts.read', CAST)).toBe(true);
    expect(can(archivist, 'casts.manage', CAST)).toBe(true);
    expect(can(head, 'casts.manage', CAST)).toBe(false);
  });
  it('staff of an unrelated production neither read nor manage the cast', () => {
    const elsewhere = actor({ memberships: [{ productionId: P2, role: 'archivist' }] });
    expect(can(elsewhere, 'casts.read', { productionId: P1, performerId: OTHER_PERF, performerProductionIds: [P1] })).toBe(false);
    expect(can(elsewhere, 'casts.manage', { productionId: P1, performerProductionIds: [P1] })).toBe(false);
  });
  it('the performer reads their own casts through their own record, not as staff', () => {
    expect(can(performer, 'casts.read', CAST)).toBe(false);
    expect(can(performer, 'performer.self', CAST)).toBe(true);
  });
  // Studio-wide: admin, head, lead, artist, archivist, performer, nobody.
  const STUDIO: [string, boolean[]][] = [
    ['archive.view', [false, true, true, true, true, false, false]],
    ['locations.manage', [false, false, false, false, true, false, false]],
  ];
  const actors = [admin, head, lead, artist, archivist, performer, nobody];
  for (const [action, expected] of STUDIO) {
    it(`${action} is studio-wide and follows the roles that grant it somewhere`, () => {
      expect(actors.map((a) => can(a, action as Action))).toEqual(expected);
      expect(actors.map((a) => canSomewhere(a, action as Action))).toEqual(expected);
    });
  }
});

describe('scoping', () => {
  it('a production action with no production named is refused', () => {
    expect(can(head, 'performers.manage')).toBe(false);
  });
  it('a role on one production grants nothing on another', () => {
    expect(can(head, 'performers.manage', { productionId: P2 })).toBe(false);
  });
  it('canSomewhere answers for navigation only', () => {
    expect(canSomewhere(head, 'performers.manage')).toBe(true);
    expect(canSomewhere(artist, 'performers.manage')).toBe(false);
    expect(canSomewhere(admin, 'users.manage')).toBe(true);
  });
  it('rolesOn lists the lead appointment alongside membership roles', () => {
    expect(rolesOn(lead, P1).sort()).toEqual(['artist', 'lead']);
  });
});
