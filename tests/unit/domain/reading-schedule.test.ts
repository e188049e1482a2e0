import { describe, expect, it } from 'vitest';
import { DEFAULT_PROTOCOLS, type Protocol } from '#shared/domain/protocols.ts';
import {
  checkReadingTime,
  checkRemovalTime,
  dayLabel,
  describeWait,
  dueNowReadings,
  outstandingRequiredPoints,
  overdueReadings,
  readingSchedule,
  readingsOpeningWithin,
  type ReadingTimeInput,
  type TestUnderReading,
} from '#shared/domain/reading-schedule.ts';

const byId = (id: string): Protocol => DEFAULT_PROTOCOLS.find((p) => p.id === id)!;
const occluded = byId('occluded-48h');
const shortContact = byId('short-contact');
const useTest = byId('department-use');
const d = (iso: string) => new Date(iso);
const MIN = 60_000;
const HOUR = 60 * MIN;
const DAY = 24 * HOUR;

// Applied on a Monday morning; patches off on the Wednesday, 48 hours later.
const applied = d('2026-03-02T09:00:00Z');
const removed = new Date(applied.getTime() + 48 * HOUR);

describe('readingSchedule for the occluded patch test', () => {
  const at = (ms: number) => readingSchedule(occluded, { appliedAt: applied, removedAt: removed, now: new Date(applied.getTime() + ms) });

  it('puts the first reading on D2, from 15 minutes after removal', () => {
    // Skin Health Institute AU: patches "removed after 48 hours (day 2)", read 10–15 min after removal
    const [d2] = at(0);
    expect(d2!.dayLabel).toBe('D2');
    expect(d2!.opensAt.getTime() - removed.getTime()).toBe(15 * MIN);
    expect(d2!.dueAt.getTime() - removed.getTime()).toBe(30 * MIN);
    expect(d2!.estimated).toBe(false);
  });

  it('labels the later readings D4 and D7 from the application day', () => {
    // ESCD 2015: D0 = application day, readings on D4 and D7 (from memory); centres number days differently (Mayo "place on day 1")
    expect(at(0).map((r) => r.dayLabel)).toEqual(['D2', 'D4', 'D7']);
    expect(at(0)[1]!.dueAt.toISOString()).toBe('2026-03-06T09:00:00.000Z');
  });

  it('moves the D2 reading with the recorded removal, not the planned one', () => {
    const lateRemoval = new Date(removed.getTime() + 2 * HOUR);
    const [d2] = readingSchedule(occluded, { appliedAt: applied, removedAt: lateRemoval, now: applied });
    expect(d2!.opensAt.getTime()).toBe(lateRemoval.getTime() + 15 * MIN);
  });

  it('estimates removal-based readings until removal is recorded, and says so', () => {
    const [d2, d4] = readingSchedule(occluded, { appliedAt: applied, now: applied });
    expect(d2!.estimated).toBe(true);
    expect(d2!.dueAt.getTime()).toBe(applied.getTime() + 48 * HOUR + 30 * MIN);
    expect(d4!.estimated).toBe(false);
  });

  it('gives each reading its status at the moment asked', () => {
    const statuses = (ms: number) => at(ms).map((r) => r.status);
    expect(statuses(48 * HOUR + 10 * MIN)).toEqual(['not_open', 'not_open', 'not_open']);
    expect(statuses(48 * HOUR + 20 * MIN)).toEqual(['open', 'not_open', 'not_open']);
    expect(statuses(3 * DAY + 1 * HOUR)).toEqual(['overdue', 'open', 'not_open']);
    // The optional D7 lapses instead of falling overdue.
    expect(statuses(9 * DAY)).toEqual(['overdue', 'overdue', 'lapsed']);
  });
});

describe('dayLabel', () => {
  it('counts minutes for short tests', () => {
    // dermatest.com open test: readings at 30 and 60 min
    const r = readingSchedule(shortContact, { appliedAt: applied, now: applied });
    expect(r.map((x) => x.dayLabel)).toEqual(['30 min', '60 min']);
  });
  it('counts hours on the application day, calendar days after it', () => {
    // ESCD 2015: D0 = application day (from memory)
    expect(dayLabel(applied, new Date(applied.getTime() + 5 * HOUR))).toBe('5 h');
    const lateEvening = d('2026-03-02T22:00:00Z');
    expect(dayLabel(lateEvening, d('2026-03-03T08:00:00Z'))).toBe('D1');
    expect(dayLabel(applied, d('2026-03-01T09:00:00Z'))).toBe('Before application');
  });
  it("counts calendar days in the production's time zone, across a clock change", () => {
    // UK clocks go forward on 29 March 2026 (from memory): 47 elapsed hours still end on D2
    const appliedLondon = d('2026-03-27T10:00:00Z');
    expect(dayLabel(appliedLondon, d('2026-03-29T09:00:00Z'), 'Europe/London')).toBe('D2');
    // 23:30 in New York is already the next day in UTC
    const appliedNy = d('2026-03-03T04:30:00Z');
    expect(dayLabel(appliedNy, d('2026-03-03T13:00:00Z'), 'America/New_York')).toBe('D1');
    expect(dayLabel(appliedNy, d('2026-03-03T13:00:00Z'), 'UTC')).toBe('8 h');
  });
  it('gives department use test readings as D1 and D2', () => {
    const r = readingSchedule(useTest, { appliedAt: applied, now: applied });
    expect(r.map((x) => x.dayLabel)).toEqual(['D1', 'D2']);
  });
  it('agrees with the zone’s own calendar at every minute around midnight, in zones off the hour and an old odd offset', () => {
    // Reference: Intl.DateTimeFormat (ECMA-402) asked directly for each moment's calendar day, no day kept.
    const dayOf = (at: Date, timeZone: string) => {
      const p = Object.fromEntries(new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).formatToParts(at).map((x) => [x.type, x.value]));
      return Date.UTC(Number(p.year), Number(p.month) - 1, Number(p.day)) / 86_400_000;
    };
    const cases: [string, string][] = [
      ['Asia/Kathmandu', '2026-06-10T18:15:00Z'], // +05:45
      ['Australia/Eucla', '2026-06-10T15:15:00Z'], // +08:45
      ['America/St_Johns', '2026-11-01T03:30:00Z'], // −03:30, the night its clocks go back
      ['Europe/London', '2026-03-29T00:00:00Z'],
      ['Africa/Monrovia', '1970-06-11T00:44:30Z'], // −00:44:30 then: midnight falls inside a quarter hour
    ];
    let checked = 0;
    for (const [zone, midnightish] of cases) {
      const applied = new Date(Date.parse(midnightish) - 5 * HOUR);
      for (let m = -90; m <= 90; m++) {
        const at = new Date(Date.parse(midnightish) + m * 60_000 + 17_000);
        const days = dayOf(at, zone) - dayOf(applied, zone);
        const minutes = Math.floor((at.getTime() - applied.getTime()) / 60_000);
        expect(dayLabel(applied, at, zone)).toBe(days === 0 ? `${Math.floor(minutes / 60)} h` : `D${days}`);
        checked += 1;
      }
    }
    expect(checked).toBe(5 * 181);
  });
});

describe('checkReadingTime', () => {
  const base: ReadingTimeInput = { status: 'applied', appliedAt: applied, removedAt: removed, pointId: 'd2', at: removed, now: d('2026-03-20T00:00:00Z') };
  const check = (over: Partial<ReadingTimeInput>) => checkReadingTime(occluded, { ...base, ...over });
  const afterRemoval = (minutes: number) => new Date(removed.getTime() + minutes * MIN);

  it('refuses the D2 reading less than 15 minutes after patch removal, and says why', () => {
    // Skin Health Institute AU: read 10–15 min after removal, so pressure artefacts can fade
    const r = check({ at: afterRemoval(10) });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.reason).toBe('before_window');
    expect(r.message).toMatch(/15 minutes after the patches come off/);
    expect(r.message).toMatch(/5 minutes/);
    expect(r.opensAt!.getTime()).toBe(afterRemoval(15).getTime());
  });

  it('accepts it from 15 minutes after removal', () => {
    const r = check({ at: afterRemoval(15) });
    expect(r.ok).toBe(true);
    if (r.ok) expect(r.late).toBe(false);
  });

  it('accepts a late reading and marks it late', () => {
    const r = check({ pointId: 'd4', at: d('2026-03-08T09:00:00Z') });
    expect(r).toMatchObject({ ok: true, late: true });
  });

  it('refuses any reading of an occluded test until removal is recorded', () => {
    expect(check({ removedAt: null, at: afterRemoval(30) })).toMatchObject({ ok: false, reason: 'removal_not_recorded' });
    expect(check({ removedAt: null, pointId: 'd4', at: d('2026-03-06T09:00:00Z') })).toMatchObject({ ok: false, reason: 'removal_not_recorded' });
  });

  it('keeps 15 minutes after a late removal even inside a later window', () => {
    // Skin Health Institute AU: 10–15 min after removal, whenever the removal happened
    const veryLate = d('2026-03-05T20:00:00Z');
    const r = check({ removedAt: veryLate, pointId: 'd4', at: new Date(veryLate.getTime() + 5 * MIN) });
    expect(r).toMatchObject({ ok: false, reason: 'before_window' });
  });

  it('refuses readings of a closed, cancelled or not yet applied test', () => {
    expect(check({ status: 'closed', at: afterRemoval(30) })).toMatchObject({ ok: false, reason: 'test_closed' });
    expect(check({ status: 'cancelled', at: afterRemoval(30) })).toMatchObject({ ok: false, reason: 'test_cancelled' });
    expect(check({ status: 'booked', appliedAt: null })).toMatchObject({ ok: false, reason: 'not_applied' });
  });

  it('refuses an unknown reading, one already recorded, and one dated in the future', () => {
    expect(check({ pointId: 'd3' })).toMatchObject({ ok: false, reason: 'unknown_point' });
    expect(check({ at: afterRemoval(30), takenPointIds: ['d2'] })).toMatchObject({ ok: false, reason: 'already_recorded' });
    expect(check({ at: afterRemoval(30), now: afterRemoval(20) })).toMatchObject({ ok: false, reason: 'in_future' });
  });

  it('states the wait for an open test in plain words', () => {
    const r = checkReadingTime(shortContact, { status: 'applied', appliedAt: applied, pointId: 'm30', at: new Date(applied.getTime() + 20 * MIN), now: d('2026-03-20T00:00:00Z') });
    expect(r).toMatchObject({ ok: false, reason: 'before_window', message: 'Too early for the 30 minutes reading: its window opens in 5 minutes.' });
    expect(describeWait(3 * HOUR)).toBe('3 hours');
    expect(describeWait(3 * DAY)).toBe('3 days');
    expect(describeWait(MIN)).toBe('1 minute');
  });
});

describe('checkRemovalTime', () => {
  it('refuses a removal before application or in the future', () => {
    expect(checkRemovalTime(applied, d('2026-03-01T00:00:00Z'), removed).ok).toBe(false);
    expect(checkRemovalTime(applied, new Date(removed.getTime() + HOUR), removed).ok).toBe(false);
    expect(checkRemovalTime(applied, removed, removed).ok).toBe(true);
  });
});

describe("the lead's reading lists", () => {
  type Row = TestUnderReading & { id: string };
  const test = (id: string, over: Partial<Row> = {}): Row => ({ id, status: 'applied', protocol: occluded, appliedAt: applied, removedAt: removed, takenPointIds: [], ...over });
  const now = new Date(removed.getTime() + 40 * MIN);

  it('lists readings open now, soonest due first, with the caller’s own fields', () => {
    const earlier = test('a', { appliedAt: new Date(applied.getTime() - HOUR), removedAt: new Date(removed.getTime() - HOUR) });
    const due = dueNowReadings([test('b'), earlier, test('c', { takenPointIds: ['d2'] })], now);
    expect(due.map((t) => `${t.test.id}:${t.reading.pointId}`)).toEqual(['a:d2', 'b:d2']);
  });

  it('lists required readings whose window closed untaken, and not booked or closed tests', () => {
    const later = d('2026-03-10T12:00:00Z');
    const rows = [test('a', { takenPointIds: ['d2'] }), test('b', { status: 'closed' }), test('c', { status: 'booked', appliedAt: null, removedAt: null })];
    expect(overdueReadings(rows, later).map((t) => `${t.test.id}:${t.reading.pointId}`)).toEqual(['a:d4']);
  });

  it('lists readings about to open, for reminders', () => {
    const soon = readingsOpeningWithin([test('a')], new Date(removed.getTime() - 30 * MIN), 60);
    expect(soon.map((t) => t.reading.pointId)).toEqual(['d2']);
  });

  it('knows which required readings a result still waits for', () => {
    expect(outstandingRequiredPoints(occluded, ['d2'])).toEqual(['d4']);
    expect(outstandingRequiredPoints(occluded, ['d2', 'd4'])).toEqual([]);
  });
});
