import { sql } from 'kysely';
import type { Db } from '../db/index.ts';

export interface IdClaims {
  issuer: string;
  sub: string;
  email: string | null;
  emailVerified: boolean;
  name: string | null;
}

/**
 * Finds the Plinth user for a verified sign-in: by issuer + subject, else by a verified e-mail
 * an admin registered (linking it), else a new user with no roles yet ("no access yet").
 */
export async function upsertUserFromClaims(db: Db, claims: IdClaims): Promise<{ id: string; created: boolean }> {
  return db.transaction().execute(async (trx) => {
    const bySub = await trx
      .selectFrom('users')
      .select('id')
      .where('oidc_issuer', '=', claims.issuer)
      .where('oidc_subject', '=', claims.sub)
      .forUpdate()
      .executeTakeFirst();
    if (bySub) {
      await trx.updateTable('users').set({ last_sign_in_at: sql`now()` }).where('id', '=', bySub.id).execute();
      return { id: bySub.id, created: false };
    }
    if (claims.email && claims.emailVerified) {
      const byEmail = await trx
        .selectFrom('users')
        .select('id')
        .where(sql`lower(email)`, '=', claims.email.toLowerCase())
        .where('oidc_subject', 'is', null)
        .forUpdate()
        .executeTakeFirst();
      if (byEmail) {
        await trx
          .updateTable('users')
          .set({ oidc_issuer: claims.issuer, oidc_subject: claims.sub, last_sign_in_at: sql`now()` })
          .where('id', '=', byEmail.id)
          .execute();
        return { id: byEmail.id, created: false };
      }
    }
    const email = claims.email ?? `${claims.sub}@unknown.invalid`;
    const row = await trx
      .insertInto('users')
      .values({
        email,
        display_name: claims.name?.trim() || email,
        oidc_issuer: claims.issuer,
        oidc_subject: claims.sub,
        last_sign_in_at: new Date(),
      })
      .onConflict((oc) => oc.expression(sql`lower(email)`).doNothing())
      .returning('id')
      .executeTakeFirst();
    if (!row) {
      // The e-mail belongs to a user already linked to another identity: refuse rather than merge.
      throw new Error('email already linked to another sign-in');
    }
    return { id: row.id, created: true };
  });
}
