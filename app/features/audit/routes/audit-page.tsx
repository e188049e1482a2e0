import { useQuery } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { auditActionLabel } from '#shared/domain/audit.ts';
import { AuditQuerySchema, type AuditEntry } from '#shared/schemas/audit.ts';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { Pager } from '../../../components/ui/pager.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { SortHeader, Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { formatDateTime } from '../../../lib/format.ts';
import { parseListParams, useListParams } from '../../../lib/list-params.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { queryClient } from '../../../lib/query-client.ts';
import { sessionQueryOptions } from '../../../lib/session/api.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { auditQueryFor, auditQueryOptions } from '../api.ts';
import { AuditFilters } from '../components/audit-filters.tsx';
import { detailWords, humanize, recordWords } from '../components/audit-words.ts';

export async function auditLoader({ request }: LoaderFunctionArgs) {
  const params = parseListParams(AuditQuerySchema, new URL(request.url).searchParams);
  const session = await queryClient.ensureQueryData(sessionQueryOptions()).catch(() => undefined);
  await prefetchFor('audit.review', auditQueryOptions(auditQueryFor(params, session)));
  return null;
}

/** Details in words, one line each; ids and empty values are left out (search by id still finds them). */
function Details({ details }: { details: AuditEntry['details'] }) {
  const entries = Object.entries(details).flatMap(([key, value]) => {
    const words = detailWords(value);
    return words === null ? [] : [[humanize(key), words] as const];
  });
  if (entries.length === 0) return <span className="text-graphite-600">None</span>;
  return (
    <ul className="flex flex-col gap-0.5 text-sm">
      {entries.map(([key, words]) => (
        <li key={key} className="break-words">
          <span className="font-semibold">{key}:</span> {words}
        </li>
      ))}
    </ul>
  );
}

/** Whose record an entry is about, with a way to show only that performer's entries. */
function SubjectLine({ entry, filtering, onFilter }: { entry: AuditEntry; filtering: boolean; onFilter: (performerId: string) => void }) {
  if (!entry.subjectPerformerId || filtering) return <span className="block text-sm text-graphite-700">of {entry.subjectName}</span>;
  const id = entry.subjectPerformerId;
  return (
    <span className="block text-sm text-graphite-700">
      of{' '}
      <button type="button" className="min-h-11 text-left text-verdigris-800 underline hover:bg-plaster-100" onClick={() => onFilter(id)} aria-label={`Only entries about ${entry.subjectName}`}>
        {entry.subjectName}
      </button>
    </span>
  );
}

export function AuditPage() {
  const session = useSession();
  const [params, setParams] = useListParams(AuditQuerySchema);
  const query = auditQueryFor(params, session);
  const audit = useQuery(auditQueryOptions(query));
  const seat = session.current;
  const leadProductionId = seat?.role === 'lead' ? seat.productionId : null;
  const isAdmin = seat?.role === 'admin';
  const filtered = Boolean(query.q || query.action || query.performer || query.from || query.to || (isAdmin && query.production));
  const performerName = query.performer ? (audit.data?.items.find((e) => e.subjectPerformerId === query.performer)?.subjectName ?? null) : null;

  return (
    <>
      <PageHeading
        title="Audit log"
        lead={
          leadProductionId
            ? `Who did what on ${seat?.productionName ?? 'this production'}, and when, including changes to its performers' own records. Entries cannot be changed or removed.`
            : 'Who did what, and when. Entries cannot be changed or removed.'
        }
      >
        Audit log
      </PageHeading>
      <AuditFilters
        query={query}
        onChange={(patch) => setParams(patch, { resetPage: true })}
        leadProductionId={leadProductionId}
        productionPicker={isAdmin}
        performerName={performerName}
      />
      <QueryView query={audit} loadingLabel="Loading the audit log…">
        {(data) => (
          <div className="flex flex-col">
            {data.items.length === 0 ? (
              <EmptyState title={filtered ? 'No entries match these filters.' : 'Nothing has been recorded yet.'} />
            ) : (
              <Table caption="Audit entries" busy={audit.isPlaceholderData} testId="audit-table">
                <Thead>
                  <tr>
                    <SortHeader label="Time" sortKey="at" sort={query.sort} dir={query.dir} onSort={(sort, dir) => setParams({ sort, dir }, { resetPage: true })} />
                    <Th>Who</Th>
                    <Th>What happened</Th>
                    <Th>Record</Th>
                    <Th>Details</Th>
                  </tr>
                </Thead>
                <tbody>
                  {data.items.map((e) => (
                    <Tr key={e.id}>
                      <Td className="whitespace-nowrap">
                        <time dateTime={e.at}>{formatDateTime(e.at)}</time>
                      </Td>
                      <Td>{e.actor ?? <span className="text-ink-600">System</span>}</Td>
                      <Td className="font-semibold">{auditActionLabel(e.action)}</Td>
                      <Td>
                        <span className="font-semibold">{recordWords(e.entityType)}</span>
                        {e.subjectName ? <SubjectLine entry={e} filtering={query.performer === e.subjectPerformerId} onFilter={(performer) => setParams({ performer }, { resetPage: true })} /> : null}
                        {e.productionName ? <span className="block text-sm text-graphite-700">on {e.productionName}</span> : null}
                      </Td>
                      <Td>
                        <Details details={e.details} />
                      </Td>
                    </Tr>
                  ))}
                </tbody>
              </Table>
            )}
            <Pager page={data.page} pageSize={data.pageSize} total={data.total} noun="entries" onPage={(page) => setParams({ page }, { push: true })} />
          </div>
        )}
      </QueryView>
    </>
  );
}
