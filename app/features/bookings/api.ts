import { queryOptions, useMutation, useQueryClient, type QueryClient } from '@tanstack/react-query';
import { BookingListSchema, BookingSchema, BookingStaffSchema, ConsentCheckSchema, type CreateBookingInput, type RescheduleBookingInput } from '#shared/schemas/bookings.ts';
import { api, withQuery } from '../../lib/api-client.ts';
import { bookingsKey, homeKey, invalidate, performersKey } from '../../lib/query-keys.ts';

/** A production's sessions from now on, each flagged when its consent will not be in force. */
export function bookingsQueryOptions(productionId: string) {
  return queryOptions({
    queryKey: [...bookingsKey, 'list', productionId] as const,
    queryFn: ({ signal }) => api.get(withQuery('/api/bookings', { productionId }), BookingListSchema, signal),
  });
}

function bookingsChanged(queryClient: QueryClient) {
  return invalidate(queryClient, [bookingsKey, performersKey, homeKey]);
}

export function useCreateBooking() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateBookingInput) => api.post('/api/bookings', input, BookingSchema),
    onSuccess: () => bookingsChanged(queryClient),
  });
}

export function useCancelBooking() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => api.post(`/api/bookings/${encodeURIComponent(id)}/cancel`, {}, BookingSchema),
    onSuccess: () => bookingsChanged(queryClient),
  });
}

/** Moves a session; on a 409 (someone moved it first) the lists reload so the latest time shows. */
export function useRescheduleBooking() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, input }: { id: string; input: RescheduleBookingInput }) => api.post(`/api/bookings/${encodeURIComponent(id)}/reschedule`, input, BookingSchema),
    onSettled: () => bookingsChanged(queryClient),
  });
}

/** Whether a session being booked would wait for consent, asked as soon as purpose and time are chosen. */
export function consentCheckQueryOptions(q: { performerId: string; productionId: string; purpose: string; startsAt: string }) {
  return queryOptions({
    queryKey: [...bookingsKey, 'consent-check', q] as const,
    queryFn: ({ signal }) => api.get(withQuery('/api/bookings/consent-check', q), ConsentCheckSchema, signal),
  });
}

export function bookingStaffQueryOptions(productionId: string) {
  return queryOptions({
    queryKey: [...bookingsKey, 'staff', productionId] as const,
    queryFn: ({ signal }) => api.get(withQuery('/api/bookings/staff', { productionId }), BookingStaffSchema, signal),
    staleTime: 5 * 60_000,
  });
}

/** Sessions in a calendar window, past ones included. */
export function bookingsWindowQueryOptions(productionId: string, from: string, to: string) {
  return queryOptions({
    queryKey: [...bookingsKey, 'window', productionId, from, to] as const,
    queryFn: ({ signal }) => api.get(withQuery('/api/bookings', { productionId, from, to }), BookingListSchema, signal),
  });
}
