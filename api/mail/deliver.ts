import type { AppContext } from '../context.ts';
import type { OutgoingMail } from './mailer.ts';

/**
 * Sends mail that follows a committed change. The change stands whatever happens to the mail: a
 * failed send is logged with its subject (never its body, which may carry a link) and reported
 * back so the caller can say so.
 */
export async function deliverAll(ctx: Pick<AppContext, 'mailer' | 'log'>, mails: readonly OutgoingMail[]): Promise<{ sent: number; failed: string[] }> {
  const failed: string[] = [];
  let sent = 0;
  for (const mail of mails) {
    try {
      await ctx.mailer.send(mail);
      sent++;
    } catch (err) {
      failed.push(mail.subject);
      ctx.log(`mail "${mail.subject}" not sent`, err);
    }
  }
  return { sent, failed };
}
