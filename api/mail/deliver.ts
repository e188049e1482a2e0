import type { AppContext } from '../context.ts';
import { recordMailFailure } from './failures.ts';
import type { OutgoingMail } from './mailer.ts';

/**
 * The one rule for mail that follows a committed change: the change stands whatever happens to
 * the mail. A message that cannot be sent is kept (see the Outbox page, where it can be sent
 * again) and logged by subject, never by its body, which may carry a link.
 */
export async function deliverAll(ctx: Pick<AppContext, 'mailer' | 'log' | 'db'>, mails: readonly OutgoingMail[]): Promise<{ sent: number; failed: string[] }> {
  const failed: string[] = [];
  let sent = 0;
  for (const mail of mails) {
    try {
      await ctx.mailer.send(mail);
      sent++;
    } catch (err) {
      failed.push(mail.subject);
      ctx.log(`mail "${mail.subject}" not sent; kept for the Outbox`, err);
      try {
        await recordMailFailure(ctx.db, mail, err instanceof Error ? err.message : String(err));
      } catch (recordErr) {
        ctx.log(`mail "${mail.subject}" could not be kept either`, recordErr);
      }
    }
  }
  return { sent, failed };
}
