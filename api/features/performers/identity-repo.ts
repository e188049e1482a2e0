import { sql } from 'kysely';
import type { Db } from '../../db/index.ts';

/** The identity facts of one performer: contact address, whether they confirmed it, their sign-in. */
export interface PerformerIdentity {
  id: string;
  name: string;
  email: string | null;
  emailConfirmed: boolean;
  userId: string | null;
  productionIds: string[];
}

export async function findPerformerIdentity(db: Db, performerId: string, opts: { lock?: boolean } = {}): Promise<PerformerIdentity | undefined> {
  let q = db
    .selectFrom('performers')
    .select([
      'id',
      sql<string>`coalesce(preferred_name, legal_name)`.as('name'),
      'email',
      'email_confirmed_at',
      'user_id',
      sql<string[]>`array(select e.production_id::text from engagements e where e.performer_id = performers.id)`.as('production_ids'),
    ])
    .where('id', '=', performerId);
  if (opts.lock) q = q.forUpdate();
  const row = await q.executeTakeFirst();
  if (!row) return undefined;
  return { id: row.id, name: row.name, email: row.email, emailConfirmed: row.email !== null && row.email_confirmed_at !== null, userId: row.user_id, productionIds: row.production_ids };
}

/** The address mail for the performer may go to: only one the performer confirmed. */
export async function findConfirmedEmail(db: Db, performerId: string): Promise<{ email: string; name: string } | null> {
  const row = await db
    .selectFrom('performers')
    .select(['email', sql<string>`coalesce(preferred_name, legal_name)`.as('name')])
    .where('id', '=', performerId)
    .where('email', 'is not', null)
    .where('email_confirmed_at', 'is not', null)
    .executeTakeFirst();
  return row?.email ? { email: row.email, name: row.name } : null;
}

export async function countRecentConfirmations(db: Db, performerId: string, since: Date): Promise<number> {
  const row = await db.selectFrom('email_confirmations').select((eb) => eb.fn.countAll<string>().as('n')).where('performer_id', '=', performerId).where('created_at', '>', since).executeTakeFirstOrThrow();
  return Number(row.n);
}

export async function insertConfirmation(db: Db, v: { performerId: string; email: string; tokenHash: string; expiresAt: Date; createdBy: string | null }): Promise<void> {
  await db.insertInto('email_confirmations').values({ performer_id: v.performerId, email: v.email, token_hash: v.tokenHash, expires_at: v.expiresAt, created_by: v.createdBy }).execute();
}

export async function insertConfirmations(db: Db, rows: readonly { performerId: string; email: string; tokenHash: string; expiresAt: Date; createdBy: string | null }[]): Promise<void> {
  for (let i = 0; i < rows.length; i += 500) {
    await db
      .insertInto('email_confirmations')
      .values(rows.slice(i, i + 500).map((v) => ({ performer_id: v.performerId, email: v.email, token_hash: v.tokenHash, expires_at: v.expiresAt, created_by: v.createdBy })))
      .execute();
  }
}

export async function findConfirmationByHash(db: Db, tokenHash: string, opts: { lock?: boolean } = {}) {
  let q = db.selectFrom('email_confirmations').selectAll().where('token_hash', '=', tokenHash);
  if (opts.lock) q = q.forUpdate();
  return q.executeTakeFirst();
}

export async function markConfirmationUsed(db: Db, id: string): Promise<void> {
  await db.updateTable('email_confirmations').set({ used_at: sql`now()` }).where('id', '=', id).execute();
}

/** Confirms the address only if it is still the one the link was sent to. */
export async function confirmPerformerEmail(db: Db, performerId: string, email: string): Promise<boolean> {
  const res = await db
    .updateTable('performers')
    .set({ email_confirmed_at: sql`now()`, version: sql`version + 1`, updated_at: sql`now()` })
    .where('id', '=', performerId)
    .where(sql`lower(email)`, '=', email.toLowerCase())
    .executeTakeFirst();
  return Number(res.numUpdatedRows) === 1;
}

export async function insertInvitation(db: Db, v: { performerId: string; email: string; tokenHash: string; expiresAt: Date; createdBy: string | null }): Promise<void> {
  await db.insertInto('account_invitations').values({ performer_id: v.performerId, email: v.email, token_hash: v.tokenHash, expires_at: v.expiresAt, created_by: v.createdBy }).execute();
}

export async function countRecentInvitations(db: Db, performerId: string, since: Date): Promise<number> {
  const row = await db.selectFrom('account_invitations').select((eb) => eb.fn.countAll<string>().as('n')).where('performer_id', '=', performerId).where('created_at', '>', since).executeTakeFirstOrThrow();
  return Number(row.n);
}

export async function findInvitationByHash(db: Db, tokenHash: string, opts: { lock?: boolean } = {}) {
  let q = db.selectFrom('account_invitations').selectAll().where('token_hash', '=', tokenHash);
  if (opts.lock) q = q.forUpdate();
  return q.executeTakeFirst();
}

export async function markInvitationAccepted(db: Db, id: string, userId: string): Promise<void> {
  await db.updateTable('account_invitations').set({ accepted_at: sql`now()`, accepted_user_id: userId }).where('id', '=', id).execute();
}

export async function findPerformerLinkedToUser(db: Db, userId: string): Promise<string | undefined> {
  return (await db.selectFrom('performers').select('id').where('user_id', '=', userId).executeTakeFirst())?.id;
}

/** Links the sign-in (the performer's own act); gives it the performer role where they are engaged. */
export async function linkUserToPerformer(db: Db, performerId: string, userId: string): Promise<void> {
  await db.updateTable('performers').set({ user_id: userId, version: sql`version + 1`, updated_at: sql`now()` }).where('id', '=', performerId).execute();
}

/** The performer with this confirmed address, its row locked (a withdrawal-link request for it). */
export async function lockPerformerByConfirmedEmail(db: Db, email: string): Promise<{ id: string; email: string; name: string } | undefined> {
  const p = await db
    .selectFrom('performers')
    .select(['id', 'email', sql<string>`coalesce(preferred_name, legal_name)`.as('name')])
    .where(sql`lower(email)`, '=', email.toLowerCase())
    .where('email_confirmed_at', 'is not', null)
    .forUpdate()
    .executeTakeFirst();
  return p?.email ? { id: p.id, email: p.email, name: p.name } : undefined;
}

/** A performer record whose confirmed address is this one, not yet linked to anyone. */
export async function findUnlinkedPerformerByConfirmedEmail(db: Db, email: string): Promise<string | undefined> {
  const row = await db
    .selectFrom('performers')
    .select('id')
    .where(sql`lower(email)`, '=', email.toLowerCase())
    .where('email_confirmed_at', 'is not', null)
    .where('user_id', 'is', null)
    .forUpdate()
    .executeTakeFirst();
  return row?.id;
}
