import { useQuery } from '@tanstack/react-query';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { READING_STATUS_LABELS, TEST_STATUS_LABELS } from '#shared/domain/reading-schedule.ts';
import { TEST_KIND_LABELS } from '#shared/domain/protocols.ts';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { StatusBadge } from '../../../components/ui/status-badge.tsx';
import { Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { formatDateTime } from '../../../lib/format.ts';
import { paths } from '../../../lib/paths.ts';
import { queryClient } from '../../../lib/query-client.ts';
import { seatCan } from '../../../lib/session/seat.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { patchTestQueryOptions } from '../api.ts';
import { PatchTestCautions, ScreeningLabel } from '../components/cautions.tsx';
import { ReadingGrid } from '../components/reading-grid.tsx';
import { ReadingsResults } from '../components/readings-results.tsx';
import { TestActions } from '../components/test-actions.tsx';

export function patchTestLoader({ params }: LoaderFunctionArgs) {
  void queryClient.prefetchQuery(patchTestQueryOptions(params.id ?? ''));
  return null;
}

/** One patch test: when it is read, what it was read as (lead and performer), and the next step. */
export function PatchTestPage() {
  const { id = '' } = useParams();
  const query = useQuery(patchTestQueryOptions(id));
  const session = useSession();
  const canRecord = seatCan(session, 'patchtests.record');
  return (
    <QueryView query={query} loadingLabel="Loading the test…">
      {(test) => (
        <div className="flex flex-col gap-6">
          <PageHeading
            title={`Patch test: ${test.performerName}`}
            lead={
              <span className="flex flex-wrap items-center gap-2">
                <StatusBadge tone={test.status === 'applied' ? 'accent' : 'neutral'}>{TEST_STATUS_LABELS[test.status]}</StatusBadge>
                {test.consentMissing ? <StatusBadge tone="warning">Needs consent</StatusBadge> : null}
                <span>
                  {test.protocolName}{test.protocolName === TEST_KIND_LABELS[test.testKind] ? '' : ` (${TEST_KIND_LABELS[test.testKind]})`}, {formatDateTime(test.startsAt)}
                  {test.location ? `, ${test.location}` : ''}
                </span>
              </span>
            }
          >
            Patch test: {test.performerName}
          </PageHeading>
          <ScreeningLabel />
          {test.consentMissing ? (
            <p className="rounded-xl bg-amber-100 p-4 font-semibold text-amber-800">
              There is no patch-testing consent in force for this production yet; the test cannot be applied until the performer signs one.{' '}
              <Link to={paths.performer.href(test.performerId)} className="inline-flex min-h-11 items-center underline">
                Send the form from {test.performerName}’s record
              </Link>
            </p>
          ) : null}
          <PatchTestCautions solvents />
          <Section title="Next step">
            <TestActions test={test} />
            <p className="text-ink-700">
              Applied: {test.appliedAt ? formatDateTime(test.appliedAt) : 'not yet'} · Patches off: {test.removedAt ? formatDateTime(test.removedAt) : 'not recorded'}
            </p>
          </Section>
          <Section title="Reading schedule">
            <Table caption="Reading schedule" captionHidden>
              <Thead>
                <Tr>
                  <Th>Reading</Th>
                  <Th>Day</Th>
                  <Th>Opens</Th>
                  <Th>Due</Th>
                  <Th>Closes</Th>
                  <Th>State</Th>
                </Tr>
              </Thead>
              <tbody>
                {test.schedule.map((s) => (
                  <Tr key={s.pointId}>
                    <Td className="font-semibold">{s.label}</Td>
                    <Td>{s.dayLabel}</Td>
                    <Td>{formatDateTime(s.opensAt)}</Td>
                    <Td>
                      {formatDateTime(s.dueAt)}
                      {s.estimated ? ' (estimated)' : ''}
                    </Td>
                    <Td>{formatDateTime(s.closesAt)}</Td>
                    <Td>{test.status === 'applied' || s.status === 'done' ? READING_STATUS_LABELS[s.status] : TEST_STATUS_LABELS[test.status]}</Td>
                  </Tr>
                ))}
              </tbody>
            </Table>
          </Section>
          {canRecord && test.status === 'applied' ? (
            <Section title="Record a reading">
              <ReadingGrid test={test} />
            </Section>
          ) : null}
          <Section title="Readings">
            {test.medical ? (
              <ReadingsResults test={test} canRecord={canRecord && test.status !== 'cancelled'} />
            ) : (
              <ul className="flex flex-col gap-1">
                {test.products.map((p) => (
                  <li key={p.id}>
                    <span className="font-semibold">{p.site}</span>: {p.productName}, lot {p.lotCode} — {p.readPointIds.length} reading{p.readPointIds.length === 1 ? '' : 's'} taken
                  </li>
                ))}
                <li className="text-sm text-ink-700">Grades, notes and photos are health details: only the designated lead and the performer see them.</li>
              </ul>
            )}
          </Section>
        </div>
      )}
    </QueryView>
  );
}
