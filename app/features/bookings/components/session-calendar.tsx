import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { addDays, daysOf, localInputValue, startOfDay } from '#shared/domain/calendar.ts';
import type { Booking } from '#shared/schemas/bookings.ts';
import { Button } from '../../../components/ui/button.tsx';
import { Dialog } from '../../../components/ui/dialog.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { formatClock, formatDayTitle, formatLongDate } from '../../../lib/format.ts';
import { paths } from '../../../lib/paths.ts';
import { performersQueryOptions } from '../../performers/index.ts';
import { bookingsWindowQueryOptions } from '../api.ts';
import { ConsentGate } from './bookings-table.tsx';
import { BookingForm } from './booking-form.tsx';
import { BOOKING_PURPOSE_LABELS } from './purpose.ts';


function sameDay(a: Date, b: Date) {
  return a.getFullYear() === b.getFullYear() && a.getMonth() === b.getMonth() && a.getDate() === b.getDate();
}

/**
 * Day and week views of a production's sessions, past ones kept, each with its times, place,
 * artist and consent state. A day lists its sessions as cards (so the action stays in reach in
 * portrait) and can be booked from directly.
 */
export function SessionCalendar({ productionId, canBook }: { productionId: string; canBook: boolean }) {
  const [view, setView] = useState<'day' | 'week'>('week');
  const [anchor, setAnchor] = useState(() => startOfDay(new Date()));
  const [bookingOn, setBookingOn] = useState<Date | null>(null);
  const days = daysOf(view, anchor);
  const from = days[0]!;
  const to = addDays(days.at(-1)!, 1);
  const sessions = useQuery(bookingsWindowQueryOptions(productionId, from.toISOString(), to.toISOString()));
  const step = view === 'day' ? 1 : 7;
  const title = view === 'day' ? formatDayTitle(from) : `${formatLongDate(from)} – ${formatLongDate(days.at(-1)!)}`;

  return (
    <div className="flex flex-col gap-4" data-testid="session-calendar">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <fieldset className="flex gap-2">
          <legend className="sr-only">Calendar view</legend>
          {(['day', 'week'] as const).map((v) => (
            <Button key={v} variant={view === v ? 'primary' : 'secondary'} aria-pressed={view === v} onClick={() => setView(v)}>
              {v === 'day' ? 'Day' : 'Week'}
            </Button>
          ))}
        </fieldset>
        <div className="flex flex-wrap items-center gap-2">
          <Button variant="secondary" onClick={() => setAnchor(addDays(anchor, -step))}>
            <span aria-hidden="true">‹ </span>
            {view === 'day' ? 'Previous day' : 'Previous week'}
          </Button>
          <Button variant="secondary" onClick={() => setAnchor(startOfDay(new Date()))}>
            Today
          </Button>
          <Button variant="secondary" onClick={() => setAnchor(addDays(anchor, step))}>
            {view === 'day' ? 'Next day' : 'Next week'}
            <span aria-hidden="true"> ›</span>
          </Button>
        </div>
      </div>
      <h3 className="text-xl font-bold text-ink-900" data-testid="calendar-title">
        {title}
      </h3>
      <QueryView query={sessions} loadingLabel="Loading sessions…">
        {(data) => (
          <ol className="flex flex-col gap-4" aria-label="Days">
            {days.map((day) => {
              const here = data.items.filter((b) => sameDay(new Date(b.startsAt), day));
              const past = addDays(day, 1).getTime() <= Date.now();
              return (
                <li key={day.toISOString()} className="flex flex-col gap-2 rounded-2xl border border-sand-300 bg-white p-4" data-testid="calendar-day">
                  <div className="flex flex-wrap items-center justify-between gap-2">
                    <h4 className="text-lg font-bold text-ink-900">{formatDayTitle(day)}</h4>
                    {canBook && !past ? (
                      <Button variant="secondary" onClick={() => setBookingOn(day)}>
                        Book on this day<span className="sr-only">, {formatDayTitle(day)}</span>
                      </Button>
                    ) : null}
                  </div>
                  {here.length === 0 ? <p className="text-ink-700">No sessions.</p> : <ul className="flex flex-col gap-2">{here.map((b) => <SessionCard key={b.id} booking={b} />)}</ul>}
                </li>
              );
            })}
          </ol>
        )}
      </QueryView>
      <Dialog open={bookingOn !== null} onClose={() => setBookingOn(null)} title={bookingOn ? `Book a session on ${formatDayTitle(bookingOn)}` : 'Book a session'} testId="calendar-book-dialog">
        {bookingOn ? <BookFromCalendar productionId={productionId} day={bookingOn} /> : null}
      </Dialog>
    </div>
  );
}

function SessionCard({ booking: b }: { booking: Booking }) {
  const start = new Date(b.startsAt);
  return (
    <li className="flex flex-col gap-2 rounded-xl bg-sand-100 p-3 sm:flex-row sm:items-start sm:justify-between" data-testid="calendar-session">
      <div className="flex flex-col gap-0.5">
        <p className="font-semibold text-ink-900">
          <time dateTime={b.startsAt}>{formatClock(start)}</time>
          {b.endsAt ? (
            <>
              {' – '}
              <time dateTime={b.endsAt}>{formatClock(new Date(b.endsAt))}</time>
            </>
          ) : null}{' '}
          · {BOOKING_PURPOSE_LABELS[b.purpose]}
        </p>
        <Link to={paths.performer.href(b.performerId)} className="inline-flex min-h-11 items-center font-semibold">
          {b.performerName}
        </Link>
        <p className="text-sm text-ink-700">
          {b.location ?? 'Place not set'} · {b.artist ? `Artist: ${b.artist.name}` : 'No artist assigned'}
        </p>
      </div>
      <ConsentGate booking={b} />
    </li>
  );
}

function BookFromCalendar({ productionId, day }: { productionId: string; day: Date }) {
  const performers = useQuery(performersQueryOptions({ productionId, consent: 'any', sort: 'name', dir: 'asc', page: 1, pageSize: 100 }));
  const [performerId, setPerformerId] = useState('');
  return (
    <QueryView query={performers} loadingLabel="Loading performers…">
      {(data) => (
        <div className="flex flex-col gap-4">
          <SelectField label="Performer" value={performerId} onChange={(e) => setPerformerId(e.currentTarget.value)}>
            <option value="">Choose…</option>
            {data.items.map((p) => (
              <option key={p.id} value={p.id}>
                {p.preferredName ?? p.legalName}
              </option>
            ))}
          </SelectField>
          {performerId ? <BookingForm key={performerId} performerId={performerId} productionId={productionId} defaultStartsAt={localInputValue(day, 9)} /> : null}
        </div>
      )}
    </QueryView>
  );
}
