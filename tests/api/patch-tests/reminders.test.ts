import { promises as fs } from 'node:fs';
import path from 'node:path';
import { simpleParser } from 'mailparser';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readingRemindersJob } from '../../../api/features/patch-tests/reminder-job.ts';
import { startJobRunner, type JobRunner } from '../../../api/jobs/runner.ts';
import { createTestApp, type TestApp } from '../../support/app.ts';
import { expectWordedMail, MOMENT_IN_WORDS } from '../../support/mail-wording.ts';

/**
 * The lead's reading reminders on the demo tests (Juno's department use test applied 26 hours ago, its
 * 24-hour window open; Tamsin's occluded test applied 74 hours ago, removed at 48: D2 overdue, D4 open).
 */
let t: TestApp;
const running = new Set<JobRunner>();
const JOB = readingRemindersJob.name;
const HOUR = 3_600_000;

beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  for (const r of running) await r.stop();
  await t?.close();
});

async function start(): Promise<JobRunner> {
  const runner = await startJobRunner(t.ctx, { connectionString: t.db.url, jobs: [readingRemindersJob], pollingIntervalSeconds: 0.5 });
  running.add(runner);
  return runner;
}
async function stop(runner: JobRunner): Promise<void> {
  await runner.stop();
  running.delete(runner);
}
async function runOnce(runner: JobRunner): Promise<void> {
  const id = await runner.send(JOB);
  await expect.poll(() => runner.state(JOB, id), { timeout: 30_000, interval: 100 }).toBe('completed');
}

async function reminders(): Promise<{ to: string; subject: string; text: string }[]> {
  const files = (await fs.readdir(t.mail.dir)).filter((f) => f.endsWith('.eml'));
  const out = [];
  for (const f of files) {
    const mail = await simpleParser(await fs.readFile(path.join(t.mail.dir, f)));
    if (!/^Reading (open|overdue):/.test(mail.subject ?? '')) continue;
    out.push({ to: [mail.to ?? []].flat().flatMap((a) => a.value.map((v) => v.address ?? '')).join(','), subject: mail.subject ?? '', text: mail.text ?? '' });
  }
  return out.sort((a, b) => a.subject.localeCompare(b.subject));
}

describe('reading reminders to the lead', () => {
  it('is scheduled every five minutes in the studio’s time zone', async () => {
    const runner = await start();
    expect(await runner.schedules()).toContainEqual({ name: JOB, cron: '*/5 * * * *', timezone: 'Europe/London' });
    await stop(runner);
  });

  it('mails each opened window and each overdue reading once, across runs and a restart, with no result in the mail', async () => {
    const first = await start();
    await runOnce(first);
    const sent = await reminders();
    expect(sent.map((m) => [m.to, m.subject])).toEqual([
      ['lead@plinth.test', 'Reading open: 24 hours for Juno Castellane'],
      ['lead@plinth.test', 'Reading open: D4 for Tamsin Achebe-Lowry'],
      ['lead@plinth.test', 'Reading overdue: D2 (after removal) for Tamsin Achebe-Lowry'],
    ]);
    for (const m of sent) {
      expect(m.text).toMatch(/\/patch-tests\/[0-9a-f-]{36}/);
      expect(m.text).not.toMatch(/\+|negative|positive|doubtful/i);
      // The window's close is written in words on the studio's clock, like every mail's moments.
      expect(m.text).toMatch(new RegExp(`(until|due by) ${MOMENT_IN_WORDS.source}`));
      expectWordedMail(m.text);
    }
    await runOnce(first);
    await stop(first);
    const restarted = await start();
    await runOnce(restarted);
    expect(await reminders()).toHaveLength(3);

    // A day later for Juno: the 24-hour reading is now overdue and the 48-hour window open, one mail each.
    const juno = await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', 'Juno Castellane').executeTakeFirstOrThrow();
    await t.db.db.updateTable('patch_tests').set({ applied_at: new Date(Date.now() - 49 * HOUR) }).where('performer_id', '=', juno.id).where('status', '=', 'applied').execute();
    await runOnce(restarted);
    await stop(restarted);
    const again = await start();
    await runOnce(again);
    await stop(again);
    const all = await reminders();
    expect(all.map((m) => m.subject)).toEqual([
      'Reading open: 24 hours for Juno Castellane',
      'Reading open: 48 hours for Juno Castellane',
      'Reading open: D4 for Tamsin Achebe-Lowry',
      'Reading overdue: 24 hours for Juno Castellane',
      'Reading overdue: D2 (after removal) for Tamsin Achebe-Lowry',
    ]);
    expect(await t.db.db.selectFrom('audit_log').select('id').where('action', '=', 'patch_test.reminder').execute()).toHaveLength(5);
  });

  it('two API processes running at once send a newly opened window once', async () => {
    const tamsin = await t.db.db.selectFrom('performers').select('id').where('legal_name', '=', 'Tamsin Achebe-Lowry').executeTakeFirstOrThrow();
    // Seven days after application: the optional D7 window opens.
    await t.db.db.updateTable('patch_tests').set({ applied_at: new Date(Date.now() - 7 * 24 * HOUR), removed_at: new Date(Date.now() - 5 * 24 * HOUR) }).where('performer_id', '=', tamsin.id).where('status', '=', 'applied').execute();
    const [a, b] = await Promise.all([start(), start()]);
    await Promise.all([runOnce(a), runOnce(b), runOnce(a), runOnce(b)]);
    await Promise.all([stop(a), stop(b)]);
    expect((await reminders()).filter((m) => m.subject === 'Reading open: D7 (optional) for Tamsin Achebe-Lowry')).toHaveLength(1);
  });
});
