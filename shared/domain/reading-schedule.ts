/**
 * When each reading of a test falls due, from the recorded application and removal times and the protocol,
 * and whether a reading may be recorded at a given moment.
 */
import { MIN_MINUTES_AFTER_REMOVAL, requiredPointIds, type Protocol, type ReadingPoint } from './protocols.ts';

/** The life of a test: booked, applied and under reading, closed by the lead, or cancelled. */
export const TEST_STATUSES = ['booked', 'applied', 'closed', 'cancelled'] as const;
/** Where a test is in its life. */
export type TestStatus = (typeof TEST_STATUSES)[number];

/** Test statuses in plain words. */
export const TEST_STATUS_LABELS: Record<TestStatus, string> = {
  booked: 'Booked',
  applied: 'Under reading',
  closed: 'Closed',
  cancelled: 'Cancelled',
};

/** `done` is not computed here: the caller knows which readings were recorded. */
export type ReadingStatus = 'not_open' | 'open' | 'overdue' | 'lapsed';

/** Reading statuses in plain words, `done` included for the caller. */
export const READING_STATUS_LABELS: Record<ReadingStatus | 'done', string> = {
  not_open: 'Not yet open',
  open: 'Open now',
  overdue: 'Overdue',
  lapsed: 'Not taken (optional)',
  done: 'Done',
};

/** One reading of one test, placed in time from the recorded application and removal. */
export interface ScheduledReading {
  pointId: string;
  label: string;
  optional: boolean;
  from: ReadingPoint['from'];
  dueAt: Date;
  opensAt: Date;
  closesAt: Date;
  /** Day label of the due time, D0 being the calendar day of application, e.g. "D2", "30 min". */
  dayLabel: string;
  /** True when the point counts from removal and no removal is recorded: times assume removal at the end of occlusion. */
  estimated: boolean;
  status: ReadingStatus;
}

/** The recorded moments a schedule counts from. */
export interface TestTimes {
  appliedAt: Date;
  removedAt?: Date | null;
}

const MINUTE_MS = 60_000;
const dayFormatters = new Map<string, Intl.DateTimeFormat>();

function formattedDay(ms: number, timeZone: string): number {
  let f = dayFormatters.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' });
    dayFormatters.set(timeZone, f);
  }
  const parts = Object.fromEntries(f.formatToParts(ms).map((p) => [p.type, p.value]));
  return Date.UTC(Number(parts.year), Number(parts.month) - 1, Number(parts.day)) / 86_400_000;
}

/** Days are looked up by quarter hour: zones move midnight by whole quarter hours today. */
const QUARTER_MS = 15 * MINUTE_MS;
const DAYS_KEPT = 20_000;
const keptDays = new Map<string, number>();

/**
 * The calendar day of a moment in a zone, as days since 1970-01-01. A quarter hour whose first and last
 * millisecond fall on the same day is kept, since every moment in it does too; one a midnight cuts
 * (an old zone's odd offset) is worked out each time.
 */
function calendarDay(at: Date, timeZone: string): number {
  const quarter = Math.floor(at.getTime() / QUARTER_MS);
  const key = `${timeZone}|${quarter}`;
  const kept = keptDays.get(key);
  if (kept !== undefined) return kept;
  const first = formattedDay(quarter * QUARTER_MS, timeZone);
  if (formattedDay((quarter + 1) * QUARTER_MS - 1, timeZone) !== first) return formattedDay(at.getTime(), timeZone);
  if (keptDays.size >= DAYS_KEPT) keptDays.clear();
  keptDays.set(key, first);
  return first;
}

/**
 * Day label of a moment in a test, from real timestamps: under two hours after application it is minutes
 * ("30 min"), later on the application day hours ("5 h"), after that the calendar day counted from the
 * application day as D0 ("D2"), in the production's time zone.
 */
export function dayLabel(appliedAt: Date, at: Date, timeZone = 'UTC'): string {
  const minutes = Math.floor((at.getTime() - appliedAt.getTime()) / MINUTE_MS);
  if (minutes < 0) return 'Before application';
  if (minutes < 120) return `${minutes} min`;
  const day = calendarDay(at, timeZone) - calendarDay(appliedAt, timeZone);
  return day === 0 ? `${Math.floor(minutes / 60)} h` : `D${day}`;
}

function statusAt(p: ReadingPoint, opensAt: Date, closesAt: Date, now: Date): ReadingStatus {
  if (now.getTime() < opensAt.getTime()) return 'not_open';
  if (now.getTime() <= closesAt.getTime()) return 'open';
  return p.optional ? 'lapsed' : 'overdue';
}

function scheduleOne(protocol: Protocol, p: ReadingPoint, times: TestTimes, now: Date, timeZone: string): ScheduledReading {
  const removal = times.removedAt ?? null;
  const estimated = p.from === 'removal' && removal === null;
  const anchor =
    p.from === 'application'
      ? times.appliedAt.getTime()
      : (removal?.getTime() ?? times.appliedAt.getTime() + (protocol.occlusionMinutes ?? 0) * MINUTE_MS);
  const due = anchor + p.offsetMinutes * MINUTE_MS;
  const opensAt = new Date(due - p.opensBeforeMinutes * MINUTE_MS);
  const closesAt = new Date(due + p.closesAfterMinutes * MINUTE_MS);
  return {
    pointId: p.id,
    label: p.label,
    optional: p.optional,
    from: p.from,
    dueAt: new Date(due),
    opensAt,
    closesAt,
    dayLabel: dayLabel(times.appliedAt, new Date(due), timeZone),
    estimated,
    status: statusAt(p, opensAt, closesAt, now),
  };
}

/** Every reading of a test with its due time and window, in protocol order; removal-based ones estimated until removal is recorded. */
export function readingSchedule(protocol: Protocol, input: TestTimes & { now: Date; timeZone?: string }): ScheduledReading[] {
  return protocol.readings.map((p) => scheduleOne(protocol, p, input, input.now, input.timeZone ?? 'UTC'));
}

/** Why a reading cannot be recorded now. */
export type ReadingRefusal =
  | 'unknown_point'
  | 'not_applied'
  | 'test_closed'
  | 'test_cancelled'
  | 'already_recorded'
  | 'removal_not_recorded'
  | 'before_window'
  | 'in_future';

/** A reading may be recorded (late or not), or is refused with a reason and a message. */
export type ReadingTimeCheck =
  | { ok: true; reading: ScheduledReading; late: boolean }
  | { ok: false; reason: ReadingRefusal; message: string; opensAt?: Date };

/** The facts `checkReadingTime` needs about one test and one reading. */
export interface ReadingTimeInput {
  status: TestStatus;
  appliedAt: Date | null;
  removedAt?: Date | null;
  pointId: string;
  /** The moment the reading is recorded as taken. */
  at: Date;
  /** The server's clock; a reading cannot be dated in the future. */
  now: Date;
  takenPointIds?: readonly string[];
  timeZone?: string;
}

/** A wait in plain words: "7 minutes", "3 hours", "2 days". */
export function describeWait(ms: number): string {
  const minutes = Math.ceil(ms / MINUTE_MS);
  if (minutes < 120) return `${minutes} minute${minutes === 1 ? '' : 's'}`;
  const hours = Math.ceil(minutes / 60);
  if (hours < 48) return `${hours} hours`;
  return `${Math.ceil(hours / 24)} days`;
}

/** Small clock drift between a tablet and the server is not a future reading. */
const FUTURE_TOLERANCE_MS = 5 * MINUTE_MS;

/**
 * Whether a reading may be recorded for this point at this moment; a refusal says why in words the lead can
 * act on. A reading after its window closes is accepted and marked late: a late result is still a result.
 */
export function checkReadingTime(protocol: Protocol, input: ReadingTimeInput): ReadingTimeCheck {
  const p = protocol.readings.find((r) => r.id === input.pointId);
  if (!p) return { ok: false, reason: 'unknown_point', message: `This protocol has no reading called "${input.pointId}".` };
  if (input.status === 'cancelled') return { ok: false, reason: 'test_cancelled', message: 'This test was cancelled; no more readings can be recorded.' };
  if (input.status === 'closed') return { ok: false, reason: 'test_closed', message: 'This test is closed; no more readings can be recorded.' };
  if (input.status === 'booked' || input.appliedAt === null) {
    return { ok: false, reason: 'not_applied', message: 'Record when the test was applied before recording a reading.' };
  }
  if (input.takenPointIds?.includes(p.id)) {
    return { ok: false, reason: 'already_recorded', message: `The ${p.label} reading is already recorded; correct it instead.` };
  }
  if (input.at.getTime() > input.now.getTime() + FUTURE_TOLERANCE_MS) {
    return { ok: false, reason: 'in_future', message: 'A reading cannot be dated in the future.' };
  }
  const removedAt = input.removedAt ?? null;
  if ((p.from === 'removal' || protocol.occlusionMinutes !== null) && !removedAt) {
    return { ok: false, reason: 'removal_not_recorded', message: `Record when the patches came off first: the ${p.label} reading comes after removal.` };
  }
  const reading = scheduleOne(protocol, p, { appliedAt: input.appliedAt, removedAt }, input.at, input.timeZone ?? 'UTC');
  // A late removal can push the earliest sound moment past the window's opening, so both bounds apply.
  const afterRemoval = removedAt && protocol.occlusionMinutes !== null ? removedAt.getTime() + MIN_MINUTES_AFTER_REMOVAL * MINUTE_MS : -Infinity;
  const earliest = Math.max(reading.opensAt.getTime(), afterRemoval);
  if (input.at.getTime() < earliest) {
    const wait = describeWait(earliest - input.at.getTime());
    const minutesAfter = Math.max(MIN_MINUTES_AFTER_REMOVAL, p.from === 'removal' ? p.offsetMinutes - p.opensBeforeMinutes : 0);
    const message =
      earliest === afterRemoval || p.from === 'removal'
        ? `Too early for the ${p.label} reading: it can be read from ${minutesAfter} minutes after the patches come off, so that marks from the patch can fade. Wait another ${wait}.`
        : `Too early for the ${p.label} reading: its window opens in ${wait}.`;
    return { ok: false, reason: 'before_window', message, opensAt: new Date(earliest) };
  }
  return { ok: true, reading, late: input.at.getTime() > reading.closesAt.getTime() };
}

/** Whether a removal time can be recorded: not before application, not in the future. */
export function checkRemovalTime(appliedAt: Date, removedAt: Date, now: Date): { ok: true } | { ok: false; message: string } {
  if (removedAt.getTime() < appliedAt.getTime()) return { ok: false, message: 'The patches cannot come off before they went on.' };
  if (removedAt.getTime() > now.getTime() + FUTURE_TOLERANCE_MS) return { ok: false, message: 'A removal cannot be dated in the future.' };
  return { ok: true };
}

/** Required readings not yet recorded: while any remain, the result is outstanding. */
export function outstandingRequiredPoints(protocol: Pick<Protocol, 'readings'>, takenPointIds: readonly string[]): string[] {
  const taken = new Set(takenPointIds);
  return requiredPointIds(protocol).filter((id) => !taken.has(id));
}

/** One test as the lead's task lists see it; the caller's own fields ride along untouched. */
export interface TestUnderReading {
  status: TestStatus;
  protocol: Protocol;
  appliedAt: Date | null;
  removedAt: Date | null;
  takenPointIds: readonly string[];
}

/** One entry of the lead's reading lists: the caller's test row and the reading it waits for. */
export interface ReadingTask<T> {
  test: T;
  reading: ScheduledReading;
}

function tasks<T extends TestUnderReading>(tests: readonly T[], now: Date, timeZone: string, keep: (r: ScheduledReading) => boolean): ReadingTask<T>[] {
  const out: ReadingTask<T>[] = [];
  for (const test of tests) {
    if (test.status !== 'applied' || !test.appliedAt) continue;
    const taken = new Set(test.takenPointIds);
    for (const reading of readingSchedule(test.protocol, { appliedAt: test.appliedAt, removedAt: test.removedAt, now, timeZone })) {
      if (!taken.has(reading.pointId) && keep(reading)) out.push({ test, reading });
    }
  }
  return out.sort((a, b) => a.reading.dueAt.getTime() - b.reading.dueAt.getTime());
}

/** Readings whose window is open now and not yet taken, soonest due first: the lead's "due now" list. */
export function dueNowReadings<T extends TestUnderReading>(tests: readonly T[], now: Date, timeZone = 'UTC'): ReadingTask<T>[] {
  return tasks(tests, now, timeZone, (r) => r.status === 'open');
}

/** Required readings whose window has closed untaken, oldest first. Optional ones lapse quietly. */
export function overdueReadings<T extends TestUnderReading>(tests: readonly T[], now: Date, timeZone = 'UTC'): ReadingTask<T>[] {
  return tasks(tests, now, timeZone, (r) => r.status === 'overdue');
}

/** Readings whose window opens within the next `minutes`: what a reminder is sent for. */
export function readingsOpeningWithin<T extends TestUnderReading>(tests: readonly T[], now: Date, minutes: number, timeZone = 'UTC'): ReadingTask<T>[] {
  const limit = now.getTime() + minutes * MINUTE_MS;
  return tasks(tests, now, timeZone, (r) => r.status === 'not_open' && r.opensAt.getTime() <= limit);
}
