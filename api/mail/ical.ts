import ical, { ICalAttendeeRole, ICalAttendeeStatus, ICalCalendarMethod, ICalEventStatus } from 'ical-generator';

/** One appointment as a calendar invitation (RFC 5545 text, METHOD per RFC 5546). */
export interface CalendarInvitation {
  /** Stable for the appointment's whole life, so an update or cancellation replaces the earlier entry. */
  uid: string;
  /** 0 when first sent; one more for every change and for the cancellation. */
  sequence: number;
  method: 'request' | 'cancel';
  start: Date;
  end: Date;
  summary: string;
  description: string;
  location: string | null;
  url?: string;
  organizer: { name: string; email: string };
  attendees: readonly { name: string; email: string }[];
  /** When this version of the invitation was made (DTSTAMP). */
  stamp: Date;
}

/** The text/calendar body for an invitation or its cancellation. Times are written in UTC, so no time-zone table is needed. */
export function invitationIcs(inv: CalendarInvitation): string {
  const cal = ical({ prodId: { company: 'Plinth', product: 'sessions', language: 'EN' }, method: inv.method === 'cancel' ? ICalCalendarMethod.CANCEL : ICalCalendarMethod.REQUEST });
  cal.createEvent({
    id: inv.uid,
    sequence: inv.sequence,
    stamp: inv.stamp,
    start: inv.start,
    end: inv.end,
    summary: inv.summary,
    description: inv.description,
    location: inv.location ?? undefined,
    url: inv.url,
    organizer: { name: inv.organizer.name, email: inv.organizer.email },
    attendees: inv.attendees.map((a) => ({ name: a.name, email: a.email, role: ICalAttendeeRole.REQ, status: ICalAttendeeStatus.NEEDSACTION, rsvp: inv.method === 'request' })),
    status: inv.method === 'cancel' ? ICalEventStatus.CANCELLED : ICalEventStatus.CONFIRMED,
  });
  return cal.toString();
}
