import { useQuery } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { AuditQuerySchema, type AuditEntry } from '#shared/schemas/admin.ts';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { Pager } from '../../../components/ui/pager.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { SortHeader, Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { formatDateTime } from '../../../lib/format.ts';
import { parseListParams, useDebouncedSearch, useListParams } from '../../../lib/list-params.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { auditQueryOptions } from '../api.ts';

export async function auditLoader({ request }: LoaderFunctionArgs) {
  const query = parseListParams(AuditQuerySchema, new URL(request.url).searchParams);
  await prefetchFor('audit.read', auditQueryOptions(query));
  return null;
}

function detailValue(value: unknown): string {
  if (typeof value === 'string') return value;
  if (value === null || value === undefined) return String(value);
  return typeof value === 'object' ? JSON.stringify(value) : String(value);
}

/** Details as compact key=value pairs, one chip each, so long entries wrap between pairs. */
function Details({ details }: { details: AuditEntry['details'] }) {
  const entries = Object.entries(details);
  if (entries.length === 0) return <span className="text-ink-600">None</span>;
  return (
    <ul className="flex flex-wrap gap-1">
      {entries.map(([key, value]) => (
        <li key={key} className="rounded bg-sand-100 px-1.5 font-mono text-sm break-all text-ink-900">
          {key}={detailValue(value)}
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
          label="Person or record id"
          type="search"
          value={search}
          onChange={(e) => setSearch(e.target.value)}
          hint="A name, or the exact id of a record."
          data-testid="audit-search"
        />
        <TextField
          label="Action starts with"
          type="search"
          value={action}
          onChange={(e) => setAction(e.target.value)}
          hint="For example “production.” or “lead.appoint”."
          maxLength={80}
          data-testid="audit-action"
        />
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
                    <Th>Action</Th>
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
                      <Td>
                        <code className="font-mono text-sm">{e.action}</code>
                      </Td>
                      <Td>
                        <span className="font-semibold">{e.entityType}</span>
                        {e.entityId ? <span className="block font-mono text-sm break-all text-ink-700">{e.entityId}</span> : null}
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
