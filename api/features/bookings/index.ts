// What other features may use of sessions (bookings); everything else here is the feature's own.
export { upcomingBookingsJsonSql } from './repo.ts';
export { bookingsFromJson, listBookings } from './service.ts';
export { type InvitationKind, sendSessionInvitations, sessionInvitationMails } from './invitations.ts';
export { bumpInvitationSequence } from './repo.ts';
