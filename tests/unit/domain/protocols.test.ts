import { describe, expect, it } from 'vitest';
import {
  applicationCount,
  DEFAULT_PROTOCOLS,
  isScreeningKind,
  nominalDueMinutes,
  protocolProblems,
  requiredPointIds,
  TEST_KINDS,
  type Protocol,
  type ReadingPoint,
} from '#shared/domain/protocols.ts';
import { ProtocolSchema } from '#shared/schemas/patch-tests.ts';

const byId = (id: string): Protocol => DEFAULT_PROTOCOLS.find((p) => p.id === id)!;
const occluded = byId('occluded-48h');
const roat = byId('roat-10d');
const shortContact = byId('short-contact');
const useTest = byId('department-use');
const HOUR = 60;
const DAY = 24 * HOUR;

function messages(p: Protocol): string {
  return protocolProblems(p)
    .map((x) => x.message)
    .join(' | ');
}

describe('the seeded protocols', () => {
  it('cover every test kind once and are all sound', () => {
    expect(DEFAULT_PROTOCOLS.map((p) => p.kind).sort()).toEqual([...TEST_KINDS].sort());
    for (const p of DEFAULT_PROTOCOLS) {
      expect(protocolProblems(p), p.id).toEqual([]);
      expect(ProtocolSchema.safeParse(p).success, p.id).toBe(true);
    }
  });

  it('occluded patch test: 48 hours under occlusion, removal on D2', () => {
    // Skin Health Institute AU: "removed after 48 hours (day 2)"; ESCD 2015 2-day occlusion (from memory)
    expect(occluded.occlusionMinutes).toBe(48 * HOUR);
    expect(occluded.occlusionMinutes! / DAY).toBe(2);
  });

  it('occluded patch test: reads on D2 after removal and on D4, D7 optional', () => {
    // ESCD 2015: read on D2 and D3 or D4, D7 recommended (from memory); update news "no single D2 reading" (medznat.ru)
    expect(occluded.readings.map((r) => [r.id, r.optional])).toEqual([
      ['d2', false],
      ['d4', false],
      ['d7', true],
    ]);
    expect(nominalDueMinutes(occluded, occluded.readings[1]!) / DAY).toBe(4);
    expect(nominalDueMinutes(occluded, occluded.readings[2]!) / DAY).toBe(7);
    expect(requiredPointIds(occluded)).toEqual(['d2', 'd4']);
  });

  it('occluded patch test: the first reading opens no sooner than 15 minutes after removal', () => {
    // Skin Health Institute AU: read 10–15 min after removal; Plinth takes the later bound
    const d2 = occluded.readings[0]!;
    expect(d2.from).toBe('removal');
    expect(d2.offsetMinutes - d2.opensBeforeMinutes).toBe(15);
    // skinpulse.ch reads 20–30 min after removal: the due time falls inside that range
    expect(d2.offsetMinutes).toBeGreaterThanOrEqual(20);
    expect(d2.offsetMinutes).toBeLessThanOrEqual(30);
  });

  it('ROAT: twice a day on the same site for at least 10 days, read daily', () => {
    // altmeyers.org "Use test" and ACDS survey 2015: twice daily, same site; French DAG study: run ≥ 10 days
    expect(roat.applications).toEqual({ timesPerDay: 2, days: 10, sameSite: true });
    expect(roat.applications.days).toBeGreaterThanOrEqual(10);
    expect(applicationCount(roat.applications)).toBe(20);
    expect(roat.readings.map((r) => r.offsetMinutes / DAY)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10]);
    expect(roat.occlusionMinutes).toBeNull();
  });

  it('short-contact test: uncovered, read at 30 and 60 minutes', () => {
    // dermatest.com open test: read at 30 and 60 min (a lab protocol, not a guideline)
    expect(shortContact.occlusionMinutes).toBeNull();
    expect(shortContact.readings.map((r) => [r.from, r.offsetMinutes])).toEqual([
      ['application', 30],
      ['application', 60],
    ]);
  });

  it('department use test: read at 24 and 48 hours', () => {
    // common practice, no published source (the theatre "dot a day ahead" is a screening test: FHSU; zombiemaker.com)
    expect(useTest.readings.map((r) => r.offsetMinutes / HOUR)).toEqual([24, 48]);
    expect(isScreeningKind('department_use')).toBe(true);
    expect(isScreeningKind('occluded_patch')).toBe(false);
  });
});

describe('protocolProblems', () => {
  const d2 = occluded.readings[0]!;
  const d7 = occluded.readings[2]!;

  it('refuses a D2-only occluded protocol', () => {
    // IVDK: 34.5 % of positives first appeared at D3; "readings beyond day 2 are necessary"
    expect(messages({ ...occluded, readings: [d2] })).toMatch(/at least two required readings/);
  });

  it('refuses D2 with only an optional later reading', () => {
    // Contact Dermatitis 1991;24:119-22: 24 % of allergic reactions were negative at D2 and positive at D4
    expect(messages({ ...occluded, readings: [d2, d7] })).toMatch(/at least two required readings/);
  });

  it('refuses two readings that both fall on D2', () => {
    // IVDK 34.5 % first seen at D3: a second reading on the same day does not help
    const d2late: ReadingPoint = { ...d2, id: 'd2b', offsetMinutes: 10 * HOUR, opensBeforeMinutes: 60, closesAfterMinutes: 60 };
    expect(messages({ ...occluded, readings: [d2, d2late] })).toMatch(/D3 or later/);
  });

  it('refuses a reading window that opens less than 15 minutes after removal', () => {
    // Skin Health Institute AU: 10–15 min after removal, so pressure artefacts can fade
    const early = { ...occluded, readings: [{ ...d2, offsetMinutes: 10, opensBeforeMinutes: 0 }, ...occluded.readings.slice(1)] };
    expect(messages(early)).toMatch(/no earlier than 15 minutes after the patch comes off/);
    const atFifteen = { ...occluded, readings: [{ ...d2, offsetMinutes: 15, opensBeforeMinutes: 0 }, ...occluded.readings.slice(1)] };
    expect(protocolProblems(atFifteen)).toEqual([]);
  });

  it('refuses an application-based reading that would fall while the patch is still on', () => {
    const during = { ...occluded, readings: [{ ...d2, from: 'application' as const, offsetMinutes: 24 * HOUR, opensBeforeMinutes: 0 }, ...occluded.readings.slice(1)] };
    expect(messages(during)).toMatch(/15 minutes after the patch comes off/);
  });

  it('refuses readings out of order and overlapping windows', () => {
    const swapped = { ...occluded, readings: [occluded.readings[1]!, occluded.readings[0]!, d7] };
    expect(messages(swapped)).toMatch(/order they fall due/);
    const overlap = { ...useTest, readings: [useTest.readings[0]!, { ...useTest.readings[1]!, opensBeforeMinutes: 30 * HOUR }] };
    expect(messages(overlap)).toMatch(/overlaps/);
  });

  it('refuses unsound windows, duplicate ids and bad ids', () => {
    const r = useTest.readings[0]!;
    expect(messages({ ...useTest, readings: [{ ...r, closesAfterMinutes: 0 }] })).toMatch(/stay open after the due time/);
    expect(messages({ ...useTest, readings: [{ ...r, opensBeforeMinutes: 25 * HOUR }] })).toMatch(/before the application/);
    expect(messages({ ...useTest, readings: [r, { ...useTest.readings[1]!, id: r.id }] })).toMatch(/its own id/);
    expect(messages({ ...useTest, readings: [{ ...r, id: 'Day One' }] })).toMatch(/lower-case/);
    expect(messages({ ...useTest, readings: [] })).toMatch(/at least one reading/);
  });

  it('keeps the kinds honest: occlusion, removal and repeated applications', () => {
    expect(messages({ ...occluded, occlusionMinutes: null })).toMatch(/needs an occlusion time/);
    expect(messages({ ...roat, occlusionMinutes: 48 * HOUR })).toMatch(/left uncovered/);
    expect(messages({ ...useTest, readings: [{ ...useTest.readings[0]!, from: 'removal' }] })).toMatch(/count from application/);
    expect(messages({ ...roat, applications: { timesPerDay: 1, days: 1, sameSite: true } })).toMatch(/more than one application/);
    expect(messages({ ...roat, applications: { ...roat.applications, sameSite: false } })).toMatch(/same site/);
    expect(messages({ ...useTest, applications: { timesPerDay: 2, days: 3, sameSite: true } })).toMatch(/Only a repeated open application/);
  });
});

describe('ProtocolSchema', () => {
  it('reports each problem against its field', () => {
    const r = ProtocolSchema.safeParse({ ...occluded, readings: [occluded.readings[0]] });
    expect(r.success).toBe(false);
    expect(r.error!.issues.map((i) => i.path.join('.'))).toContain('readings');
  });
  it('refuses fractional and negative minutes before any rule runs', () => {
    const bad = { ...useTest, readings: [{ ...useTest.readings[0]!, offsetMinutes: -5 }] };
    expect(ProtocolSchema.safeParse(bad).success).toBe(false);
    expect(ProtocolSchema.safeParse({ ...useTest, occlusionMinutes: 1.5 }).success).toBe(false);
  });
});
