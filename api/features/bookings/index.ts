// What other features may use of sessions (bookings); everything else here is the feature's own.
export { upcomingBookingsJsonSql } from './repo.ts';
export { bookingsFromJson, listBookings } from './service.ts';
