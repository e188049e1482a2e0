import PgBoss from 'pg-boss';
import type { AppContext } from '../context.ts';
import type { JobDefinition } from './define.ts';
import { forgetOldKeys, runOnce } from './once.ts';

export interface JobRunnerOptions {
  /** The database the queue lives in (its own schema, "pgboss"). */
  connectionString: string;
  jobs: readonly JobDefinition[];
  /** How often an idle worker looks for work, in seconds (default 5; tests use 0.5). */
  pollingIntervalSeconds?: number;
  /** Install the jobs' schedules (default true). */
  schedules?: boolean;
}

export type JobState = 'created' | 'retry' | 'active' | 'completed' | 'cancelled' | 'failed';

export interface JobRunner {
  /** Queues one run of a job now; returns the run's id. */
  send(name: string, data?: object): Promise<string>;
  /** Where a run stands, or null when there is no such run. */
  state(name: string, id: string): Promise<JobState | null>;
  /** The schedules installed, as the queue holds them. */
  schedules(): Promise<{ name: string; cron: string; timezone: string | null }[]>;
  /** Lets runs under way finish (up to 30 s), then stops. */
  stop(): Promise<void>;
}

/**
 * Starts the background jobs on pg-boss: a queue per job, a worker for each, and the daily
 * schedules. Several processes may run it against one database: pg-boss hands each run to one
 * worker, a schedule fires once per slot, and `once` keys keep work from being done twice.
 */
export async function startJobRunner(ctx: AppContext, opts: JobRunnerOptions): Promise<JobRunner> {
  const boss = new PgBoss({ connectionString: opts.connectionString, max: 4, application_name: 'plinth-jobs' });
  boss.on('error', (err) => ctx.log('job queue error', err));
  await boss.start();
  await forgetOldKeys(ctx.db);
  const known = new Map(opts.jobs.map((j) => [j.name, j]));
  for (const job of opts.jobs) {
    await boss.createQueue(job.name, { name: job.name, retryLimit: job.retryLimit ?? 3, retryDelay: 60, retryBackoff: true, expireInSeconds: 15 * 60 });
    await boss.work<object>(job.name, { pollingIntervalSeconds: opts.pollingIntervalSeconds ?? 5, batchSize: 1 }, async ([run]) => {
      if (!run) return;
      const startedAt = new Date();
      try {
        await job.run({
          ctx,
          data: run.data ?? {},
          jobId: run.id,
          startedAt,
          timeZone: ctx.config.timeZone,
          once: (key, work) => runOnce(ctx.db, job.name, key, work),
        });
      } catch (err) {
        ctx.log(`job ${job.name} failed; it will be tried again`, err);
        throw err;
      }
    });
    if (opts.schedules !== false && job.schedule) await boss.schedule(job.name, job.schedule.cron, {}, { tz: ctx.config.timeZone });
  }
  return {
    async send(name, data = {}) {
      if (!known.has(name)) throw new Error(`no job called ${name}`);
      const id = await boss.send(name, data);
      if (!id) throw new Error(`job ${name} was not queued`);
      return id;
    },
    async state(name, id) {
      const job = await boss.getJobById(name, id, { includeArchive: true });
      return job?.state ?? null;
    },
    async schedules() {
      // The schedule table keeps the time zone in its own column.
      return (await boss.getSchedules()).map((s) => ({ name: s.name, cron: s.cron, timezone: (s as { timezone?: string | null }).timezone ?? null }));
    },
    async stop() {
      await boss.stop({ graceful: true, timeout: 30_000, wait: true });
    },
  };
}
