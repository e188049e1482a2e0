import { describe, expect, it } from 'vitest';
import { ACTIONS, type Action, type Actor, can, canSomewhere, rolesOn } from '#shared/policy.ts';

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
  // The production's part of the audit log: the administrator and the designated lead.
  ['audit.review', [true, false, true, false, false, false, false]],
  ['outbox.read', [true, false, false, false, false, false, false]],
  ['performers.manage', [false, true, true, false, false, false, false]],
  ['consents.request', [false, true, true, false, false, false, false]],
  ['patchtests.book', [false, true, true, false, false, false, false]],
  ['medical.read', [false, false, true, false, false, false, false]],
  ['medical.write', [false, false, true, false, false, false, false]],
  ['clearance.check', [false, true, true, true, false, false, false]],
  // Staff on the production see a performer's tests (health details still need medical.read); only the lead records or overrides.
  ['patchtests.read', [false, true, true, true, true, false, false]],
  ['patchtests.record', [false, false, true, false, false, false, false]],
  ['clearance.override', [false, false, true, false, false, false, false]],
  ['applications.log', [false, false, true, true, false, false, false]],
  ['reactions.report', [false, false, true, true, false, false, false]],
  ['casts.manage', [false, false, false, false, true, false, false]],
  // Everyone who works with the performer's casts reads them; only the archivist records their moves.
  ['casts.read', [false, true, true, true, true, false, false]],
  ['production.view', [false, true, true, true, true, true, false]],
  ['catalogue.read', [true, true, true, true, true, false, false]],
  ['catalogue.manage', [false, true, true, false, false, false, false]],
  ['protocols.manage', [false, true, true, false, false, false, false]],
  // This lead is also an artist on P1, so makes builds as the artist; the appointment alone only reads them.
  ['builds.read', [false, true, true, true, true, false, false]],
  ['builds.manage', [false, true, true, true, false, false, false]],
  ['builds.plan', [false, true, false, false, false, false, false]],
  // Kits are edited by heads and artists; logged applications are read by production staff who apply or answer for them.
  ['kits.manage', [false, true, true, true, false, false, false]],
  ['applications.read', [false, true, true, true, false, false, false]],
  ['lots.trace', [false, true, true, false, false, false, false]],
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

describe('the audit log', () => {
  const leadElsewhere = actor({ leadOf: [P2] });
  const headAndLeadElsewhere = actor({ memberships: [{ productionId: P1, role: 'head' }], leadOf: [P2] });
  it('the whole log is the administrator’s alone; a production’s part is also its lead’s', () => {
    expect(can(admin, 'audit.read')).toBe(true);
    expect(can(lead, 'audit.read')).toBe(false);
    expect(can(admin, 'audit.review', { productionId: P2 })).toBe(true);
    expect(can(lead, 'audit.review', { productionId: P2 })).toBe(false);
    expect(can(leadElsewhere, 'audit.review', { productionId: P2 })).toBe(true);
    expect(can(leadElsewhere, 'audit.review', { productionId: P1 })).toBe(false);
  });
  it('a head role does not open it, even held beside a lead appointment elsewhere', () => {
    expect(can(headAndLeadElsewhere, 'audit.review', { productionId: P1 })).toBe(false);
    expect(can(headAndLeadElsewhere, 'audit.review', { productionId: P2 })).toBe(true);
  });
  it('with no production named, only the administrator may', () => {
    for (const who of [head, lead, artist, archivist, performer, nobody, leadElsewhere]) expect(can(who, 'audit.review')).toBe(false);
    expect(can(admin, 'audit.review')).toBe(true);
  });
  it('shows in the navigation of the administrator and of leads only', () => {
    const shown = [admin, head, lead, artist, archivist, performer, nobody, leadElsewhere].map((who) => canSomewhere(who, 'audit.review'));
    expect(shown).toEqual([true, false, true, false, false, false, false, true]);
  });
});

describe('the catalogue and protocols are studio-wide', () => {
  const STUDIO: Action[] = ['catalogue.read', 'catalogue.manage', 'protocols.manage'];
  it('a head or lead on one production keeps the catalogue for every production, or with none named', () => {
    for (const action of STUDIO) {
      for (const who of [head, lead]) {
        expect(can(who, action, { productionId: P2 }), action).toBe(true);
        expect(can(who, action), action).toBe(true);
      }
    }
  });
  it('a lead appointment alone, with no membership, is enough to edit', () => {
    const appointedOnly = actor({ leadOf: [P2] });
    expect(can(appointedOnly, 'catalogue.manage')).toBe(true);
    expect(can(appointedOnly, 'protocols.manage')).toBe(true);
  });
  it('artists and archivists read it anywhere and edit nothing', () => {
    for (const who of [artist, archivist]) {
      expect(can(who, 'catalogue.read', { productionId: P2 })).toBe(true);
      expect(can(who, 'catalogue.manage')).toBe(false);
      expect(can(who, 'protocols.manage')).toBe(false);
    }
  });
  it('a performer reads it only through a staff role held elsewhere', () => {
    expect(can(performer, 'catalogue.read')).toBe(false);
    const alsoArtist = actor({ memberships: [{ productionId: P1, role: 'performer' }, { productionId: P2, role: 'artist' }], performerIds: [PERF] });
    expect(can(alsoArtist, 'catalogue.read', { productionId: P1 })).toBe(true);
    expect(can(alsoArtist, 'catalogue.manage')).toBe(false);
  });
  it('canSomewhere agrees with can for the navigation', () => {
    for (const action of STUDIO) {
      for (const who of [admin, head, lead, artist, archivist, performer, nobody]) expect(canSomewhere(who, action), action).toBe(can(who, action));
    }
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

describe('every action, for every role, on one performer record of production P1', () => {
  // The lead of another production: appointed on P2 only.
  const leadElsewhere = actor({ leadOf: [P2] });
  const pureLead = actor({ leadOf: [P1] });
  const roles = { admin, head, lead: pureLead, artist, archivist, performer, nobody, leadElsewhere } as const;
  const Y = true;
  const N = false;
  // admin, head, lead, artist, archivist, performer (their own record), nobody, lead of another production
  const EXPECTED: Record<Action, [boolean, boolean, boolean, boolean, boolean, boolean, boolean, boolean]> = {
    'users.manage': [Y, N, N, N, N, N, N, N],
    'productions.manage': [Y, N, N, N, N, N, N, N],
    'memberships.manage': [Y, N, N, N, N, N, N, N],
    'lead.appoint': [Y, N, N, N, N, N, N, N],
    'audit.read': [Y, N, N, N, N, N, N, N],
    // Its own production's entries for the lead; the lead of another production reads theirs, not P1's.
    'audit.review': [Y, N, Y, N, N, N, N, N],
    'outbox.read': [Y, N, N, N, N, N, N, N],
    'production.view': [N, Y, Y, Y, Y, Y, N, N],
    'performers.view': [N, Y, Y, Y, Y, N, N, N],
    'performers.manage': [N, Y, Y, N, N, N, N, N],
    'consents.manage': [N, Y, Y, N, N, N, N, N],
    'consents.request': [N, Y, Y, N, N, N, N, N],
    'medical.read': [N, N, Y, N, N, Y, N, N],
    'medical.write': [N, N, Y, N, N, N, N, N],
    // Studio-wide: one department's stock, read by staff and the administrator, kept by heads and leads anywhere.
    'catalogue.read': [Y, Y, Y, Y, Y, N, N, Y],
    'catalogue.manage': [N, Y, Y, N, N, N, N, Y],
    'protocols.manage': [N, Y, Y, N, N, N, N, Y],
    'patchtests.book': [N, Y, Y, N, N, N, N, N],
    'clearance.check': [N, Y, Y, Y, N, N, N, N],
    // The performer reads their own tests; the lead alone records readings and overrides a clearance.
    'patchtests.read': [N, Y, Y, Y, Y, Y, N, N],
    'patchtests.record': [N, N, Y, N, N, N, N, N],
    'clearance.override': [N, N, Y, N, N, N, N, N],
    'applications.log': [N, N, N, Y, N, N, N, N],
    'reactions.report': [N, N, N, Y, N, N, N, N],
    'casts.read': [N, Y, Y, Y, Y, N, N, N],
    'casts.manage': [N, N, N, N, Y, N, N, N],
    // Studio-wide: one store for every production's casts.
    'archive.view': [N, Y, Y, Y, Y, N, N, Y],
    'locations.manage': [N, N, N, N, Y, N, N, N],
    'performer.self': [N, N, N, N, N, Y, N, N],
    'performer.view': [N, Y, Y, Y, Y, Y, N, N],
    // Studio-wide: the forms every production uses, and the PDF checker.
    'templates.manage': [Y, Y, Y, N, N, N, N, Y],
    'templates.read': [Y, Y, Y, N, N, N, N, Y],
    'consents.verify': [Y, Y, Y, Y, Y, N, N, Y],
    'sessions.view': [N, Y, Y, Y, Y, N, N, N],
    'sessions.book': [N, Y, Y, N, N, N, N, N],
    'consents.view': [N, Y, Y, Y, Y, Y, N, N],
    'consents.withdraw': [N, N, Y, N, N, Y, N, N],
    'accounts.unlink': [Y, Y, Y, N, N, N, N, N],
    'accounts.invite': [Y, Y, Y, N, N, N, N, N],
    // Appliance builds hold no health data: production staff read them; heads and artists make them; heads plan shoot days.
    // The lead appointment reads them; the performer reads their own through their record (performer.self).
    'builds.read': [N, Y, Y, Y, Y, N, N, N],
    'builds.manage': [N, Y, N, Y, N, N, N, N],
    'builds.plan': [N, Y, N, N, N, N, N, N],
    // Kits: heads and artists keep them; the lead appointment alone does not. Applications are read by head, lead and artists;
    // a lot's trace by the head (without health details) and the lead.
    'kits.manage': [N, Y, N, Y, N, N, N, N],
    'applications.read': [N, Y, Y, Y, N, N, N, N],
    'lots.trace': [N, Y, Y, N, N, N, N, N],
  };
  const resource = { productionId: P1, performerId: PERF, performerProductionIds: [P1] };

  it('the table names every action the policy has', () => {
    expect(Object.keys(EXPECTED).sort()).toEqual([...ACTIONS].sort());
  });
  for (const action of ACTIONS) {
    Object.entries(roles).forEach(([name, who], i) => {
      const expected = EXPECTED[action][i];
      it(`${name} ${expected ? 'may' : 'may not'} ${action}`, () => {
        expect(can(who, action, resource)).toBe(expected);
      });
    });
  }
  it('the performer may not act on another performer’s record, even on their own production', () => {
    for (const action of ['performer.view', 'medical.read', 'consents.view', 'consents.withdraw'] as const) {
      expect(can(performer, action, { productionId: P1, performerId: OTHER_PERF, performerProductionIds: [P1] }), action).toBe(false);
    }
  });
});

describe('appliance builds', () => {
  const pureLead = actor({ leadOf: [P1] });
  const headAndLead = actor({ memberships: [{ productionId: P1, role: 'head' }], leadOf: [P1] });
  it('the lead appointment reads builds and neither records nor plans them', () => {
    expect(can(pureLead, 'builds.read', { productionId: P1 })).toBe(true);
    expect(can(pureLead, 'builds.manage', { productionId: P1 })).toBe(false);
    expect(can(pureLead, 'builds.plan', { productionId: P1 })).toBe(false);
  });
  it('a lead who is also the head records and plans as the head', () => {
    expect(can(headAndLead, 'builds.manage', { productionId: P1 })).toBe(true);
    expect(can(headAndLead, 'builds.plan', { productionId: P1 })).toBe(true);
  });
  it('a role on one production grants nothing on another production’s builds', () => {
    for (const who of [head, artist, archivist]) {
      expect(can(who, 'builds.read', { productionId: P2 })).toBe(false);
      expect(can(who, 'builds.manage', { productionId: P2 })).toBe(false);
    }
  });
  it('the performer reads no build as staff, even their own, and no health data is opened by reading builds', () => {
    expect(can(performer, 'builds.read', { productionId: P1, performerId: PERF })).toBe(false);
    expect(can(artist, 'medical.read', { productionId: P1, performerId: PERF })).toBe(false);
  });
});
