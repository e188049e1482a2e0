import { describe, expect, it } from 'vitest';
import {
  ALLOWED_PARENT_LEVELS,
  breadcrumb,
  canHaveParent,
  castPlacementRefusal,
  descendantIds,
  fullCodePath,
  isStorageLevel,
  LOCATION_LEVELS,
  locationCodeRefusal,
  locationDeletionRefusal,
  locationPath,
  normaliseLocationCode,
  parentLevelRefusal,
  reparentRefusal,
  resolveCodePath,
  siblingCodeClash,
  wouldCreateCycle,
  type LocationLevel,
  type LocationNode,
} from '#shared/domain/archive-locations.ts';

const node = (id: string, parentId: string | null, level: LocationLevel, code: string, name = id): LocationNode => ({ id, parentId, level, code, name });

// site › room › rack › shelf › bin, plus a second branch, written out by hand.
const TREE: LocationNode[] = [
  node('site', null, 'site', 'QS', 'Quayside Store'),
  node('north', 'site', 'room', 'NORTH', 'North Room'),
  node('south', 'site', 'room', 'SOUTH', 'South Room'),
  node('r2', 'north', 'rack', 'R2', 'Rack 2'),
  node('s3', 'r2', 'shelf', '3', 'Shelf 3'),
  node('b4', 's3', 'bin', 'B4', 'Bin B4'),
  node('r1s', 'south', 'rack', 'R1', 'Rack 1'),
  node('s1s', 'r1s', 'shelf', '1', 'Shelf 1'),
];
const PARENT = new Map(TREE.map((n) => [n.id, n.parentId]));

describe('allowed parents', () => {
  // common practice, no published source: site › room › rack › shelf › bin, a bin may also sit straight in a rack.
  const expected: Record<LocationLevel, (LocationLevel | null)[]> = {
    site: [null],
    room: ['site'],
    rack: ['room'],
    shelf: ['rack'],
    bin: ['shelf', 'rack'],
  };
  it('accepts exactly the parent levels of the hierarchy and refuses every other pairing', () => {
    for (const level of LOCATION_LEVELS) {
      for (const parent of [null, ...LOCATION_LEVELS]) {
        expect(canHaveParent(level, parent), `${level} under ${parent}`).toBe(expected[level].includes(parent));
      }
    }
    expect(Object.keys(ALLOWED_PARENT_LEVELS).sort()).toEqual([...LOCATION_LEVELS].sort());
  });
  it('explains a refusal in words naming the allowed parents', () => {
    expect(parentLevelRefusal('shelf', 'room')).toBe('A shelf goes inside a rack.');
    expect(parentLevelRefusal('bin', 'room')).toBe('A bin goes inside a shelf or a rack.');
    expect(parentLevelRefusal('site', 'room')).toMatch(/top of the tree/);
    expect(parentLevelRefusal('room', null)).toBe('A room goes inside a site.');
    expect(parentLevelRefusal('bin', 'rack')).toBeNull();
  });
});

describe('casts only on storage levels', () => {
  // Spectrum 5.0 (Collections Trust), location and movement control: record the exact position
  // "with appropriate precision (eg specific boxes, shelves, drawers and display cases)".
  it('shelves and bins hold casts; sites, rooms and racks do not', () => {
    expect(LOCATION_LEVELS.filter(isStorageLevel)).toEqual(['shelf', 'bin']);
    expect(castPlacementRefusal('shelf')).toBeNull();
    expect(castPlacementRefusal('bin')).toBeNull();
    expect(castPlacementRefusal('room')).toMatch(/shelf or in a bin, not straight into a room/);
    expect(castPlacementRefusal('rack')).not.toBeNull();
    expect(castPlacementRefusal('site')).not.toBeNull();
  });
});

describe('wouldCreateCycle', () => {
  it('refuses putting a place under itself, its child or its grandchild', () => {
    expect(wouldCreateCycle('r2', 'r2', PARENT)).toBe(true);
    expect(wouldCreateCycle('r2', 's3', PARENT)).toBe(true);
    expect(wouldCreateCycle('north', 'b4', PARENT)).toBe(true);
  });
  it('allows moves to another branch, to an ancestor, or to the top', () => {
    expect(wouldCreateCycle('s3', 'r1s', PARENT)).toBe(false);
    expect(wouldCreateCycle('b4', 'r2', PARENT)).toBe(false);
    expect(wouldCreateCycle('north', null, PARENT)).toBe(false);
  });
  it('takes a lookup function as well as a map', () => {
    expect(wouldCreateCycle('north', 'b4', (id) => PARENT.get(id))).toBe(true);
  });
  it('treats a loop already in the data as a cycle instead of walking forever', () => {
    const broken = new Map<string, string | null>([
      ['a', 'b'],
      ['b', 'a'],
    ]);
    expect(wouldCreateCycle('x', 'a', broken)).toBe(true);
  });
});

describe('reparentRefusal', () => {
  it('keys the message by the parent field: wrong level first, then cycles', () => {
    expect(reparentRefusal({ id: 's3', level: 'shelf' }, { id: 'south', level: 'room' }, PARENT)).toEqual({ parentId: ['A shelf goes inside a rack.'] });
    const looped = reparentRefusal({ id: 'r2', level: 'rack' }, { id: 'r2', level: 'rack' }, PARENT);
    expect(looped?.parentId?.[0]).toMatch(/rack goes inside a room/);
    const bin = node('b5', 's3', 'bin', 'B5');
    const tree = new Map([...PARENT, [bin.id, bin.parentId]]);
    expect(reparentRefusal({ id: 's3', level: 'shelf' }, { id: 'r1s', level: 'rack' }, tree)).toBeNull();
    expect(reparentRefusal({ id: 'b4', level: 'bin' }, { id: 'r2', level: 'rack' }, tree)).toBeNull();
  });
  it('refuses a rack moved under a shelf of its own by level before it could loop', () => {
    const r = reparentRefusal({ id: 'r2', level: 'rack' }, { id: 's3', level: 'shelf' }, PARENT);
    expect(r).toEqual({ parentId: ['A rack goes inside a room.'] });
  });
  it('reports a cycle when the levels would allow the move', () => {
    // A bin in a rack may move to a shelf; that shelf being inside the bin is impossible in a sound
    // tree, so build a deliberately inconsistent one to reach the cycle check.
    const odd = new Map<string, string | null>([
      ['bin', 'rack'],
      ['shelf', 'bin'],
    ]);
    expect(reparentRefusal({ id: 'bin', level: 'bin' }, { id: 'shelf', level: 'shelf' }, odd)).toEqual({
      parentId: ['A place cannot go inside itself or inside one of the places it holds.'],
    });
  });
});

describe('short codes', () => {
  it('accepts capitals, digits and inner hyphens up to 10 characters', () => {
    for (const ok of ['R2', 'A', '3', 'B4', 'NORTH', 'NORTH-1', 'ABCDEFGHIJ']) expect(locationCodeRefusal(ok), ok).toBeNull();
  });
  it('refuses empty, too long, slashes, spaces inside, lower case and edge hyphens', () => {
    for (const bad of ['', 'ABCDEFGHIJK', 'R/2', 'R 2', 'r2', '-R2', 'R2-', 'R_2']) expect(locationCodeRefusal(bad), bad).not.toBeNull();
  });
  it('normalises what is typed before checking', () => {
    expect(normaliseLocationCode('  r2 ')).toBe('R2');
    expect(locationCodeRefusal(normaliseLocationCode(' north-1 '))).toBeNull();
  });
  it('codes are unique among siblings only', () => {
    expect(siblingCodeClash('r2', 'north', TREE)?.id).toBe('r2');
    expect(siblingCodeClash('R2', 'south', TREE)).toBeNull();
    expect(siblingCodeClash('R2', 'north', TREE, 'r2')).toBeNull();
  });
});

describe('paths and breadcrumbs', () => {
  it('builds the full code path from the top down', () => {
    expect(fullCodePath('b4', TREE)).toBe('QS/NORTH/R2/3/B4');
    expect(fullCodePath('site', TREE)).toBe('QS');
    expect(locationPath('s3', new Map(TREE.map((n) => [n.id, n]))).map((n) => n.id)).toEqual(['site', 'north', 'r2', 's3']);
  });
  it('reads the names out as a breadcrumb', () => {
    expect(breadcrumb('s3', TREE)).toBe('Quayside Store › North Room › Rack 2 › Shelf 3');
    expect(breadcrumb('s3', TREE, ' / ')).toBe('Quayside Store / North Room / Rack 2 / Shelf 3');
  });
  // Spectrum minimum requirements (Collections Trust): access to records by location name.
  it('finds a place from its code path, in any case, and nothing for a broken path', () => {
    expect(resolveCodePath('qs/north/r2/3/b4', TREE)?.id).toBe('b4');
    expect(resolveCodePath('QS/SOUTH/R1', TREE)?.id).toBe('r1s');
    expect(resolveCodePath('QS/SOUTH/R2', TREE)).toBeNull();
    expect(resolveCodePath('NORTH/R2', TREE)).toBeNull();
    expect(resolveCodePath('//', TREE)).toBeNull();
  });
  it('lists every place below a place, not the place itself', () => {
    expect([...descendantIds('north', TREE)].sort()).toEqual(['b4', 'r2', 's3']);
    expect(descendantIds('b4', TREE).size).toBe(0);
  });
});

describe('locationDeletionRefusal', () => {
  it('allows removing an empty place only', () => {
    expect(locationDeletionRefusal({ childCount: 0, castsHere: 0, castsHomedHere: 0 })).toBeNull();
  });
  it('refuses while it holds places, casts, or is home to a cast that is out', () => {
    expect(locationDeletionRefusal({ childCount: 2, castsHere: 0, castsHomedHere: 0 })).toMatch(/2 places/);
    expect(locationDeletionRefusal({ childCount: 0, castsHere: 1, castsHomedHere: 1 })).toMatch(/1 cast;/);
    expect(locationDeletionRefusal({ childCount: 0, castsHere: 0, castsHomedHere: 1 })).toBe(
      '1 cast has this place as its normal location; give it a new home first.',
    );
    expect(locationDeletionRefusal({ childCount: 0, castsHere: 0, castsHomedHere: 3 })).toMatch(/^3 casts have .* their normal location; give them/);
  });
});
