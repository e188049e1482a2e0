import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { z } from 'zod';
import { BOOKING_PURPOSES, consentKindNeeded, type BookingPurpose } from '#shared/domain/bookings.ts';
import { CONSENT_KIND_LABELS } from '#shared/domain/consent.ts';
import { CreateBookingInputSchema, type Booking } from '#shared/schemas/bookings.ts';
import { Button, ButtonLink } from '../../../components/ui/button.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { formErrorsFrom } from '../../../lib/form-errors.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { paths } from '../../../lib/paths.ts';
import { Caution } from '../../../components/consent/caution.tsx';
import { SendFormNow } from '../../consents/index.ts';
import { bookingStaffQueryOptions, consentCheckQueryOptions, useCreateBooking } from '../api.ts';
import { BOOKING_PURPOSE_LABELS } from './purpose.ts';

const localMoment = (required: boolean) =>
  z
    .string()
    .refine((v) => (required ? v.length > 0 : true), 'Choose a date and time')
    .refine((v) => v === '' || !Number.isNaN(new Date(v).getTime()), 'Choose a date and time')
    .transform((v) => (v ? new Date(v).toISOString() : undefined));

// The date boxes give local time ("2027-03-01T09:30"); the API wants an instant with its offset.
const BookingFormSchema = z
  .object({
    purpose: CreateBookingInputSchema.shape.purpose,
    startsAt: localMoment(true),
    endsAt: localMoment(false),
    location: CreateBookingInputSchema.shape.location,
    artistUserId: z.string(),
  })
  .refine((v) => !v.endsAt || !v.startsAt || v.endsAt > v.startsAt, { path: ['endsAt'], message: 'The session must end after it starts' });
type BookingFormValues = z.input<typeof BookingFormSchema>;

function isPurpose(v: string): v is BookingPurpose {
  return (BOOKING_PURPOSES as readonly string[]).includes(v);
}

/** The moment typed into a date box, if it is one. */
function instantOf(v: string | undefined): string | null {
  if (!v) return null;
  const t = new Date(v);
  return Number.isNaN(t.getTime()) ? null : t.toISOString();
}

/**
 * "Book a session" for one performer on the acting production, with the caution for its kind of
 * work. As soon as purpose and time are chosen it says whether the consent the session needs will
 * be in force; a session without it is still booked, waits for consent, and the form can go out at once.
 */
export function BookingForm({ performerId, productionId, defaultStartsAt }: { performerId: string; productionId: string; defaultStartsAt?: string }) {
  const create = useCreateBooking();
  const staff = useQuery(bookingStaffQueryOptions(productionId));
  const [formError, setFormError] = useState<string[] | null>(null);
  const [booked, setBooked] = useState<Booking | null>(null);
  const form = useForm<BookingFormValues, unknown, z.output<typeof BookingFormSchema>>({
    resolver: zodResolver(BookingFormSchema),
    defaultValues: { purpose: '' as BookingPurpose, startsAt: defaultStartsAt ?? '', endsAt: '', location: '', artistUserId: '' },
  });
  const { errors } = form.formState;
  const purpose = useWatch({ control: form.control, name: 'purpose' });
  const startsAtTyped = useWatch({ control: form.control, name: 'startsAt' });
  const startsAt = instantOf(startsAtTyped);
  const check = useQuery({
    ...consentCheckQueryOptions({ performerId, productionId, purpose, startsAt: startsAt ?? '' }),
    enabled: isPurpose(purpose) && startsAt !== null,
  });

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    setBooked(null);
    try {
      const b = await create.mutateAsync({
        performerId,
        productionId,
        purpose: values.purpose,
        startsAt: values.startsAt!,
        endsAt: values.endsAt,
        location: values.location || undefined,
        artistUserId: values.artistUserId || undefined,
      });
      form.reset();
      setBooked(b);
    } catch (err) {
      setFormError(formErrorsFrom(err, form.setError, ['purpose', 'startsAt', 'endsAt', 'location', 'artistUserId']));
    }
  });

  const gate = check.data && isPurpose(purpose) && check.data.missing ? check.data : null;
  return (
    <div className="flex flex-col gap-4">
      <form noValidate onSubmit={onSubmit} className="flex flex-col gap-4" aria-label="Book a session" data-testid="booking-form">
        <div className="grid gap-4 md:grid-cols-2">
          <SelectField label="Purpose" error={errors.purpose?.message} {...form.register('purpose')}>
            <option value="">Choose…</option>
            {BOOKING_PURPOSES.map((p) => (
              <option key={p} value={p}>
                {BOOKING_PURPOSE_LABELS[p]}
              </option>
            ))}
          </SelectField>
          <SelectField label="Artist" hint="Optional: who carries it out." error={errors.artistUserId?.message} {...form.register('artistUserId')}>
            <option value="">Not assigned yet</option>
            {(staff.data?.items ?? []).map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </SelectField>
          <TextField label="Starts" type="datetime-local" error={errors.startsAt?.message} {...form.register('startsAt')} />
          <TextField label="Ends" type="datetime-local" hint="Optional." error={errors.endsAt?.message} {...form.register('endsAt')} />
          <TextField label="Place" autoComplete="off" hint="Optional, for example “Make-up room 2”." error={errors.location?.message} {...form.register('location')} />
        </div>
        {gate ? (
          <output className="block rounded-xl border-l-4 border-brick-700 bg-brick-50 p-3 font-semibold text-ink-900" data-testid="booking-gate">
            This performer will not have an active {CONSENT_KIND_LABELS[gate.kind].toLowerCase()} consent when the session starts. You can book it now: it waits for consent,
            and you can send the form as soon as it is booked.
          </output>
        ) : null}
        {isPurpose(purpose) ? <Caution kind={consentKindNeeded(purpose)} /> : null}
        <FormError messages={formError} />
        {purpose === 'patch_test' ? (
          <div className="flex flex-wrap items-center gap-4">
            <p className="text-graphite-700">A patch test is booked with its products, lots and test sites.</p>
            <ButtonLink to={paths.bookPatchTest.href(performerId)}>Book a patch test</ButtonLink>
          </div>
        ) : (
          <div className="flex flex-wrap items-center gap-4">
            <Button type="submit" pending={create.isPending} pendingLabel="Booking…">
              Book the session
            </Button>
          </div>
        )}
      </form>
      {booked ? (
        <div className="flex flex-col gap-3 rounded-xl bg-sand-100 p-4" data-testid="booking-done">
          <output className="font-semibold text-sage-800">
            Booked: {BOOKING_PURPOSE_LABELS[booked.purpose].toLowerCase()} on {formatDateTime(booked.startsAt)}.
            {booked.consentMissing ? ' It is waiting for consent.' : ' The consent it needs is in place.'} Calendar invitations went to the performer (at a confirmed address) and
            the designated lead.
          </output>
          {booked.consentMissing ? <SendFormNow performerId={performerId} productionId={productionId} kind={consentKindNeeded(booked.purpose)} /> : null}
        </div>
      ) : null}
    </div>
  );
}
