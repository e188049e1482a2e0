import { useState } from 'react';
import { Link } from 'react-router-dom';
import type { Booking } from '#shared/schemas/bookings.ts';
import { Button } from '../../../components/ui/button.tsx';
import { ConfirmDialog } from '../../../components/ui/dialog.tsx';
import { Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { formatDateTime } from '../../../lib/format.ts';
import { paths } from '../../../lib/paths.ts';
import { IconBadge } from '../../../components/consent/consent-state.tsx';
import { useCancelBooking } from '../api.ts';
import { MoveSessionDialog } from './move-session-dialog.tsx';
import { BOOKING_PURPOSE_LABELS, neededConsentLabel } from './purpose.ts';

const STATUS_LABELS: Record<Booking['status'], string> = { booked: 'Booked', cancelled: 'Cancelled', done: 'Done' };

/** "Consent missing" in words and with its mark, naming the consent the session needs. */
export function ConsentGate({ booking: b }: { booking: Booking }) {
  if (b.status !== 'booked') return <span className="text-ink-600">{STATUS_LABELS[b.status]}</span>;
  if (b.consentMissing) {
    return (
      <span className="flex flex-col items-start gap-0.5" data-testid="consent-missing">
        <IconBadge icon="warning" tone="danger">
          Consent missing
        </IconBadge>
        <span className="text-sm text-ink-700">Needs an active {neededConsentLabel(b.purpose).toLowerCase()} when it starts.</span>
      </span>
    );
  }
  return (
    <IconBadge icon="check" tone="good">
      Consent in place
    </IconBadge>
  );
}

interface BookingsTableProps {
  bookings: Booking[];
  caption: string;
  /** The sessions page lists every performer; a performer's own page leaves the column out. */
  showPerformer?: boolean;
  canCancel: boolean;
}

export function BookingsTable({ bookings, caption, showPerformer = false, canCancel }: BookingsTableProps) {
  const cancel = useCancelBooking();
  const [cancelling, setCancelling] = useState<Booking | null>(null);
  const [moving, setMoving] = useState<Booking | null>(null);

  function close() {
    setCancelling(null);
    cancel.reset();
  }

  return (
    <>
      <Table caption={caption} captionHidden testId="bookings-table">
        <Thead>
          <tr>
            <Th>When</Th>
            <Th>Purpose</Th>
            {showPerformer ? <Th>Performer</Th> : null}
            <Th>Place</Th>
            <Th>Consent</Th>
            {canCancel ? (
              <Th>
                <span className="sr-only">Actions</span>
              </Th>
            ) : null}
          </tr>
        </Thead>
        <tbody>
          {bookings.map((b) => (
            <Tr key={b.id}>
              <Td className="whitespace-nowrap">
                <time dateTime={b.startsAt}>{formatDateTime(b.startsAt)}</time>
              </Td>
              <Td className="font-semibold">{BOOKING_PURPOSE_LABELS[b.purpose]}</Td>
              {showPerformer ? (
                <Td>
                  <Link to={paths.performer.href(b.performerId)} className="inline-flex min-h-11 items-center font-semibold">
                    {b.performerName}
                  </Link>
                </Td>
              ) : null}
              <Td>{b.location ?? <span className="text-ink-600">Not set</span>}</Td>
              <Td>
                <ConsentGate booking={b} />
              </Td>
              {canCancel ? (
                <Td className="text-right">
                  {b.status === 'booked' ? (
                    <span className="inline-flex flex-wrap justify-end gap-2">
                    <Button variant="secondary" aria-label={`Move the ${BOOKING_PURPOSE_LABELS[b.purpose].toLowerCase()} of ${b.performerName} on ${formatDateTime(b.startsAt)}`} onClick={() => setMoving(b)}>
                      Move
                    </Button>
                    <Button variant="secondary" aria-label={`Cancel the ${BOOKING_PURPOSE_LABELS[b.purpose].toLowerCase()} of ${b.performerName} on ${formatDateTime(b.startsAt)}`} onClick={() => setCancelling(b)}>
                      Cancel
                    </Button>
                    </span>
                  ) : null}
                </Td>
              ) : null}
            </Tr>
          ))}
        </tbody>
      </Table>
      <ConfirmDialog
        open={cancelling !== null}
        title="Cancel this session?"
        confirmLabel="Cancel the session"
        pending={cancel.isPending}
        error={cancel.error}
        onCancel={close}
        onConfirm={() => {
          if (cancelling) cancel.mutate(cancelling.id, { onSuccess: close });
        }}
      >
        {cancelling ? (
          <p>
            The {BOOKING_PURPOSE_LABELS[cancelling.purpose].toLowerCase()} of {cancelling.performerName} on {formatDateTime(cancelling.startsAt)} will be cancelled.
            The performer (at a confirmed address) and the designated lead get a cancellation for their calendars.
          </p>
        ) : null}
      </ConfirmDialog>
      <MoveSessionDialog booking={moving} onClose={() => setMoving(null)} />
    </>
  );
}
