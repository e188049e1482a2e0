import { useQuery } from '@tanstack/react-query';
import { ROLE_LABELS, type ActingRole } from '#shared/policy.ts';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { homeQueryOptions } from '../api.ts';
import { StartActions } from '../components/start-actions.tsx';
import { TaskCard } from '../components/task-card.tsx';
import { ConsentWorkPanels } from '../../consents/index.ts';
import { ArtistHome, LeadHome, useHomePanelEntries } from '../../checks/index.ts';

/** One line on what this seat is for, so a person switching seats knows which hat they wear. */
const ROLE_INTROS: Record<ActingRole, string> = {
  admin: 'You decide who can use Plinth, on which production, and who is each production’s designated lead.',
  head: 'You run the department on this production: performers, consents, patch-test bookings and clearances.',
  lead: 'You are the designated lead: you alone read and record health details for this production.',
  artist: 'Check a performer’s clearance before you apply anything, and log what you used and any reaction.',
  archivist: 'You look after this production’s stored life casts and where they are kept.',
  performer: 'Here you can see what the department holds about you and what you have agreed to.',
};

export async function homeLoader() {
  await prefetchFor(null, homeQueryOptions());
  return null;
}

export function HomePage() {
  const session = useSession();
  const home = useQuery(homeQueryOptions());
  const role: ActingRole = home.data?.role ?? session.current?.role ?? 'performer';

  const performer = role === 'performer';
  // The artist's and the lead's panels below count as things to do: no "nothing needs doing" over them.
  const panelEntries = useHomePanelEntries(role, session.current?.productionId);

  return (
    <>
      <PageHeading
        title={performer ? 'Your record' : 'Today'}
        testId="home-heading"
        lead={ROLE_INTROS[role]}
        // A performer's own view uses no staff words: no role label beside the heading.
      >
        {performer ? (
          `Hello, ${session.user.displayName.split(' ')[0]}`
        ) : (
          <>
            Today <span className="text-2xl font-semibold text-graphite-600">· {ROLE_LABELS[role]}</span>
          </>
        )}
      </PageHeading>
      <QueryView query={home} loadingLabel="Loading today’s tasks…">
        {(data) => (
          <>
            {!performer && panelEntries === 0 && data.tasks.every((t) => t.count === 0) ? (
              <EmptyState title="Nothing needs doing today." action={<StartActions />}>
                Start from here:
              </EmptyState>
            ) : (
              <StartActions />
            )}
            {data.tasks.length > 0 ? (
              <ul aria-label={performer ? 'For you' : 'Today’s tasks'} className="grid gap-x-4 gap-y-4 sm:grid-cols-2 lg:grid-cols-3">
                {data.tasks.map((task) => (
                  <li key={task.id} className="row-span-4 grid grid-rows-subgrid">
                    <TaskCard task={task} />
                  </li>
                ))}
              </ul>
            ) : null}
          </>
        )}
      </QueryView>
      {(role === 'head' || role === 'lead') && home.data?.productionId ? (
        <div className="mt-8">
          <ConsentWorkPanels productionId={home.data.productionId} isLead={role === 'lead'} />
        </div>
      ) : null}
      {session.current?.productionId && role === 'artist' ? <ArtistHome productionId={session.current.productionId} /> : null}
      {session.current?.productionId && role === 'lead' ? <LeadHome productionId={session.current.productionId} /> : null}
    </>
  );
}
