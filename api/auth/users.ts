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

/**
 * A performer record carrying the same verified e-mail, not yet linked to anyone, is linked to
 * this sign-in, with the performer role on each production they are engaged on. So a performer
 * the department registered can sign in and see their own record without anyone picking accounts.
 */
export async function linkPerformerByEmail(db: Db, userId: string, email: string): Promise<string | null> {
  return db.transaction().execute(async (trx) => {
    const already = await trx.selectFrom('performers').select('id').where('user_id', '=', userId).executeTakeFirst();
    if (already) return null;
    if (!(await mayActAsPerformer(trx, userId))) return null;
    const performer = await trx
      .selectFrom('performers')
      .select('id')
      .where(sql`lower(email)`, '=', email.toLowerCase())
      .where('user_id', 'is', null)
      .forUpdate()
      .executeTakeFirst();
    if (!performer) return null;
    await trx.updateTable('performers').set({ user_id: userId }).where('id', '=', performer.id).execute();
    const engagements = await trx.selectFrom('engagements').select('production_id').where('performer_id', '=', performer.id).execute();
    if (engagements.length) {
      await trx
        .insertInto('memberships')
        .values(engagements.map((e) => ({ user_id: userId, production_id: e.production_id, role: 'performer' as const, created_by: null })))
        .onConflict((oc) => oc.columns(['user_id', 'production_id', 'role']).doNothing())
        .execute();
    }
    await trx
      .insertInto('audit_log')
      .values({ actor_user_id: userId, action: 'performer.link_on_sign_in', entity_type: 'performer', entity_id: performer.id, details: JSON.stringify({ productions: engagements.length }) })
      .execute();
    return performer.id;
  });
}
