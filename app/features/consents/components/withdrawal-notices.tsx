import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { BOOKING_PURPOSE_LABELS } from '#shared/domain/bookings.ts';
import { CONSENT_KIND_LABELS } from '#shared/domain/consent.ts';
import type { WithdrawalNoticeList } from '#shared/schemas/consent-notices.ts';
import { Button } from '../../../components/ui/button.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { formatDate, formatDateTime } from '../../../lib/format.ts';
import { paths } from '../../../lib/paths.ts';
import { useMarkWithdrawalsSeen, withdrawalNoticesQueryOptions } from '../api.ts';
import { HealthWorklist } from './health-worklist.tsx';

/** Consent work that needs a look, on the home of a head (withdrawals) or the designated lead (withdrawals with reasons, health answers). */
export function ConsentWorkPanels({ productionId, isLead }: { productionId: string; isLead: boolean }) {
  return (
    <div className="flex flex-col gap-8">
      <WithdrawalNotices productionId={productionId} />
      {isLead ? <HealthWorklist productionId={productionId} /> : null}
    </div>
  );
}

export function WithdrawalNotices({ productionId }: { productionId: string }) {
  const notices = useQuery(withdrawalNoticesQueryOptions(productionId));
  const seen = useMarkWithdrawalsSeen();
  return (
    <QueryView query={notices} loadingLabel="Loading withdrawals…">
      {(data) => (
        <Section
          title="Withdrawn since you last looked"
          testId="withdrawals-section"
          actions={
            data.items.length ? (
              <Button variant="secondary" pending={seen.isPending} pendingLabel="Marking…" onClick={() => seen.mutate({ productionId, seenAt: data.readAt })}>
                Mark these as seen
              </Button>
            ) : undefined
          }
        >
          <p className="text-ink-700">Since {formatDateTime(data.since)}.</p>
          {seen.error ? <ErrorBanner error={seen.error} /> : null}
          {data.items.length === 0 ? <EmptyState title="No consent was withdrawn since you last looked." /> : <WithdrawalList data={data} />}
        </Section>
      )}
    </QueryView>
  );
}

function WithdrawalList({ data }: { data: WithdrawalNoticeList }) {
  return (
    <ul className="flex flex-col gap-3" aria-label="Withdrawn consents">
      {data.items.map((w) => (
        <li key={w.consentId} className="flex flex-col gap-2 rounded-xl border border-sand-300 bg-white p-4" data-testid="withdrawal-notice">
          <p className="text-lg">
            <Link to={paths.performer.href(w.performerId)} className="inline-flex min-h-11 items-center font-semibold">
              {w.performerName}
            </Link>{' '}
            withdrew their {CONSENT_KIND_LABELS[w.kind].toLowerCase()} consent{' '}
            <Link to={paths.consent.href(w.consentId)} className="font-semibold">
              {w.title}
            </Link>{' '}
            on <time dateTime={w.withdrawnAt}>{formatDate(w.withdrawnAt)}</time>.
          </p>
          {data.reasonsShown ? (
            <p className="text-ink-900" data-testid="withdrawal-reason">
              <span className="font-semibold">Reason given:</span> {w.reason ?? 'none given'}
            </p>
          ) : null}
          {w.sessionsAffected.length ? (
            <div>
              <p className="font-semibold text-brick-700">Upcoming sessions now waiting for consent:</p>
              <ul className="ml-5 list-disc">
                {w.sessionsAffected.map((b) => (
                  <li key={b.id}>
                    {BOOKING_PURPOSE_LABELS[b.purpose]}, <time dateTime={b.startsAt}>{formatDateTime(b.startsAt)}</time>
                    {b.location ? `, ${b.location}` : ''}
                  </li>
                ))}
              </ul>
            </div>
          ) : (
            <p className="text-ink-700">No upcoming session depends on it.</p>
          )}
        </li>
      ))}
    </ul>
  );
}
