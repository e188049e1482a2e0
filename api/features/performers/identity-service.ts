import type { Request } from 'express';
import type { Actor } from '#shared/policy.ts';
import type { AppContext } from '../../context.ts';
import type { Db } from '../../db/index.ts';
import { type Trx, writeAudit } from '../../http/audit.ts';
import { ApiError, conflict, forbidden, invalid, notFound } from '../../http/errors.ts';
import { hashToken, newToken } from '../../http/tokens.ts';
import { mailDateTime } from '../../mail/dates.ts';
import { deliverAll } from '../../mail/deliver.ts';
import { addPerformerMemberships, type Department, findCurrentLeads, findDepartment, findDepartments, mailFooter } from '../productions/index.ts';
import { isStaffAddress } from '../users/index.ts';
import type { OutgoingMail } from '../../mail/mailer.ts';
import {
  confirmPerformerEmail,
  countRecentConfirmations,
  countRecentInvitations,
  findConfirmationByHash,
  findInvitationByHash,
  findPerformerIdentity,
  findPerformerLinkedToUser,
  findUnlinkedPerformerByConfirmedEmail,
  insertConfirmation,
  insertConfirmations,
  insertInvitation,
  linkUserToPerformer,
  markConfirmationUsed,
  markInvitationAccepted,
  type PerformerIdentity,
} from './identity-repo.ts';
import { engagedProductionIds } from './repo.ts';

const CONFIRMATION_DAYS = 7;
const INVITATION_DAYS = 7;
/** Confirmation requests and invitations per performer per hour, so nobody can flood an inbox. */
const SENDS_PER_HOUR = 3;

/** "j•••@example.test": enough for the owner to recognise, not enough to harvest. */
export function maskEmail(email: string): string {
  const [local = '', domain = ''] = email.split('@');
  return `${local.slice(0, 1)}•••@${domain}`;
}

/** Refuses a staff member's own sign-in address as a performer's contact address. */
export async function assertPerformerAddress(db: Db, email: string | null, field = 'email'): Promise<void> {
  if (email && (await isStaffAddress(db, email))) {
    throw invalid({ [field]: ["This address belongs to a member of staff's sign-in. A performer's contact address must be the performer's own."] });
  }
}

/** The departments of every production a performer works on: a mail to a performer names them all. */
async function performerDepartments(db: Db, performerId: string): Promise<Department[]> {
  return findDepartments(db, await engagedProductionIds(db, performerId));
}

function confirmationMail(ctx: AppContext, p: { name: string }, email: string, token: string, expiresAt: Date, deps: readonly Department[]): OutgoingMail {
  return {
    to: email,
    subject: 'Please confirm your e-mail address for the make-up department',
    text: [
      `Hello ${p.name},`,
      '',
      'The make-up department entered this address as yours. Until you confirm it, Plinth sends nothing else here: no signed copies, no signing or withdrawal links.',
      '',
      'If this is your address, confirm it here:',
      `${ctx.config.appOrigin}/confirm-email/${token}`,
      '',
      `The link works for ${CONFIRMATION_DAYS} days, until ${mailDateTime(expiresAt, ctx.config.timeZone)}. If you are not ${p.name}, ignore this e-mail and nothing will be sent here again.`,
      ...mailFooter(deps),
    ].join('\n'),
  };
}

/** Tells the designated lead of each of the performer's productions, naming that production and the moment of the change. */
async function leadNotices(db: Db, timeZone: string, p: PerformerIdentity, subject: string, lines: string[]): Promise<OutgoingMail[]> {
  const leads = await findCurrentLeads(db, p.productionIds);
  const seen = new Set<string>();
  const when = mailDateTime(new Date(), timeZone);
  const mine = leads.filter((l) => !seen.has(l.email) && seen.add(l.email));
  return Promise.all(
    mine.map(async (l) => ({
      to: l.email,
      subject,
      text: [
        `Hello ${l.name},`,
        '',
        ...lines.filter(Boolean),
        `This happened on ${when}.`,
        '',
        'You are told because you are the designated lead on a production this performer works on. If this change was not expected, check it with the department.',
        ...mailFooter(await findDepartment(db, l.productionId)),
      ].join('\n'),
    })),
  );
}

/** Starts confirming an address staff entered: a one-time link to it, and nothing else goes there until it is used. */
export async function startConfirmation(trx: Db, ctx: AppContext, p: Pick<PerformerIdentity, 'id' | 'name'>, email: string, createdBy: string | null): Promise<OutgoingMail> {
  const token = newToken();
  const expiresAt = new Date(Date.now() + CONFIRMATION_DAYS * 86_400_000);
  await insertConfirmation(trx, { performerId: p.id, email, tokenHash: hashToken(token), expiresAt, createdBy });
  return confirmationMail(ctx, p, email, token, expiresAt, await performerDepartments(trx, p.id));
}

/** Confirmation requests for many new performers at once, all engaged on the same productions (an import): one insert, the mails returned. */
export async function startConfirmations(trx: Db, ctx: AppContext, list: readonly { id: string; name: string; email: string }[], createdBy: string | null, productionIds: readonly string[]): Promise<OutgoingMail[]> {
  if (list.length === 0) return [];
  const expiresAt = new Date(Date.now() + CONFIRMATION_DAYS * 86_400_000);
  const withTokens = list.map((p) => ({ ...p, token: newToken() }));
  await insertConfirmations(trx, withTokens.map((p) => ({ performerId: p.id, email: p.email, tokenHash: hashToken(p.token), expiresAt, createdBy })));
  const deps = await findDepartments(trx, productionIds);
  return withTokens.map((p) => confirmationMail(ctx, p, p.email, p.token, expiresAt, deps));
}

/**
 * A performer's address changed (staff entered or edited it). Inside the change's transaction:
 * audited with before and after; the new address gets only a confirmation request; the old
 * confirmed address and the lead are told. Returns the mail to send once committed.
 */
export async function recordEmailChange(
  trx: Trx,
  ctx: AppContext,
  e: { performerId: string; before: { email: string | null; confirmed: boolean }; after: string | null; actor: Actor; req: Request },
): Promise<OutgoingMail[]> {
  const p = await findPerformerIdentity(trx, e.performerId);
  if (!p) throw notFound('That performer');
  await writeAudit(trx, {
    actorUserId: e.actor.userId,
    action: 'performer.email_change',
    entityType: 'performer',
    entityId: p.id,
    req: e.req,
    details: { before: e.before.email, beforeConfirmed: e.before.confirmed, after: e.after },
  });
  const mails: OutgoingMail[] = [];
  if (e.after) mails.push(await startConfirmation(trx, ctx, p, e.after, e.actor.userId));
  if (e.before.email && e.before.confirmed) {
    const deps = await findDepartments(trx, p.productionIds);
    mails.push({
      to: e.before.email,
      subject: 'Your contact address at the make-up department was changed',
      text: [
        `Hello ${p.name},`,
        '',
        `${e.after ? `The make-up department changed the e-mail address it holds for you to ${maskEmail(e.after)}` : 'The make-up department removed the e-mail address it held for you'}, on ${mailDateTime(new Date(), ctx.config.timeZone)}.`,
        'Nothing more will be sent to this address.',
        '',
        'If you did not ask for this, tell the department or the production’s designated lead at once.',
        ...mailFooter(deps),
      ].join('\n'),
    });
  }
  mails.push(
    ...(await leadNotices(trx, ctx.config.timeZone, p, `Plinth: ${p.name}'s contact address was changed`, [
      `The e-mail address held for ${p.name} was changed from ${e.before.email ?? '(none)'}${e.before.email ? (e.before.confirmed ? ' (confirmed)' : ' (not confirmed)') : ''} to ${e.after ?? '(none)'}.`,
      e.after ? 'The new address is unconfirmed until the performer confirms it from the e-mail Plinth sent there.' : '',
    ])),
  );
  return mails;
}

/** Sends the confirmation request again (a manager's action), at most a few times an hour. */
export async function resendConfirmation(ctx: AppContext, actor: Actor, performerId: string, req: Request): Promise<{ mail: OutgoingMail; sentTo: string }> {
  return ctx.db.transaction().execute(async (trx) => {
    const p = await findPerformerIdentity(trx, performerId, { lock: true });
    if (!p) throw notFound('That performer');
    if (!p.email) throw invalid({ email: ['This performer has no e-mail address on record.'] });
    if (p.emailConfirmed) throw conflict('The performer has already confirmed this address.');
    if ((await countRecentConfirmations(trx, p.id, new Date(Date.now() - 3_600_000))) >= SENDS_PER_HOUR) {
      throw new ApiError('rate_limited', 'A confirmation request went to this address several times in the last hour. Wait before sending another.');
    }
    const mail = await startConfirmation(trx, ctx, p, p.email, actor.userId);
    await writeAudit(trx, { actorUserId: actor.userId, action: 'performer.email_confirmation_send', entityType: 'performer', entityId: p.id, req });
    return { mail, sentTo: p.email };
  });
}

async function liveConfirmation(db: Db, token: string, lock = false) {
  const c = await findConfirmationByHash(db, hashToken(token), { lock });
  if (!c) throw notFound('This confirmation link');
  if (c.used_at) throw conflict('This address has already been confirmed with this link.', { reason: 'used' });
  if (new Date(c.expires_at).getTime() <= Date.now()) throw conflict('This confirmation link has expired. Ask the department to send a new one.', { reason: 'expired' });
  const p = await findPerformerIdentity(db, c.performer_id);
  if (!p || !p.email || p.email.toLowerCase() !== c.email.toLowerCase()) {
    throw conflict('The address this link was sent to is no longer the one on record.', { reason: 'superseded' });
  }
  return { c, p };
}

/** What a confirmation link shows before it is used: whose address, nothing more. */
export async function viewConfirmation(db: Db, token: string): Promise<{ performerName: string; email: string }> {
  const { c, p } = await liveConfirmation(db, token);
  return { performerName: p.name, email: c.email };
}

/** The performer confirms the address is theirs: from now on their mail may go there. */
export async function confirmEmail(ctx: AppContext, token: string, req: Request): Promise<{ performerName: string; email: string }> {
  return ctx.db.transaction().execute(async (trx) => {
    const { c, p } = await liveConfirmation(trx, token, true);
    if (!(await confirmPerformerEmail(trx, p.id, c.email))) throw conflict('The address this link was sent to is no longer the one on record.', { reason: 'superseded' });
    await markConfirmationUsed(trx, c.id);
    await writeAudit(trx, { actorUserId: p.userId, actorPerformerId: p.id, action: 'performer.email_confirm', entityType: 'performer', entityId: p.id, req, details: { email: c.email, via: 'link' } });
    return { performerName: p.name, email: c.email };
  });
}

/** Invites the performer to link a sign-in of their own: a one-time link to their confirmed address. */
export async function inviteToSignIn(ctx: AppContext, actor: Actor, performerId: string, req: Request): Promise<{ mail: OutgoingMail; sentTo: string }> {
  return ctx.db.transaction().execute(async (trx) => {
    const p = await findPerformerIdentity(trx, performerId, { lock: true });
    if (!p) throw notFound('That performer');
    if (p.userId) throw conflict('A sign-in is already linked to this performer. Unlink it first.');
    if (!p.email || !p.emailConfirmed) throw invalid({ email: ['The performer must confirm their e-mail address before an invitation can be sent to it.'] });
    if ((await countRecentInvitations(trx, p.id, new Date(Date.now() - 3_600_000))) >= SENDS_PER_HOUR) {
      throw new ApiError('rate_limited', 'Several invitations went to this performer in the last hour. Wait before sending another.');
    }
    const token = newToken();
    const expiresAt = new Date(Date.now() + INVITATION_DAYS * 86_400_000);
    await insertInvitation(trx, { performerId: p.id, email: p.email, tokenHash: hashToken(token), expiresAt, createdBy: actor.userId });
    await writeAudit(trx, { actorUserId: actor.userId, action: 'performer.account_invite', entityType: 'performer', entityId: p.id, req });
    const mail: OutgoingMail = {
      to: p.email,
      subject: 'Your own sign-in to Plinth',
      text: [
        `Hello ${p.name},`,
        '',
        'The make-up department invites you to see your own record in Plinth: your consents, your results and your casts, and to withdraw a consent yourself whenever you wish.',
        '',
        'Open this link, sign in (or create a sign-in with your identity provider), and accept:',
        `${ctx.config.appOrigin}/join/${token}`,
        '',
        `The link works once, for ${INVITATION_DAYS} days, until ${mailDateTime(expiresAt, ctx.config.timeZone)}. If you did not expect it, ignore it: nothing is linked until you accept.`,
        ...mailFooter(await findDepartments(trx, p.productionIds)),
      ].join('\n'),
    };
    return { mail, sentTo: p.email };
  });
}

async function liveInvitation(db: Db, token: string, lock = false) {
  const inv = await findInvitationByHash(db, hashToken(token), { lock });
  if (!inv) throw notFound('This invitation');
  if (inv.accepted_at) throw conflict('This invitation has already been accepted.', { reason: 'used' });
  if (new Date(inv.expires_at).getTime() <= Date.now()) throw conflict('This invitation has expired. Ask the department to send a new one.', { reason: 'expired' });
  const p = await findPerformerIdentity(db, inv.performer_id, { lock });
  if (!p || !p.emailConfirmed || p.email?.toLowerCase() !== inv.email.toLowerCase()) throw conflict('This invitation no longer applies: the address on record has changed.', { reason: 'superseded' });
  return { inv, p };
}

export async function viewInvitation(db: Db, token: string): Promise<{ performerName: string }> {
  const { p } = await liveInvitation(db, token);
  return { performerName: p.name };
}

/** The performer, signed in with a sign-in of their own, accepts: the only way staff-started linking completes. */
export async function acceptInvitation(ctx: AppContext, actor: Actor, token: string, req: Request, mayActAsPerformer: (db: Db, userId: string) => Promise<boolean>): Promise<{ performerId: string }> {
  const { mails, performerId } = await ctx.db.transaction().execute(async (trx) => {
    const { inv, p } = await liveInvitation(trx, token, true);
    if (p.userId) throw conflict('A sign-in is already linked to this performer.');
    if (!(await mayActAsPerformer(trx, actor.userId))) throw forbidden('accept this invitation with a staff sign-in; sign in with your own, personal sign-in');
    if (await findPerformerLinkedToUser(trx, actor.userId)) throw conflict('Your sign-in is already linked to a performer record.');
    await linkUserToPerformer(trx, p.id, actor.userId);
    const added = await addPerformerMemberships(trx, actor.userId, p.productionIds, null);
    await markInvitationAccepted(trx, inv.id, actor.userId);
    await writeAudit(trx, { actorUserId: actor.userId, actorPerformerId: p.id, action: 'performer.account_link', entityType: 'performer', entityId: p.id, req, details: { userId: actor.userId, via: 'invitation', productions: added } });
    return { performerId: p.id, mails: await leadNotices(trx, ctx.config.timeZone, p, `Plinth: ${p.name} linked a sign-in`, [`${p.name} accepted the invitation and linked a sign-in of their own to their record.`]) };
  });
  await deliverIdentityMail(ctx, mails);
  return { performerId };
}

/**
 * Linking at sign-in by e-mail: only to a performer whose address the performer confirmed, and
 * only for a sign-in that may stand for a performer. Runs in the sign-in's own transaction.
 */
export async function linkConfirmedPerformerAtSignIn(ctx: AppContext, userId: string, verifiedEmail: string, mayActAsPerformer: (db: Db, userId: string) => Promise<boolean>): Promise<string | null> {
  const result = await ctx.db.transaction().execute(async (trx) => {
    if (await findPerformerLinkedToUser(trx, userId)) return null;
    if (!(await mayActAsPerformer(trx, userId))) return null;
    const performerId = await findUnlinkedPerformerByConfirmedEmail(trx, verifiedEmail);
    if (!performerId) return null;
    const p = (await findPerformerIdentity(trx, performerId))!;
    await linkUserToPerformer(trx, performerId, userId);
    const added = await addPerformerMemberships(trx, userId, p.productionIds, null);
    await writeAudit(trx, { actorUserId: userId, actorPerformerId: performerId, action: 'performer.link_on_sign_in', entityType: 'performer', entityId: performerId, details: { productions: added.length } });
    return { performerId, mails: await leadNotices(trx, ctx.config.timeZone, p, `Plinth: ${p.name} linked a sign-in`, [`${p.name} signed in with the address they confirmed, and that sign-in is now linked to their record.`]) };
  });
  if (!result) return null;
  await deliverIdentityMail(ctx, result.mails);
  return result.performerId;
}

/** A manager unlinks the sign-in: allowed (it only takes access away); the performer and the lead are told. */
export async function unlinkNotices(db: Db, timeZone: string, performerId: string, byName: string): Promise<OutgoingMail[]> {
  const p = await findPerformerIdentity(db, performerId);
  if (!p) return [];
  const mails = await leadNotices(db, timeZone, p, `Plinth: ${p.name}'s sign-in was unlinked`, [`${byName} unlinked the sign-in from ${p.name}'s record.`]);
  if (p.email && p.emailConfirmed) {
    mails.push({
      to: p.email,
      subject: 'Your sign-in was unlinked from your record',
      text: [
        `Hello ${p.name},`,
        '',
        `The make-up department unlinked your sign-in from your record in Plinth on ${mailDateTime(new Date(), timeZone)}. Ask the department for a new invitation if you want to see your record again.`,
        ...mailFooter(await findDepartments(db, p.productionIds)),
      ].join('\n'),
    });
  }
  return mails;
}

export async function deliverIdentityMail(ctx: AppContext, mails: readonly OutgoingMail[]): Promise<void> {
  await deliverAll(ctx, mails);
}
