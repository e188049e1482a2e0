import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { z } from 'zod';
import { BOOKING_PURPOSES, consentKindNeeded, type BookingPurpose } from '#shared/domain/bookings.ts';
import { CreateBookingInputSchema } from '#shared/schemas/bookings.ts';
import { Button } from '../../../components/ui/button.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { formErrorsFrom } from '../../../lib/form-errors.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { Caution } from '../../../components/consent/caution.tsx';
import { useCreateBooking } from '../api.ts';
import { BOOKING_PURPOSE_LABELS } from './purpose.ts';

// The date box gives local time ("2027-03-01T09:30"); the API wants an instant with its offset.
const BookingFormSchema = z.object({
  purpose: CreateBookingInputSchema.shape.purpose,
  startsAt: z
    .string()
    .min(1, 'Choose a date and time')
    .refine((v) => !Number.isNaN(new Date(v).getTime()), 'Choose a date and time')
    .transform((v) => new Date(v).toISOString()),
  location: CreateBookingInputSchema.shape.location,
});
type BookingFormValues = z.input<typeof BookingFormSchema>;

/** "Book a session" for one performer on the acting production, with the caution for its kind of work. */
export function BookingForm({ performerId, productionId }: { performerId: string; productionId: string }) {
  const create = useCreateBooking();
  const [formError, setFormError] = useState<string[] | null>(null);
  const [booked, setBooked] = useState<string | null>(null);
  const form = useForm<BookingFormValues, unknown, z.output<typeof BookingFormSchema>>({
    resolver: zodResolver(BookingFormSchema),
    defaultValues: { purpose: '' as BookingPurpose, startsAt: '', location: '' },
  });
  const { errors } = form.formState;
  const purpose = useWatch({ control: form.control, name: 'purpose' });

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    setBooked(null);
    try {
      const b = await create.mutateAsync({ ...values, location: values.location || undefined, performerId, productionId });
      form.reset();
      setBooked(
        `Booked: ${BOOKING_PURPOSE_LABELS[b.purpose].toLowerCase()} on ${formatDateTime(b.startsAt)}.${b.consentMissing ? ' The consent it needs is not in place yet.' : ''} Calendar invitations went to the performer (at a confirmed address) and the designated lead.`,
      );
    } catch (err) {
      setFormError(formErrorsFrom(err, form.setError, ['purpose', 'startsAt', 'location']));
    }
  });

  return (
    <form noValidate onSubmit={onSubmit} className="flex flex-col gap-4" aria-label="Book a session" data-testid="booking-form">
      <div className="grid gap-4 md:grid-cols-3">
        <SelectField label="Purpose" error={errors.purpose?.message} {...form.register('purpose')}>
          <option value="">Choose…</option>
          {BOOKING_PURPOSES.map((p) => (
            <option key={p} value={p}>
              {BOOKING_PURPOSE_LABELS[p]}
            </option>
          ))}
        </SelectField>
        <TextField label="Date and time" type="datetime-local" error={errors.startsAt?.message} {...form.register('startsAt')} />
        <TextField label="Place" autoComplete="off" hint="Optional, for example “Make-up room 2”." error={errors.location?.message} {...form.register('location')} />
      </div>
      {(BOOKING_PURPOSES as readonly string[]).includes(purpose) ? <Caution kind={consentKindNeeded(purpose)} /> : null}
      <FormError messages={formError} />
      <div className="flex flex-wrap items-center gap-4">
        <Button type="submit" pending={create.isPending} pendingLabel="Booking…">
          Book the session
        </Button>
        {booked ? <output className="font-semibold text-sage-800">{booked}</output> : null}
      </div>
    </form>
  );
}
