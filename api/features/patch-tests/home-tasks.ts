import { dueNowReadings, overdueReadings, readingsOpeningWithin, type ReadingTask } from '#shared/domain/reading-schedule.ts';
import type { Db } from '../../db/index.ts';
import { listTestRows, type TestRow } from './repo.ts';
import { listTestSummaries } from './view.ts';

const DAY = 86_400_000;

interface HomeTask {
  id: string;
  title: string;
  detail: string;
  count: number;
  href: string | null;
  /** Who, and the moment for the client to word. */
  items?: { label: string; at: string | null }[];
}

/** A test under reading with the protocol it was booked on, as the reading lists and the reminder job read it. */
export type TestUnderReadingRow = TestRow;

/** Every test under reading (of one production, or all), each with its protocol, sites and points read: one query. */
export async function testsUnderReading(db: Db, productionId?: string): Promise<TestUnderReadingRow[]> {
  return listTestRows(db, { productionId, statuses: ['applied'] });
}

/** The lead's three reading lists: open now, opening within a day, and overdue. */
export async function readingLists(db: Db, productionId: string | undefined, now: Date, timeZone: string) {
  const tests = await testsUnderReading(db, productionId);
  return {
    dueNow: dueNowReadings(tests, now, timeZone),
    upcoming: readingsOpeningWithin(tests, now, 24 * 60, timeZone),
    overdue: overdueReadings(tests, now, timeZone),
  };
}

function names(tasks: readonly ReadingTask<TestUnderReadingRow>[], empty: string): string {
  if (tasks.length === 0) return empty;
  return tasks.slice(0, 3).map((t) => `${t.test.performerName}: ${t.reading.label}`).join(', ') + (tasks.length > 3 ? '…' : '');
}

/** The lead's home: readings due now, opening within a day, and overdue, each linking to the first test. */
export async function leadReadingTasks(db: Db, productionId: string, now: Date, timeZone: string): Promise<HomeTask[]> {
  const { dueNow, upcoming, overdue } = await readingLists(db, productionId, now, timeZone);
  const href = (list: readonly ReadingTask<TestUnderReadingRow>[]) => (list[0] ? `/patch-tests/${list[0].test.id}` : null);
  return [
    { id: 'readings-due-now', title: 'Readings due now', detail: names(dueNow, 'No reading window is open right now.'), count: dueNow.length, href: href(dueNow) },
    { id: 'readings-overdue', title: 'Overdue readings', detail: names(overdue, 'No reading is overdue.'), count: overdue.length, href: href(overdue) },
    { id: 'readings-upcoming', title: 'Readings opening within a day', detail: names(upcoming, 'No reading window opens in the next 24 hours.'), count: upcoming.length, href: href(upcoming) },
  ];
}

/** The head's home: booked tests waiting for a consent, and tests booked this week (next seven days). */
export async function headPatchTestTasks(db: Db, productionId: string, now: Date): Promise<HomeTask[]> {
  const booked = await listTestSummaries(db, { productionId, statuses: ['booked'], startsFrom: new Date(now.getTime() - DAY) });
  const waiting = booked.filter((t) => t.consentMissing);
  const week = booked.filter((t) => new Date(t.startsAt).getTime() < now.getTime() + 7 * DAY);
  // The client words each test's time in the reader's locale; the detail only says what the list is.
  const items = (tests: typeof booked) => tests.slice(0, 3).map((t) => ({ label: t.performerName, at: t.startsAt }));
  const first = (tests: typeof booked, some: string) => (tests.length > 3 ? `${some}; the first three of ${tests.length}:` : `${some}:`);
  return [
    {
      id: 'patch-tests-need-consent',
      title: 'Patch tests waiting for a consent',
      detail: waiting.length ? first(waiting, 'Ask for the patch-testing consent before the test') : 'Every booked test has its patch-testing consent.',
      count: waiting.length,
      href: waiting[0] ? `/patch-tests/${waiting[0].id}` : null,
      items: items(waiting),
    },
    {
      id: 'patch-tests-this-week',
      title: 'Patch tests this week',
      detail: week.length ? first(week, 'Booked in the next seven days') : 'No patch test is booked in the next seven days.',
      count: week.length,
      href: week[0] ? `/patch-tests/${week[0].id}` : null,
      items: items(week),
    },
  ];
}
