import { useQuery } from '@tanstack/react-query';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { plural } from '../../../lib/format.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { queryClient } from '../../../lib/query-client.ts';
import { seatProduction } from '../../../lib/session/seat-production.ts';
import { sessionQueryOptions } from '../../../lib/session/api.ts';
import { seatCan } from '../../../lib/session/seat.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { bookingsQueryOptions } from '../api.ts';
import { BookingsTable } from '../components/bookings-table.tsx';
import { SessionCalendar } from '../components/session-calendar.tsx';

export async function bookingsLoader() {
  const session = await queryClient.ensureQueryData(sessionQueryOptions()).catch(() => undefined);
  const productionId = session?.current?.productionId;
  if (productionId) await prefetchFor('performers.view', bookingsQueryOptions(productionId));
  return null;
}

/** The acting production's sessions from now on, with the ones whose consent will not be in force flagged. */
export function BookingsPage() {
  const session = useSession();
  const production = seatProduction(session);
  return (
    <>
      <PageHeading
        title="Sessions"
        lead={production ? `Patch tests, life casts and applications booked on ${production.name}. Book from the calendar or from the performer’s page.` : undefined}
      >
        Sessions
      </PageHeading>
      {production ? (
        <div className="flex flex-col gap-8">
          <Section title="Calendar" testId="calendar-section">
            <SessionCalendar productionId={production.id} canBook={seatCan(session, 'sessions.book')} />
          </Section>
          <Bookings productionId={production.id} canCancel={seatCan(session, 'patchtests.book')} />
        </div>
      ) : (
        <p className="text-ink-700">Switch “Acting as” to a production.</p>
      )}
    </>
  );
}

function Bookings({ productionId, canCancel }: { productionId: string; canCancel: boolean }) {
  const bookings = useQuery(bookingsQueryOptions(productionId));
  return (
    <QueryView query={bookings} loadingLabel="Loading sessions…">
      {(data) => {
        const missing = data.items.filter((b) => b.status === 'booked' && b.consentMissing).length;
        return (
          <Section title="Upcoming" testId="bookings-section">
            {data.items.length === 0 ? (
              <EmptyState title="No sessions booked from now on." />
            ) : (
              <>
                <p className={missing ? 'font-semibold text-brick-700' : 'text-ink-700'}>
                  {missing === 1 ? 'One session is waiting for consent.' : missing ? `${plural(missing, 'session', 'sessions')} are waiting for consent.` : 'Every booked session has the consent it needs.'}
                </p>
                <BookingsTable bookings={data.items} caption="Upcoming sessions" showPerformer canCancel={canCancel} />
              </>
            )}
          </Section>
        );
      }}
    </QueryView>
  );
}
