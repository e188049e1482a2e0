import { BOOKING_PURPOSE_LABELS, sessionEnd } from '#shared/domain/bookings.ts';
import type { AppContext } from '../../context.ts';
import { mailDateTime } from '../../mail/dates.ts';
import { deliverAll } from '../../mail/deliver.ts';
import { invitationIcs } from '../../mail/ical.ts';
import type { OutgoingMail } from '../../mail/mailer.ts';
import { findConfirmedEmail } from '../performers/index.ts';
import { findCurrentLeads, findDepartment, mailFooter } from '../productions/index.ts';
import { findBookingForInvitation } from './repo.ts';

export type InvitationKind = 'request' | 'update' | 'cancel';

function parseAddress(from: string): { name: string; email: string } {
  const m = /^\s*(.*?)\s*<([^>]+)>\s*$/.exec(from);
  return m ? { name: m[1] || 'Plinth', email: m[2]! } : { name: 'Plinth', email: from.trim() };
}

/**
 * The invitation mails for one session, for the performer (at their confirmed address only) and the designated
 * lead of its production. The calendar entry names what the session is, the production and the place: never a
 * reason, a result or any other health detail, since calendars are shared and synced far beyond Plinth.
 */
export async function sessionInvitationMails(ctx: Pick<AppContext, 'db' | 'config'>, bookingId: string, kind: InvitationKind): Promise<OutgoingMail[]> {
  const b = await findBookingForInvitation(ctx.db, bookingId);
  if (!b) return [];
  const [performer, leads, dep] = await Promise.all([findConfirmedEmail(ctx.db, b.performerId), findCurrentLeads(ctx.db, [b.productionId]), findDepartment(ctx.db, b.productionId)]);
  const people = [...(performer ? [{ name: performer.name, email: performer.email }] : []), ...leads.map((l) => ({ name: l.name, email: l.email }))];
  const seen = new Set<string>();
  const attendees = people.filter((p) => !seen.has(p.email.toLowerCase()) && seen.add(p.email.toLowerCase()));
  if (attendees.length === 0) return [];

  const what = BOOKING_PURPOSE_LABELS[b.purpose];
  const start = b.startsAt;
  // DTEND is the end booked for the session; only a session booked without one gets its purpose's usual length.
  const end = sessionEnd(b.purpose, start, b.endsAt);
  const when = mailDateTime(start, ctx.config.timeZone);
  const method = kind === 'cancel' ? 'cancel' : 'request';
  const summary = `${what} — ${b.productionName}`;
  const description = `${what} session for ${b.productionName}, with the prosthetics department.${kind === 'cancel' ? ' This session has been cancelled.' : ''}`;
  const ics = invitationIcs({
    uid: `session-${b.id}@plinth`,
    sequence: b.invitationSequence,
    method,
    start,
    end,
    summary,
    description,
    location: b.location,
    organizer: parseAddress(ctx.config.mailFrom),
    attendees,
    stamp: new Date(),
  });
  const subject = `${kind === 'cancel' ? `Cancelled: ${what}, ${when}` : kind === 'update' ? `Moved: ${what}, now ${when}` : `Invitation: ${what}, ${when}`} (${b.productionName})`;
  const lines = [
    kind === 'cancel' ? `The ${what.toLowerCase()} session below has been cancelled.` : kind === 'update' ? `The ${what.toLowerCase()} session has a new time or place.` : `You are invited to a ${what.toLowerCase()} session.`,
    '',
    `Production: ${b.productionName}`,
    `When: ${when}`,
    `Ends: ${mailDateTime(end, ctx.config.timeZone)}`,
    `Where: ${b.location ?? 'to be confirmed'}`,
    '',
    'The attached calendar entry updates your calendar. Questions go to the prosthetics department of the production.',
    ...mailFooter(dep),
  ];
  return attendees.map((a) => ({
    to: a.email,
    subject,
    text: [`Hello ${a.name},`, '', ...lines].join('\n'),
    icalEvent: { method: method.toUpperCase(), content: ics, filename: 'session.ics' },
  }));
}

/** Sends a session's invitation, update or cancellation after the change has committed; a mail that fails is kept for the Outbox. */
export async function sendSessionInvitations(ctx: Pick<AppContext, 'db' | 'config' | 'mailer' | 'log'>, bookingId: string, kind: InvitationKind): Promise<void> {
  await deliverAll(ctx, await sessionInvitationMails(ctx, bookingId, kind));
}
