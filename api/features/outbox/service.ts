import type { AppContext } from '../../context.ts';
import { notFound } from '../../http/errors.ts';
import { findOpenMailFailure, markMailFailure } from '../../mail/failures.ts';

/** Sends a kept message again; it stays listed, with the new error, until it goes out. */
export async function retryMailFailure(ctx: AppContext, id: string): Promise<{ sent: boolean; error: string | null }> {
  return ctx.db.transaction().execute(async (trx) => {
    // The row lock keeps two administrators from sending the same message twice.
    const mail = await findOpenMailFailure(trx, id);
    if (!mail) throw notFound('That unsent message');
    try {
      await ctx.mailer.send(mail);
      await markMailFailure(trx, id, { sent: true });
      return { sent: true, error: null };
    } catch (err) {
      const error = err instanceof Error ? err.message : String(err);
      await markMailFailure(trx, id, { sent: false, error });
      return { sent: false, error };
    }
  });
}
