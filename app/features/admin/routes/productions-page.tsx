import { useQuery } from '@tanstack/react-query';
import { Link, type LoaderFunctionArgs } from 'react-router-dom';
import { PRODUCTION_KIND_LABELS, ProductionListQuerySchema } from '#shared/schemas/admin.ts';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { Pager } from '../../../components/ui/pager.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { StatusBadge } from '../../../components/ui/status-badge.tsx';
import { SortHeader, Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { formatNumber } from '../../../lib/format.ts';
import { parseListParams, useDebouncedSearch, useListParams } from '../../../lib/list-params.ts';
import { paths } from '../../../lib/paths.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { productionsQueryOptions } from '../api.ts';
import { DateRange } from '../components/date-range.tsx';
import { NewProductionForm } from '../components/new-production-form.tsx';

export async function productionsLoader({ request }: LoaderFunctionArgs) {
  const query = parseListParams(ProductionListQuerySchema, new URL(request.url).searchParams);
  await prefetchFor('productions.manage', productionsQueryOptions(query));
  return null;
}

export function ProductionsPage() {
  const [query, setQuery] = useListParams(ProductionListQuerySchema);
  const productions = useQuery(productionsQueryOptions(query));
  const [search, setSearch] = useDebouncedSearch(query.q ?? '', (q) => setQuery({ q }, { resetPage: true }));

  return (
    <>
      <PageHeading title="Productions" lead="Each production has its own team, and one designated lead who alone handles health details.">
        Productions
      </PageHeading>

      <Section title="All productions">
        <search aria-label="Find productions">
        <form className="max-w-xl" onSubmit={(e) => e.preventDefault()}>
          <TextField label="Search by name" type="search" value={search} onChange={(e) => setSearch(e.target.value)} data-testid="productions-search" />
        </form>
      </search>
        <QueryView query={productions} loadingLabel="Loading productions…">
          {(data) => (
            <>
              {data.items.length === 0 ? (
                <EmptyState title={query.q ? `No production matches “${query.q}”.` : 'No productions yet.'}>
                  {query.q ? null : 'Create the first one below.'}
                </EmptyState>
              ) : (
                <Table caption="Productions" captionHidden busy={productions.isPlaceholderData} testId="productions-table">
                  <Thead>
                    <tr>
                      <SortHeader label="Name" sortKey="name" sort={query.sort} dir={query.dir} onSort={(sort, dir) => setQuery({ sort, dir }, { resetPage: true })} />
                      <Th>Kind</Th>
                      <SortHeader label="Dates" sortKey="startsOn" sort={query.sort} dir={query.dir} onSort={(sort, dir) => setQuery({ sort, dir }, { resetPage: true })} />
                      <Th>Designated lead</Th>
                      <Th className="text-right">Team</Th>
                    </tr>
                  </Thead>
                  <tbody>
                    {data.items.map((p) => (
                      <Tr key={p.id}>
                        <Td>
                          <Link to={paths.production.href(p.id)} className="inline-flex min-h-11 items-center font-semibold">
                            {p.name}
                          </Link>
                        </Td>
                        <Td>{PRODUCTION_KIND_LABELS[p.kind]}</Td>
                        <Td>
                          <DateRange startsOn={p.startsOn} endsOn={p.endsOn} />
                        </Td>
                        <Td>{p.lead ? p.lead.displayName : <StatusBadge tone="warning">No designated lead</StatusBadge>}</Td>
                        <Td className="text-right">{formatNumber(p.memberCount)}</Td>
                      </Tr>
                    ))}
                  </tbody>
                </Table>
              )}
              <Pager page={data.page} pageSize={data.pageSize} total={data.total} noun="productions" onPage={(page) => setQuery({ page }, { push: true })} />
            </>
          )}
        </QueryView>
      </Section>

      <Section title="New production">
        <NewProductionForm />
      </Section>
    </>
  );
}
