import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import type { RetentionList } from '#shared/schemas/archive.ts';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { paths } from '../../../lib/paths.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { retentionQueryOptions } from '../api.ts';
import { CastStatusBadge, castTitle, RetentionBadge } from '../components/cast-status.tsx';

export async function retentionLoader() {
  await prefetchFor('archive.view', retentionQueryOptions());
  return null;
}

function RetentionTable({ rows, caption }: { rows: RetentionList['due']; caption: string }) {
  return (
    <Table caption={caption} captionHidden testId="retention-table">
      <Thead>
        <tr>
          <Th>Cast</Th>
          <Th>Why</Th>
          <Th>Now</Th>
        </tr>
      </Thead>
      <tbody>
        {rows.map(({ cast: c, retention }) => (
          <Tr key={c.id}>
            <Td>
              <Link to={paths.cast.href(c.id)} className="inline-flex min-h-11 flex-col justify-center font-semibold">
                <span>{castTitle(c)}</span>
                <span className="font-mono text-sm font-normal">{c.labelCode}</span>
              </Link>
              <span className="block text-sm text-ink-700">
                {c.performerName} · {c.productionName}
              </span>
            </Td>
            <Td className="max-w-md">
              <RetentionBadge state={retention.state} />
              <span className="mt-1 block">{retention.reason}</span>
            </Td>
            <Td>
              <CastStatusBadge status={c.status} overdue={c.overdue} />
              <span className="mt-1 block text-sm text-ink-700">{c.where}</span>
            </Td>
          </Tr>
        ))}
      </tbody>
    </Table>
  );
}

/** Casts the archive may no longer keep, and those whose consent ends soon; each opens to record its return or destruction. */
export function RetentionPage() {
  const list = useQuery(retentionQueryOptions());
  return (
    <>
      <PageHeading title="Retention" lead="A cast is kept while its performer’s storage consent for it stands. Open a cast to record its return to the performer or its destruction, with a witness.">
        Retention review
      </PageHeading>
      <QueryView query={list} loadingLabel="Loading the review…">
        {(data) => (
          <>
            <Section title="Due for return or destruction" testId="retention-due">
              {data.due.length === 0 ? <EmptyState title="Nothing is due." /> : <RetentionTable rows={data.due} caption="Casts due for return or destruction" />}
            </Section>
            <Section title="Consent ending soon" testId="retention-soon">
              {data.soon.length === 0 ? <EmptyState title="No storage consent ends in the next weeks." /> : <RetentionTable rows={data.soon} caption="Casts whose storage consent ends soon" />}
            </Section>
          </>
        )}
      </QueryView>
    </>
  );
}
