// What other features may use of sessions (bookings); everything else here is the feature's own.
export { listBookings } from './service.ts';
