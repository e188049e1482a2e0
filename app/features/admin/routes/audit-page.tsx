import { useQuery } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { AuditQuerySchema, type AuditEntry } from '#shared/schemas/admin.ts';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { Pager } from '../../../components/ui/pager.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { SortHeader, Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { AUDIT_ACTION_LABELS, auditActionLabel } from '#shared/domain/audit.ts';
import { detailWords, humanize, recordWords } from '../components/audit-words.ts';

/** Every event, in words, alphabetically: the filter asks "what happened", never for a code. */
const ACTION_CHOICES = Object.entries(AUDIT_ACTION_LABELS).sort((a, b) => a[1].localeCompare(b[1]));
import { formatDateTime } from '../../../lib/format.ts';
import { parseListParams, useDebouncedSearch, useListParams } from '../../../lib/list-params.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { auditQueryOptions } from '../api.ts';

export async function auditLoader({ request }: LoaderFunctionArgs) {
  const query = parseListParams(AuditQuerySchema, new URL(request.url).searchParams);
  await prefetchFor('audit.read', auditQueryOptions(query));
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

export function AuditPage() {
  const [query, setQuery] = useListParams(AuditQuerySchema);
  const audit = useQuery(auditQueryOptions(query));
  const [search, setSearch] = useDebouncedSearch(query.q ?? '', (q) => setQuery({ q }, { resetPage: true }));
  const [action, setAction] = useDebouncedSearch(query.action ?? '', (a) => setQuery({ action: a }, { resetPage: true }));
  const filtered = Boolean(query.q || query.action);

  return (
    <>
      <PageHeading title="Audit log" lead="Who did what, and when. Entries cannot be changed or removed.">
        Audit log
      </PageHeading>
      <search aria-label="Filter the audit log">
        <form className="grid gap-4 md:grid-cols-2" onSubmit={(e) => e.preventDefault()}>
        <TextField
          label="Person"
          type="search"
          value={search}
          onChange={(e) => setSearch(e.target.value)}
          hint="A name (or, if you have one, the exact id of a record)."
          data-testid="audit-search"
        />
        <SelectField label="What happened" value={action} onChange={(e) => setAction(e.target.value)} data-testid="audit-action">
          <option value="">Anything</option>
          {ACTION_CHOICES.map(([code, words]) => (
            <option key={code} value={code}>
              {words}
            </option>
          ))}
        </SelectField>
      </form>
      </search>
      <QueryView query={audit} loadingLabel="Loading the audit log…">
        {(data) => (
          <div className="flex flex-col">
            {data.items.length === 0 ? (
              <EmptyState title={filtered ? 'No entries match these filters.' : 'Nothing has been recorded yet.'} />
            ) : (
              <Table caption="Audit entries" busy={audit.isPlaceholderData} testId="audit-table">
                <Thead>
                  <tr>
                    <SortHeader label="Time" sortKey="at" sort={query.sort} dir={query.dir} onSort={(sort, dir) => setQuery({ sort, dir }, { resetPage: true })} />
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
                        {e.subjectName ? <span className="block text-sm text-graphite-700">of {e.subjectName}</span> : null}
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
            <Pager page={data.page} pageSize={data.pageSize} total={data.total} noun="entries" onPage={(page) => setQuery({ page }, { push: true })} />
          </div>
        )}
      </QueryView>
    </>
  );
}
