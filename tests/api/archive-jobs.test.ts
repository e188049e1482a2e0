import { promises as fs } from 'node:fs';
import path from 'node:path';
import { simpleParser } from 'mailparser';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { overdueRemindersJob } from '../../api/features/archive/overdue-job.ts';
import { dayIn } from '../../api/jobs/define.ts';
import { startJobRunner, type JobRunner } from '../../api/jobs/runner.ts';
import { createTestApp, type TestApp } from '../support/app.ts';
import { expectWordedMail } from '../support/mail-wording.ts';
import { castByKey } from '../fixtures/archive.ts';

let t: TestApp;
const running = new Set<JobRunner>();

beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  for (const r of running) await r.stop();
  await t?.close();
});

const JOB = overdueRemindersJob.name;

async function start(ctx = t.ctx): Promise<JobRunner> {
  const runner = await startJobRunner(ctx, { connectionString: t.db.url, jobs: [overdueRemindersJob], pollingIntervalSeconds: 0.5 });
  running.add(runner);
  return runner;
}
async function stop(runner: JobRunner): Promise<void> {
  await runner.stop();
  running.delete(runner);
}

/** Sends one run and waits until the queue says it has finished (or is waiting for a retry). */
async function runOnce(runner: JobRunner, until: 'completed' | 'retry' = 'completed'): Promise<void> {
  const id = await runner.send(JOB);
  await expect.poll(() => runner.state(JOB, id), { timeout: 30_000, interval: 100 }).toBe(until);
}

/** The days on the studio's clock that some work ran across: one, or two when it crossed midnight. */
async function daysAcross(work: () => Promise<void>): Promise<Set<string>> {
  const first = dayIn('Europe/London', new Date());
  await work();
  return new Set([first, dayIn('Europe/London', new Date())]);
}

/** The once-keys claimed for a cast's overdue reminder, each with the day it names. */
async function claimedFor(castId: string): Promise<{ day: string; job: string; done_at: Date | null }[]> {
  const prefix = `archive-overdue:${castId}:`;
  const rows = await t.db.db.selectFrom('job_once').select(['key', 'job', 'done_at']).where('key', 'like', `${prefix}%`).orderBy('key').execute();
  return rows.map((r) => ({ day: r.key.slice(prefix.length), job: r.job, done_at: r.done_at }));
}

async function reminders(): Promise<{ to: string; subject: string; text: string }[]> {
  const files = (await fs.readdir(t.mail.dir)).filter((f) => f.endsWith('.eml'));
  const out = [];
  for (const f of files) {
    const mail = await simpleParser(await fs.readFile(path.join(t.mail.dir, f)));
    if (!/overdue back at the store/.test(mail.subject ?? '')) continue;
    out.push({ to: [mail.to ?? []].flat().flatMap((a) => a.value.map((v) => v.address ?? '')).join(','), subject: mail.subject ?? '', text: mail.text ?? '' });
  }
  return out;
}

describe('overdue check-outs are e-mailed to the holder once a day', () => {
  it('is scheduled daily at 08:00 in the studio’s time zone', async () => {
    const runner = await start();
    const schedules = await runner.schedules();
    expect(schedules).toContainEqual({ name: JOB, cron: '0 8 * * *', timezone: 'Europe/London' });
    await stop(runner);
  });

  it('sends one reminder per overdue cast, and none again on a second run or after the runner restarts', async () => {
    const oz = await castByKey(t, 'oz-head-positive');
    const days = await daysAcross(async () => {
      const first = await start();
      await runOnce(first);
      const sent = await reminders();
      expect(sent).toHaveLength(1);
      expect(sent[0]!.to).toBe('artist@plinth.test');
      expect(sent[0]!.subject).toBe(`Cast ${oz.labelCode} is overdue back at the store`);
      expect(sent[0]!.text).toContain(`${t.config.appOrigin}/archive/casts/${oz.id}`);
      expectWordedMail(sent[0]!.text);
      expect(sent[0]!.text).toMatch(/It was due back on [A-Z][a-z]+day \d{1,2} [A-Z][a-z]+ \d{4} at \d{2}:\d{2}, London time \(4 days ago\)\./);
      await runOnce(first);
      await stop(first);

      const restarted = await start();
      await runOnce(restarted);
      await stop(restarted);
    });
    // One reminder per day on the studio's clock: the runs share a day unless they crossed midnight.
    const claimed = await claimedFor(oz.id);
    expect(claimed.length).toBeGreaterThanOrEqual(1);
    expect(claimed.length).toBeLessThanOrEqual(days.size);
    for (const c of claimed) {
      expect(days).toContain(c.day);
      expect(c.job).toBe(JOB);
      expect(c.done_at).not.toBeNull();
    }
    expect(await reminders()).toHaveLength(claimed.length);
    const audited = await t.db.db.selectFrom('audit_log').select('details').where('action', '=', 'cast.overdue_reminder').execute();
    expect(audited.map((a) => (a.details as { day: string }).day).sort()).toEqual(claimed.map((c) => c.day));
  });

  it('two API processes running at once send a newly overdue cast’s reminder once', async () => {
    const cory = await castByKey(t, 'cory-head-mold');
    const sol = await t.db.db.selectFrom('users').select(['id']).where('email', '=', 'artist2@plinth.test').executeTakeFirstOrThrow();
    await t.db.db
      .updateTable('casts')
      .set({ status: 'checked_out', current_location_id: null, current_holder: 'Sol Varga', current_holder_user_id: sol.id, due_back_at: new Date(Date.now() - 3_600_000) })
      .where('id', '=', cory.id)
      .execute();
    const [a, b] = await Promise.all([start(), start()]);
    const days = await daysAcross(async () => {
      await Promise.all([runOnce(a), runOnce(b), runOnce(a), runOnce(b)]);
    });
    const toSol = (await reminders()).filter((m) => m.to === 'artist2@plinth.test');
    const claimed = await claimedFor(cory.id);
    expect(claimed.length).toBeGreaterThanOrEqual(1);
    expect(claimed.length).toBeLessThanOrEqual(days.size);
    expect(toSol).toHaveLength(claimed.length);
    expect(toSol[0]!.subject).toContain(cory.labelCode);
    await Promise.all([stop(a), stop(b)]);
  });

  it('a reminder that could not be sent is tried again by a later run', async () => {
    const bea = await castByKey(t, 'bea-arm-mold');
    const lead = await t.db.db.selectFrom('users').select(['id']).where('email', '=', 'lead@plinth.test').executeTakeFirstOrThrow();
    await t.db.db
      .updateTable('casts')
      .set({ status: 'checked_out', current_location_id: null, current_holder: 'Dr. Tomasz Brill', current_holder_user_id: lead.id, due_back_at: new Date(Date.now() - 3_600_000) })
      .where('id', '=', bea.id)
      .execute();
    const broken = await start({ ...t.ctx, mailer: { send: async () => Promise.reject(new Error('relay down')), close() {} } });
    await runOnce(broken, 'retry');
    await stop(broken);
    // The failed reminder gave its key back, whichever day it ran on.
    expect(await claimedFor(bea.id)).toEqual([]);
    expect((await reminders()).filter((m) => m.to === 'lead@plinth.test')).toHaveLength(0);

    const working = await start();
    await runOnce(working);
    await stop(working);
    expect((await reminders()).filter((m) => m.to === 'lead@plinth.test')).toHaveLength(1);
  });
});
