import type { AppContext } from '../context.ts';

/** What a job's handler is given for one run. */
export interface JobRun<T> {
  ctx: AppContext;
  /** The data the run was sent with ({} for scheduled runs). */
  data: T;
  jobId: string;
  /** When this run began; handlers judge "overdue" and "today" by it. */
  startedAt: Date;
  /** The studio's time zone (TIME_ZONE), for keys that count days. */
  timeZone: string;
  /**
   * Does `work` at most once for `key`, whichever run, process or restart gets there first:
   * true when it ran now, false when the key was already claimed. A `work` that throws gives the
   * key back, so a retry does it then. Keys are strings such as "archive-overdue:<cast id>:2027-03-01".
   */
  once(key: string, work: () => Promise<void>): Promise<boolean>;
}

/** A background job: its queue name, when it runs by itself, and what it does. */
export interface JobDefinition<T extends object = object> {
  /** The queue's name: lower case, digits and hyphens, e.g. "archive-overdue-reminders". */
  name: string;
  summary: string;
  /** A cron line in the studio's time zone ("0 8 * * *": every day at 08:00); leave out for jobs only ever sent. */
  schedule?: { cron: string };
  /** Tries after a failed run (default 3, a minute apart and backing off). */
  retryLimit?: number;
  run(job: JobRun<T>): Promise<void>;
}

/** Keeps a job's data type checked where it is written, like defineRoute. */
export function defineJob<T extends object>(def: JobDefinition<T>): JobDefinition {
  return def as unknown as JobDefinition;
}

const dayFormats = new Map<string, Intl.DateTimeFormat>();

/** The calendar day of an instant in a time zone, as YYYY-MM-DD (one formatter per zone: making one costs more than using it). */
export function dayIn(timeZone: string, at: Date): string {
  let f = dayFormats.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' });
    dayFormats.set(timeZone, f);
  }
  return f.format(at);
}
