import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { RescheduleBookingInputSchema, type Booking } from '#shared/schemas/bookings.ts';
import { Button } from '../../../components/ui/button.tsx';
import { Dialog } from '../../../components/ui/dialog.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { formErrorsFrom } from '../../../lib/form-errors.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { useRescheduleBooking } from '../api.ts';
import { BOOKING_PURPOSE_LABELS } from './purpose.ts';

// The date box gives local time ("2027-03-01T09:30"); the API wants an instant with its offset.
const MoveFormSchema = z.object({
  startsAt: z
    .string()
    .min(1, 'Choose a date and time')
    .refine((v) => !Number.isNaN(new Date(v).getTime()), 'Choose a date and time')
    .transform((v) => new Date(v).toISOString()),
  location: RescheduleBookingInputSchema.shape.location,
});
type MoveFormValues = z.input<typeof MoveFormSchema>;

/** The value a datetime-local box shows for an instant, in the browser's own time zone. */
function localInputValue(iso: string): string {
  const d = new Date(iso);
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}T${pad(d.getHours())}:${pad(d.getMinutes())}`;
}

/** "Move" a booked session: new time or place; the performer's and the lead's calendars get the update. */
export function MoveSessionDialog({ booking, onClose }: { booking: Booking | null; onClose: () => void }) {
  return (
    <Dialog open={booking !== null} onClose={onClose} title="Move this session" testId="move-session-dialog">
      {booking ? <MoveSessionForm key={`${booking.id}:${booking.sequence}`} booking={booking} onClose={onClose} /> : null}
    </Dialog>
  );
}

function MoveSessionForm({ booking, onClose }: { booking: Booking; onClose: () => void }) {
  const move = useRescheduleBooking();
  const [formError, setFormError] = useState<string[] | null>(null);
  const form = useForm<MoveFormValues, unknown, z.output<typeof MoveFormSchema>>({
    resolver: zodResolver(MoveFormSchema),
    defaultValues: { startsAt: localInputValue(booking.startsAt), location: booking.location ?? '' },
  });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      await move.mutateAsync({ id: booking.id, input: { startsAt: values.startsAt, location: values.location ?? '', sequence: booking.sequence } });
      onClose();
    } catch (err) {
      if (isApiError(err, 409)) setFormError([err.message, 'The list now shows the session as it is; close this and open it again to move it.']);
      else setFormError(formErrorsFrom(err, form.setError, ['startsAt', 'location']));
    }
  });

  return (
    <form noValidate onSubmit={onSubmit} className="flex flex-col gap-4" aria-label="Move the session">
      <p>
        {BOOKING_PURPOSE_LABELS[booking.purpose]} of {booking.performerName}, now {formatDateTime(booking.startsAt)}. The performer (at a confirmed address) and the designated lead
        get an updated calendar entry.
      </p>
      <TextField label="New date and time" type="datetime-local" error={errors.startsAt?.message} {...form.register('startsAt')} />
      <TextField label="Place" autoComplete="off" error={errors.location?.message} {...form.register('location')} />
      <FormError messages={formError} />
      <div className="flex flex-wrap gap-3">
        <Button type="submit" pending={move.isPending} pendingLabel="Moving…">
          Move the session
        </Button>
        <Button type="button" variant="secondary" onClick={onClose}>
          Keep it as it is
        </Button>
      </div>
    </form>
  );
}
