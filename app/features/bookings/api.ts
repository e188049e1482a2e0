import { queryOptions, useMutation, useQueryClient, type QueryClient } from '@tanstack/react-query';
import { BookingListSchema, BookingSchema, type CreateBookingInput, type RescheduleBookingInput } from '#shared/schemas/bookings.ts';
import { api, withQuery } from '../../lib/api-client.ts';
import { bookingsKey, homeKey, performersKey } from '../../lib/query-keys.ts';

/** A production's sessions from now on, each flagged when its consent will not be in force. */
export function bookingsQueryOptions(productionId: string) {
  return queryOptions({
    queryKey: [...bookingsKey, 'list', productionId] as const,
    queryFn: ({ signal }) => api.get(withQuery('/api/bookings', { productionId }), BookingListSchema, signal),
  });
}

function bookingsChanged(queryClient: QueryClient) {
  return Promise.all([bookingsKey, performersKey, homeKey].map((queryKey) => queryClient.invalidateQueries({ queryKey })));
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
