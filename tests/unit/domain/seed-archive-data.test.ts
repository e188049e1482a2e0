import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import {
  ARCHIVE_DEMO_CASTS,
  ARCHIVE_DEMO_CONDITION_CHECKS,
  ARCHIVE_DEMO_LOCATION_LABELS,
  ARCHIVE_DEMO_LOCATIONS,
  ARCHIVE_DEMO_PERFORMERS,
  ARCHIVE_DEMO_STORAGE_CONSENTS,
  buildArchiveDemo,
  placeholderPhotoSvg,
} from '#api/db/seed-archive-data.ts';
import { BODY_REGIONS, CAST_KINDS, conditionCheckRefusal, pouredFromRefusal } from '#shared/domain/archive-casts.ts';
import { canHaveParent, fullCodePath, isStorageLevel, locationCodeRefusal, siblingCodeClash, wouldCreateCycle } from '#shared/domain/archive-locations.ts';
import { isOverdue } from '#shared/domain/archive-movements.ts';
import { governingStorageConsent, retentionStatus } from '#shared/domain/archive-retention.ts';
import { expiryFor } from '#shared/domain/consent.ts';
import { isValidLabelCode } from '#shared/domain/label-codes.ts';

const NOW = new Date('2026-11-02T10:00:00Z');
const DAY = 86_400_000;
const byKey = new Map(ARCHIVE_DEMO_LOCATIONS.map((l) => [l.key, l]));
const nodes = ARCHIVE_DEMO_LOCATIONS.map((l) => ({ id: l.key, parentId: l.parentKey, level: l.level, code: l.code, name: l.name }));

describe('demo store', () => {
  it('one site with two rooms of racks, each place under a parent of the right level', () => {
    expect(ARCHIVE_DEMO_LOCATIONS.filter((l) => l.level === 'site')).toHaveLength(1);
    const rooms = ARCHIVE_DEMO_LOCATIONS.filter((l) => l.level === 'room');
    expect(rooms).toHaveLength(2);
    for (const room of rooms) expect(ARCHIVE_DEMO_LOCATIONS.filter((l) => l.parentKey === room.key && l.level === 'rack').length).toBeGreaterThan(0);
    for (const l of ARCHIVE_DEMO_LOCATIONS) {
      const parent = l.parentKey ? byKey.get(l.parentKey) : null;
      expect(parent === undefined, `${l.key} has a parent`).toBe(false);
      expect(canHaveParent(l.level, parent?.level ?? null), l.key).toBe(true);
      expect(wouldCreateCycle(l.key, l.parentKey, (id) => byKey.get(id)?.parentKey)).toBe(false);
    }
  });
  it('short codes are well formed and unique among siblings; rooms carry temperature and RH notes', () => {
    for (const l of ARCHIVE_DEMO_LOCATIONS) {
      expect(locationCodeRefusal(l.code), l.key).toBeNull();
      expect(siblingCodeClash(l.code, l.parentKey, nodes, l.key), l.key).toBeNull();
    }
    // Spectrum 5.0: environmental data (temperature, RH) recorded per location.
    for (const room of ARCHIVE_DEMO_LOCATIONS.filter((l) => l.level === 'room')) expect(room.environment).toMatch(/°C.*RH/);
    expect(fullCodePath('north-r1-s2-b1', nodes)).toBe('GH/NORTH/R1/2/B1');
  });
  it('every label code passes its check and none repeats', () => {
    const codes = [...ARCHIVE_DEMO_CASTS.map((c) => c.labelCode), ...Object.values(ARCHIVE_DEMO_LOCATION_LABELS)];
    expect(codes.every(isValidLabelCode)).toBe(true);
    expect(new Set(codes).size).toBe(codes.length);
    expect(Object.keys(ARCHIVE_DEMO_LOCATION_LABELS)).toHaveLength(ARCHIVE_DEMO_LOCATIONS.length);
  });
});

describe('demo casts', () => {
  it('about twenty casts of the six demo performers, across regions and every kind', () => {
    expect(ARCHIVE_DEMO_CASTS).toHaveLength(20);
    const performers = new Set(ARCHIVE_DEMO_CASTS.map((c) => c.performerKey));
    expect([...performers].sort()).toEqual(ARCHIVE_DEMO_PERFORMERS.map((p) => p.key).sort());
    expect(new Set(ARCHIVE_DEMO_CASTS.map((c) => c.kind))).toEqual(new Set(CAST_KINDS));
    expect(new Set(ARCHIVE_DEMO_CASTS.map((c) => c.region)).size).toBe(BODY_REGIONS.length - 1);
    expect(new Set(ARCHIVE_DEMO_CASTS.map((c) => c.key)).size).toBe(20);
  });
  it('homes are storage places, and every positive or core links to its mold', () => {
    const casts = new Map(ARCHIVE_DEMO_CASTS.map((c) => [c.key, c]));
    for (const c of ARCHIVE_DEMO_CASTS) {
      expect(isStorageLevel(byKey.get(c.normalLocationKey)!.level), c.key).toBe(true);
      if (c.pouredFromKey) {
        const mold = casts.get(c.pouredFromKey)!;
        expect(pouredFromRefusal({ id: c.key, kind: c.kind, performerKey: c.performerKey }, { id: mold.key, kind: mold.kind, performerKey: mold.performerKey }), c.key).toBeNull();
      }
    }
    expect(ARCHIVE_DEMO_CASTS.filter((c) => c.pouredFromKey).length).toBeGreaterThanOrEqual(8);
  });
  it('condition checks are complete by the rules', () => {
    for (const c of ARCHIVE_DEMO_CONDITION_CHECKS) {
      expect(conditionCheckRefusal({ ...c, checkedOn: new Date(NOW.getTime() - c.daysAgo * DAY) }, NOW), c.castKey).toBeNull();
    }
  });
});

describe('buildArchiveDemo', () => {
  const plan = buildArchiveDemo(NOW);
  it('plays every move through the rules and keeps each one in the history', () => {
    expect(plan).toHaveLength(20);
    expect(plan.reduce((n, p) => n + p.records.length, 0)).toBe(10);
    const juno = plan.find((p) => p.cast.key === 'juno-face-positive')!;
    expect(juno.records.map((r) => r.kind)).toEqual(['check_out', 'check_in', 'check_out']);
    expect(juno.state.status).toBe('checked_out');
  });
  it('shows exactly one overdue check-out, a loan, a relocated home and a destroyed mold', () => {
    const overdue = plan.filter((p) => isOverdue(p.state, NOW));
    expect(overdue.map((p) => p.cast.key)).toEqual(['oz-head-positive']);
    expect(plan.filter((p) => p.state.status === 'on_loan')).toHaveLength(1);
    expect(plan.find((p) => p.cast.key === 'cory-head-positive')!.state.normalLocationId).toBe('south-r1-s3');
    expect(plan.filter((p) => p.state.status === 'destroyed').map((p) => p.cast.key)).toEqual(['halvard-teeth-mold']);
  });
  it('with the demo storage consents, exactly one held cast is past its review date', () => {
    // A cast follows the storage consents given to its own production.
    // seed.ts signs Juno's storage consent 38 days ago and Bea's 60 days ago; the storage template runs 1825 days.
    const signed = [
      { performerKey: 'juno', productionKey: 'lantern', signedDaysAgo: 38 },
      { performerKey: 'bea', productionKey: 'lantern', signedDaysAgo: 60 },
      ...ARCHIVE_DEMO_STORAGE_CONSENTS,
    ].map((c) => {
      const signedAt = new Date(NOW.getTime() - c.signedDaysAgo * DAY);
      return { performerKey: c.performerKey, productionKey: c.productionKey, signedAt, expiresAt: expiryFor(signedAt, 1825), withdrawnAt: null };
    });
    const states = plan.map((p) => ({
      key: p.cast.key,
      ...retentionStatus(p.state, governingStorageConsent(signed.filter((c) => c.performerKey === p.cast.performerKey && c.productionKey === p.cast.productionKey), NOW), NOW),
    }));
    expect(states.filter((s) => s.state === 'due').map((s) => s.key)).toEqual(['halvard-teeth-positive']);
    expect(states.filter((s) => s.state === 'review_soon').map((s) => s.key)).toEqual(['oz-shoulders-mold', 'oz-shoulders-positive']);
    expect(states.filter((s) => s.state === 'ended').map((s) => s.key)).toEqual(['halvard-teeth-mold']);
  });
});

describe('placeholderPhotoSvg', () => {
  it('draws an image sharp can rasterise, different for each region', async () => {
    const seen = new Set<string>();
    for (const region of BODY_REGIONS) {
      const svg = placeholderPhotoSvg({ region, kind: 'positive', width: 160, height: 120 });
      const { data, info } = await sharp(Buffer.from(svg)).raw().toBuffer({ resolveWithObject: true });
      expect([info.width, info.height]).toEqual([160, 120]);
      seen.add(data.toString('base64'));
    }
    expect(seen.size).toBe(BODY_REGIONS.length);
  });
  it('varies the backdrop by variant and the tone by kind', () => {
    const a = placeholderPhotoSvg({ region: 'hand', kind: 'mold', variant: 0 });
    expect(placeholderPhotoSvg({ region: 'hand', kind: 'mold', variant: 1 })).not.toBe(a);
    expect(placeholderPhotoSvg({ region: 'hand', kind: 'core', variant: 0 })).not.toBe(a);
  });
});
