import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { SKIN_CHECK_OUTCOME_LABELS } from '#shared/domain/applications.ts';
import { CLEARANCE_STATE_LABELS } from '#shared/domain/clearance.ts';
import { buttonClasses } from '../../../components/ui/button.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { formatDateTime } from '../../../lib/format.ts';
import { paths } from '../../../lib/paths.ts';
import { applicationsQueryOptions, incidentsQueryOptions, leadRequestsQueryOptions, waitingChecksQueryOptions } from '../api.ts';
import { localDate } from './local-time.ts';

const runCheck = (
  <Link className={buttonClasses('primary')} to={paths.check.href()}>
    Run a check
  </Link>
);

/**
 * How many entries the role's own home panels hold (the artist's applications and waiting checks,
 * the lead's incidents and requests), or undefined while they load: the home says "nothing needs
 * doing" only when these are empty too. The queries are the panels' own, so they are fetched once.
 */
export function useHomePanelEntries(role: string, productionId: string | null | undefined): number | undefined {
  const [today] = useState(() => localDate(new Date()));
  const id = productionId ?? '';
  const artist = role === 'artist' && id !== '';
  const lead = role === 'lead' && id !== '';
  const applications = useQuery({ ...applicationsQueryOptions(id, today), enabled: artist });
  const waiting = useQuery({ ...waitingChecksQueryOptions(id), enabled: artist });
  const incidents = useQuery({ ...incidentsQueryOptions(id, 'open'), enabled: lead });
  const requests = useQuery({ ...leadRequestsQueryOptions(id, 'waiting'), enabled: lead });
  const panels = artist ? [applications, waiting] : lead ? [incidents, requests] : [];
  if (panels.some((q) => q.data === undefined)) return undefined;
  return panels.reduce((sum, q) => sum + (q.data?.items.length ?? 0), 0);
}

/** The artist's home: today's applications on the production, and checks waiting on the lead. */
export function ArtistHome({ productionId }: { productionId: string }) {
  const [today] = useState(() => localDate(new Date()));
  const applications = useQuery(applicationsQueryOptions(productionId, today));
  const waiting = useQuery(waitingChecksQueryOptions(productionId));
  return (
    <>
      <Section title="Today’s applications" testId="home-applications" actions={runCheck}>
        <QueryView query={applications} loadingLabel="Loading today’s applications…">
          {(data) =>
            data.items.length === 0 ? (
              <EmptyState title="No applications logged today." action={runCheck} />
            ) : (
              <ul className="flex flex-col gap-2">
                {data.items.map((a) => (
                  <li key={a.id}>
                    <Link className="font-semibold underline" to={paths.application.href(a.id)}>
                      {a.performerName}
                      {a.description ? `: ${a.description}` : ''}
                    </Link>{' '}
                    <span className="text-ink-700">
                      · {a.artistName ?? '—'} · {a.endedAt ? (a.skinChecked ? 'removed, skin checked' : 'removed, skin check to do') : 'on now'}
                    </span>
                  </li>
                ))}
              </ul>
            )
          }
        </QueryView>
      </Section>
      <Section title="Checks waiting on the lead" testId="home-waiting-checks">
        <QueryView query={waiting} loadingLabel="Loading…">
          {(data) =>
            data.items.length === 0 ? (
              <p className="text-ink-700">No check is waiting on the lead.</p>
            ) : (
              <ul className="flex flex-col gap-2">
                {data.items.map((r) => (
                  <li key={r.id}>
                    <Link className="font-semibold underline" to={paths.check.href({ checkId: r.checkId })}>
                      {r.performerName}: {r.productName} ({CLEARANCE_STATE_LABELS[r.stateAtRequest]})
                    </Link>{' '}
                    <span className="text-ink-700">asked {formatDateTime(r.requestedAt)}</span>
                  </li>
                ))}
              </ul>
            )
          }
        </QueryView>
      </Section>
    </>
  );
}

/** The lead's home: open incidents and requests waiting for an answer. */
export function LeadHome({ productionId }: { productionId: string }) {
  const incidents = useQuery(incidentsQueryOptions(productionId, 'open'));
  const requests = useQuery(leadRequestsQueryOptions(productionId, 'waiting'));
  return (
    <>
      <Section title="Open incidents" testId="home-incidents">
        <QueryView query={incidents} loadingLabel="Loading incidents…">
          {(data) =>
            data.items.length === 0 ? (
              <p className="text-ink-700">No open incident.</p>
            ) : (
              <ul className="flex flex-col gap-2">
                {data.items.map((i) => (
                  <li key={i.id}>
                    <Link className="font-semibold underline" to={paths.incident.href(i.id)}>
                      {i.performerName}: {SKIN_CHECK_OUTCOME_LABELS[i.outcome]}
                    </Link>{' '}
                    <span className="text-ink-700">reported {formatDateTime(i.reportedAt)}</span>
                  </li>
                ))}
              </ul>
            )
          }
        </QueryView>
      </Section>
      <Section title="Requests waiting for your answer" testId="home-requests">
        <QueryView query={requests} loadingLabel="Loading requests…">
          {(data) =>
            data.items.length === 0 ? (
              <p className="text-ink-700">No request is waiting.</p>
            ) : (
              <ul className="flex flex-col gap-2">
                {data.items.map((r) => (
                  <li key={r.id}>
                    <Link className="font-semibold underline" to={paths.leadRequest.href(r.id)}>
                      {r.performerName}: {r.productName} ({CLEARANCE_STATE_LABELS[r.stateAtRequest]})
                    </Link>{' '}
                    <span className="text-ink-700">from {r.requestedByName ?? 'an artist'}, {formatDateTime(r.requestedAt)}</span>
                  </li>
                ))}
              </ul>
            )
          }
        </QueryView>
      </Section>
    </>
  );
}
