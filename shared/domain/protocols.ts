/**
 * Test protocols as data: what kind of test, how long the product stays covered, how often it is applied,
 * and when each reading falls due. The head edits them; the rules below keep an edited protocol sound.
 */

export const TEST_KINDS = ['department_use', 'repeated_open', 'occluded_patch', 'short_contact'] as const;
/** Every test records its kind, so a screening result is never taken for a diagnosis. */
export type TestKind = (typeof TEST_KINDS)[number];

/** Test kinds in plain words. */
export const TEST_KIND_LABELS: Record<TestKind, string> = {
  department_use: 'Department use test',
  repeated_open: 'Repeated open application test (ROAT)',
  occluded_patch: 'Occluded patch test (read by a clinician)',
  short_contact: 'Short-contact remover test',
};

/** Every kind but the clinician's occluded patch test is screening; the screen says so beside the result. */
export function isScreeningKind(kind: TestKind): boolean {
  return kind !== 'occluded_patch';
}

/** Shown beside every screening result. */
export const SCREENING_NOTE = 'This test screens for reactions. It is not a medical diagnosis.';

/** The moment a reading's offset counts from. */
export const READING_ANCHORS = ['application', 'removal'] as const;
/** Readings of an occluded test count from removal or application; open tests from application only. */
export type ReadingAnchor = (typeof READING_ANCHORS)[number];

/** One reading of a protocol: when it falls due and how long its window stays open. */
export interface ReadingPoint {
  /** Stable within its protocol; recorded readings refer to it. Lower-case letters, digits and `_`. */
  id: string;
  /** What the reader sees, for example "D2 (after removal)". The day label of a real reading is computed. */
  label: string;
  from: ReadingAnchor;
  /** Due time, in minutes after the anchor. */
  offsetMinutes: number;
  /** The window opens this long before the due time. */
  opensBeforeMinutes: number;
  /** The window closes this long after the due time; later the reading is overdue. */
  closesAfterMinutes: number;
  /** An optional reading is offered but never holds a result back, and is never overdue. */
  optional: boolean;
}

/** How often the product goes on: once, or repeatedly on the same site for a repeated open test. */
export interface ApplicationPlan {
  timesPerDay: number;
  days: number;
  /** Repeated applications go on the same site. */
  sameSite: boolean;
}

/** A test protocol as editable data; `protocolProblems` says whether an edit is sound. */
export interface Protocol {
  /** Stable slug, for example "occluded-48h". */
  id: string;
  name: string;
  kind: TestKind;
  description: string;
  /** Minutes the patch stays covered before removal; null for an open test with nothing to remove. */
  occlusionMinutes: number | null;
  applications: ApplicationPlan;
  /** In the order they fall due. */
  readings: ReadingPoint[];
}

const MIN = 1;
const HOUR = 60 * MIN;
const DAY = 24 * HOUR;

/** The earliest reading after a patch comes off, so pressure marks from the patch can fade first. */
export const MIN_MINUTES_AFTER_REMOVAL = 15;

/** A reading must fall on D3 or later for an occluded test, so a D2-only protocol cannot be made. */
export const LATEST_READING_MIN_MINUTES = 3 * DAY;

/** One application, the plan of every test but the repeated open one. */
export const SINGLE_APPLICATION: ApplicationPlan = { timesPerDay: 1, days: 1, sameSite: true };

function point(p: Omit<ReadingPoint, 'optional'> & { optional?: boolean }): ReadingPoint {
  return { optional: false, ...p };
}

/** The protocols a new studio starts with. */
export const DEFAULT_PROTOCOLS: readonly Protocol[] = [
  {
    id: 'occluded-48h',
    name: 'Occluded patch test, 48 hours',
    kind: 'occluded_patch',
    description: 'Patches stay covered for 48 hours and come off on D2. Read on D2 after removal and again on D4; a D7 reading is optional.',
    occlusionMinutes: 48 * HOUR,
    applications: SINGLE_APPLICATION,
    readings: [
      point({ id: 'd2', label: 'D2 (after removal)', from: 'removal', offsetMinutes: 30, opensBeforeMinutes: 15, closesAfterMinutes: 8 * HOUR }),
      point({ id: 'd4', label: 'D4', from: 'application', offsetMinutes: 4 * DAY, opensBeforeMinutes: DAY, closesAfterMinutes: DAY }),
      point({ id: 'd7', label: 'D7 (optional)', from: 'application', offsetMinutes: 7 * DAY, opensBeforeMinutes: DAY, closesAfterMinutes: DAY, optional: true }),
    ],
  },
  {
    id: 'department-use',
    name: 'Department use test',
    kind: 'department_use',
    description: 'A small amount on the inner arm or behind the ear, left uncovered, read after 24 and 48 hours.',
    occlusionMinutes: null,
    applications: SINGLE_APPLICATION,
    readings: [
      point({ id: 'h24', label: '24 hours', from: 'application', offsetMinutes: 24 * HOUR, opensBeforeMinutes: 3 * HOUR, closesAfterMinutes: 6 * HOUR }),
      point({ id: 'h48', label: '48 hours', from: 'application', offsetMinutes: 48 * HOUR, opensBeforeMinutes: 3 * HOUR, closesAfterMinutes: 6 * HOUR }),
    ],
  },
  {
    id: 'roat-10d',
    name: 'Repeated open application, 10 days',
    kind: 'repeated_open',
    description: 'Applied twice a day to the same site for 10 days, left uncovered, read once a day.',
    occlusionMinutes: null,
    applications: { timesPerDay: 2, days: 10, sameSite: true },
    readings: Array.from({ length: 10 }, (_, i) =>
      point({ id: `day${i + 1}`, label: `Day ${i + 1}`, from: 'application', offsetMinutes: (i + 1) * DAY, opensBeforeMinutes: 6 * HOUR, closesAfterMinutes: 6 * HOUR }),
    ),
  },
  {
    id: 'short-contact',
    name: 'Short-contact remover test',
    kind: 'short_contact',
    description: 'A remover or other wipe-off product on a small uncovered area, read 30 and 60 minutes after it went on.',
    occlusionMinutes: null,
    applications: SINGLE_APPLICATION,
    readings: [
      point({ id: 'm30', label: '30 minutes', from: 'application', offsetMinutes: 30, opensBeforeMinutes: 5, closesAfterMinutes: 10 }),
      point({ id: 'm60', label: '60 minutes', from: 'application', offsetMinutes: 60, opensBeforeMinutes: 5, closesAfterMinutes: 20 }),
    ],
  },
];

/** Minutes from application to a point's due time, taking removal as the end of occlusion when nothing is recorded. */
export function nominalDueMinutes(protocol: Pick<Protocol, 'occlusionMinutes'>, p: ReadingPoint): number {
  return p.from === 'removal' ? (protocol.occlusionMinutes ?? 0) + p.offsetMinutes : p.offsetMinutes;
}

/** One unsound part of a protocol, with the path of the field it concerns. */
export interface ProtocolProblem {
  path: (string | number)[];
  message: string;
}

const POINT_ID = /^[a-z0-9_]{1,40}$/;

/**
 * Every way an edited protocol is unsound, each with the field it concerns. An occluded protocol needs two
 * required readings with one on D3 or later (many positives first appear after D2), and none before
 * 15 minutes after removal.
 */
export function protocolProblems(protocol: Protocol): ProtocolProblem[] {
  const problems: ProtocolProblem[] = [];
  const add = (path: (string | number)[], message: string) => problems.push({ path, message });
  const { readings, occlusionMinutes, kind, applications } = protocol;

  if (occlusionMinutes !== null && occlusionMinutes <= 0) add(['occlusionMinutes'], 'Occlusion must last longer than 0 minutes');
  if (kind === 'occluded_patch' && occlusionMinutes === null) add(['occlusionMinutes'], 'An occluded patch test needs an occlusion time');
  if ((kind === 'repeated_open' || kind === 'short_contact') && occlusionMinutes !== null) add(['occlusionMinutes'], 'This kind of test is left uncovered');

  const total = applications.timesPerDay * applications.days;
  if (kind === 'repeated_open' && total < 2) add(['applications'], 'A repeated open application test needs more than one application');
  if (kind === 'repeated_open' && !applications.sameSite) add(['applications', 'sameSite'], 'Repeated applications go on the same site');
  if (kind !== 'repeated_open' && total !== 1) add(['applications'], 'Only a repeated open application test is applied more than once');

  if (readings.length === 0) add(['readings'], 'Add at least one reading');
  const seen = new Set<string>();
  readings.forEach((p, i) => {
    if (!POINT_ID.test(p.id)) add(['readings', i, 'id'], 'Use lower-case letters, digits and _ (at most 40)');
    else if (seen.has(p.id)) add(['readings', i, 'id'], 'Each reading needs its own id');
    seen.add(p.id);
    if (p.from === 'removal' && occlusionMinutes === null) add(['readings', i, 'from'], 'Nothing is removed in an uncovered test: count from application');
    if (p.offsetMinutes < 0) add(['readings', i, 'offsetMinutes'], 'A reading cannot fall before the moment it counts from');
    if (p.opensBeforeMinutes < 0) add(['readings', i, 'opensBeforeMinutes'], 'Cannot be negative');
    if (p.closesAfterMinutes <= 0) add(['readings', i, 'closesAfterMinutes'], 'The window must stay open after the due time');
    const opens = nominalDueMinutes(protocol, p) - p.opensBeforeMinutes;
    if (opens < 0) add(['readings', i, 'opensBeforeMinutes'], 'The window cannot open before the application');
    if (occlusionMinutes !== null && opens < occlusionMinutes + MIN_MINUTES_AFTER_REMOVAL) {
      add(['readings', i, 'opensBeforeMinutes'], `A covered test is read no earlier than ${MIN_MINUTES_AFTER_REMOVAL} minutes after the patch comes off`);
    }
    const prev = readings[i - 1];
    if (prev) {
      if (nominalDueMinutes(protocol, p) <= nominalDueMinutes(protocol, prev)) add(['readings', i, 'offsetMinutes'], 'Readings must be listed in the order they fall due');
      else if (opens < nominalDueMinutes(protocol, prev) + prev.closesAfterMinutes) add(['readings', i, 'opensBeforeMinutes'], 'This window overlaps the one before it');
    }
  });

  if (kind === 'occluded_patch') {
    const required = readings.filter((p) => !p.optional);
    if (required.length < 2) add(['readings'], 'An occluded patch test needs at least two required readings');
    else if (!required.some((p) => nominalDueMinutes(protocol, p) >= LATEST_READING_MIN_MINUTES)) {
      add(['readings'], 'An occluded patch test needs a required reading on D3 or later; a reading on D2 alone misses many reactions');
    }
  }
  return problems;
}

/** The ids of the readings a result waits for. */
export function requiredPointIds(protocol: Pick<Protocol, 'readings'>): string[] {
  return protocol.readings.filter((p) => !p.optional).map((p) => p.id);
}

/** Total applications the plan asks for, for the application log's checklist. */
export function applicationCount(plan: ApplicationPlan): number {
  return plan.timesPerDay * plan.days;
}
