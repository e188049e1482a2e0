import { useState } from 'react';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { TEST_STATUS_LABELS } from '#shared/domain/reading-schedule.ts';
import { ButtonLink } from '../../../components/ui/button.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { Pager } from '../../../components/ui/pager.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { StatusBadge } from '../../../components/ui/status-badge.tsx';
import { formatDateTime, formatNumber } from '../../../lib/format.ts';
import { paths } from '../../../lib/paths.ts';
import { performerPatchTestsQueryOptions } from '../api.ts';
import { ScreeningLabel } from './cautions.tsx';
import { ClearanceBadge } from './clearance-badge.tsx';
import { ClearanceTable } from './clearance-table.tsx';

/**
 * The "Patch tests and clearances" section of a performer's record: a timeline of tests, newest first,
 * and the clearance of each product that matters for this performer.
 */
export function PerformerPatchTests({ performerId, isSelf }: { performerId: string; isSelf: boolean }) {
  // The pages of the timeline and of the shared-ingredient Cautions shown; the rest of the answer is the same on every page.
  const [testsPage, setTestsPage] = useState(1);
  const [sharedPage, setSharedPage] = useState(1);
  const query = useQuery({ ...performerPatchTestsQueryOptions(performerId, { testsPage, sharedPage }), placeholderData: keepPreviousData });
  return (
    <QueryView query={query} loadingLabel="Loading patch tests…">
      {(data) => (
        <Section
          title="Patch tests and clearances"
          testId="patch-tests-section"
          actions={
            data.canBook ? (
              <ButtonLink variant="secondary" to={paths.bookPatchTest.href(performerId)}>
                Book a patch test
              </ButtonLink>
            ) : null
          }
        >
          <ScreeningLabel />
          {data.medical && data.tests.total > 0 ? (
            <a href={`/api/performers/${encodeURIComponent(performerId)}/patch-tests/summary.pdf`} className="inline-flex min-h-11 w-fit items-center font-semibold">
              Printable result summary (PDF)
            </a>
          ) : null}
          {data.tests.total === 0 ? (
            <EmptyState title={isSelf ? 'You have not been patch tested yet.' : 'No patch test booked yet.'}>Tests and what they clear appear here.</EmptyState>
          ) : (
            <ol className="flex flex-col divide-y divide-sand-200" aria-label="Patch tests, newest first">
              {data.tests.items.map((t) => (
                <li key={t.id} className="flex flex-wrap items-center gap-3 py-2">
                  <Link to={paths.patchTest.href(t.id)} className="inline-flex min-h-11 items-center font-semibold">
                    {t.protocolName}, {formatDateTime(t.appliedAt ?? t.startsAt)}
                  </Link>
                  <StatusBadge tone={t.status === 'applied' ? 'accent' : t.status === 'cancelled' ? 'neutral' : t.status === 'closed' ? 'good' : 'neutral'}>{TEST_STATUS_LABELS[t.status]}</StatusBadge>
                  {t.consentMissing ? <StatusBadge tone="warning">Needs consent</StatusBadge> : null}
                  <span className="text-ink-700">
                    {t.productCount} product{t.productCount === 1 ? '' : 's'}
                    {t.location ? `, ${t.location}` : ''}
                  </span>
                </li>
              ))}
            </ol>
          )}
          {data.tests.total > data.tests.pageSize ? <Pager page={data.tests.page} pageSize={data.tests.pageSize} total={data.tests.total} noun="patch tests" onPage={setTestsPage} /> : null}
          {data.clearances.length > 0 ? (
            <ClearanceTable rows={data.clearances} medical={data.medical} performerId={performerId} canOverride={data.canOverride} />
          ) : null}
          {data.sharedCautions.total > 0 ? (
            <div className="flex flex-col gap-2" data-testid="shared-cautions">
              <h3 className="text-lg font-semibold text-graphite-900">
                <ClearanceBadge state="caution" /> {formatNumber(data.sharedCautions.total)} more {data.sharedCautions.total === 1 ? 'product shares' : 'products share'} an ingredient with a product that reacted
              </h3>
              <p className="max-w-prose text-ink-700">
                None of these has been tested on {isSelf ? 'you' : 'this performer'}. Each lists a non-trivial ingredient that a product which reacted also lists, so it may cause the same reaction: patch test it before use, and ask the designated lead.
              </p>
              <ClearanceTable
                rows={data.sharedCautions.items}
                medical={data.medical}
                performerId={performerId}
                canOverride={data.canOverride}
                caption="Products sharing an ingredient with a product that reacted"
                testId="shared-cautions-table"
              />
              <Pager page={data.sharedCautions.page} pageSize={data.sharedCautions.pageSize} total={data.sharedCautions.total} noun="products" onPage={setSharedPage} />
            </div>
          ) : null}
          {/* A product missing from the list is not a silence to read as "no problem". */}
          <p className="flex max-w-prose flex-wrap items-center gap-2 rounded-xl border-l-4 border-slate-700 bg-plaster-100 p-3 font-semibold text-graphite-900" data-testid="untested-note">
            <span>
              {data.clearances.length + data.sharedCautions.total > 0 ? 'Any product not listed here is' : 'No product has a clearance yet: every product is'} <ClearanceBadge state="untested" /> for {isSelf ? 'you' : 'this performer'}
              {' '}and must be treated as untested: patch test it before first use.
            </span>
          </p>
          {!data.medical ? <p className="text-sm text-ink-700">Grades, notes and photos are health details: only the designated lead and the performer see them.</p> : null}
        </Section>
      )}
    </QueryView>
  );
}
