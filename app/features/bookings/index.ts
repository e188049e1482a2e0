// What other features may use of sessions (bookings) on the client.
export { BookingForm } from './components/booking-form.tsx';
export { BookingsTable } from './components/bookings-table.tsx';
export { consentCheckQueryOptions } from './api.ts';
