import { sql } from 'kysely';
import type { Db } from '../db/index.ts';

/** A sign-in whose e-mail already belongs to a Plinth user bound to another identity-provider subject. */
export class EmailBoundElsewhere extends Error {
  constructor(public readonly userId: string | null) {
    super('email already linked to another sign-in');
  }
}

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
      const holder = await trx.selectFrom('users').select('id').where(sql`lower(email)`, '=', email.toLowerCase()).executeTakeFirst();
      throw new EmailBoundElsewhere(holder?.id ?? null);
    }
    return { id: row.id, created: true };
  });
}

/**
 * Whether a sign-in may stand for a performer: never a studio administrator, never anyone with
 * a staff role or a lead appointment. Otherwise staff could link themselves to a performer and
 * read that performer's health details as "the performer".
 */
export async function mayActAsPerformer(db: Db, userId: string): Promise<boolean> {
  const user = await db.selectFrom('users').select('is_admin').where('id', '=', userId).executeTakeFirst();
  if (!user || user.is_admin) return false;
  const staff = await db.selectFrom('memberships').select('id').where('user_id', '=', userId).where('role', '!=', 'performer').executeTakeFirst();
  if (staff) return false;
  const lead = await db.selectFrom('lead_appointments').select('id').where('user_id', '=', userId).executeTakeFirst();
  return !lead;
}
