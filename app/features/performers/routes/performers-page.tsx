import { useQuery } from '@tanstack/react-query';
import { Link, type LoaderFunctionArgs } from 'react-router-dom';
import { actionsOfRole } from '#shared/policy.ts';
import { PERFORMER_CONSENT_FILTERS, PERFORMER_CONSENT_FILTER_LABELS, type PerformerListItem } from '#shared/schemas/performers.ts';
import type { Session } from '#shared/schemas/session.ts';
import { buttonClasses, ButtonLink } from '../../../components/ui/button.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { Pager } from '../../../components/ui/pager.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { SortHeader, Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { parseListParams, useDebouncedSearch, useListParams } from '../../../lib/list-params.ts';
import { paths, serverPaths } from '../../../lib/paths.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { queryClient } from '../../../lib/query-client.ts';
import { sessionQueryOptions } from '../../../lib/session/api.ts';
import { seatCan } from '../../../lib/session/seat.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { PerformerListParamsSchema, performerQueryFor, performersQueryOptions, type PerformerListParams } from '../api.ts';
import { ConsentKey, ConsentKinds } from '../components/consent-kinds.tsx';
import { FullName, Thumbnail, displayName } from '../components/names.tsx';

export async function performersLoader({ request }: LoaderFunctionArgs) {
  const params = parseListParams(PerformerListParamsSchema, new URL(request.url).searchParams);
  const session = await queryClient.ensureQueryData(sessionQueryOptions()).catch(() => undefined);
  if (session) await prefetchFor('performers.view', performersQueryOptions(performerQueryFor(params, session.current?.productionId ?? null)));
  return null;
}

/** Productions the person sees performers on, through any of their seats (for the production filter). */
function viewableProductions(session: Session): { id: string; name: string }[] {
  const seen = new Map<string, string>();
  for (const seat of session.seats) {
    if (seat.productionId && actionsOfRole(seat.role).has('performers.view')) seen.set(seat.productionId, seat.productionName ?? 'Untitled production');
  }
  return [...seen].map(([id, name]) => ({ id, name }));
}

type SortChoice = `${PerformerListParams['sort']}:${PerformerListParams['dir']}`;
const SORT_CHOICES: { value: SortChoice; label: string }[] = [
  { value: 'name:asc', label: 'Name, A to Z' },
  { value: 'name:desc', label: 'Name, Z to A' },
  { value: 'createdAt:desc', label: 'Newest first' },
  { value: 'createdAt:asc', label: 'Oldest first' },
];

export function PerformersPage() {
  const session = useSession();
  const [params, setParams] = useListParams(PerformerListParamsSchema);
  const seatProductionId = session.current?.productionId ?? null;
  const query = performerQueryFor(params, seatProductionId);
  const performers = useQuery(performersQueryOptions(query));
  const [search, setSearch] = useDebouncedSearch(params.q ?? '', (q) => setParams({ q }, { resetPage: true }));
  const productions = viewableProductions(session);
  const canManage = seatCan(session, 'performers.manage');
  const filtered = Boolean(params.q) || params.consent !== 'any';
  const productionValue = params.productionId ?? seatProductionId ?? 'all';

  const exportHref = serverPaths.performersCsv({
    q: query.q || undefined,
    productionId: query.productionId,
    consent: query.consent === 'any' ? undefined : query.consent,
    sort: query.sort,
    dir: query.dir,
  });

  return (
    <>
      <PageHeading
        title="Performers"
        lead="Everyone engaged on your productions, with the consents they have in force."
        actions={
          canManage ? (
            <>
              <ButtonLink to={paths.newPerformer.href()} data-testid="add-performer">
                Add performer
              </ButtonLink>
              <ButtonLink variant="secondary" to={paths.importPerformers.href()}>
                Import CSV
              </ButtonLink>
            </>
          ) : undefined
        }
      >
        Performers
      </PageHeading>

      <Section
        title="Registry"
        actions={
          // A plain link: the browser downloads the file the server writes for exactly these filters.
          <a href={exportHref} download="performers.csv" className={buttonClasses('secondary')} data-testid="export-csv">
            Export CSV
          </a>
        }
      >
        <search aria-label="Find performers">
          <form className="grid gap-4 md:grid-cols-2 lg:grid-cols-4" onSubmit={(e) => e.preventDefault()}>
            <TextField
              label="Search by name"
              type="search"
              hint="Legal or preferred name; close spellings match too."
              value={search}
              onChange={(e) => setSearch(e.target.value)}
              className="md:col-span-2 lg:col-span-1"
              data-testid="performers-search"
            />
            <SelectField
              label="Production"
              value={productionValue}
              onChange={(e) => setParams({ productionId: e.target.value === seatProductionId ? undefined : (e.target.value as PerformerListParams['productionId']) }, { resetPage: true })}
              data-testid="performers-production"
            >
              {productions.map((p) => (
                <option key={p.id} value={p.id}>
                  {p.name}
                </option>
              ))}
              {productions.length > 1 ? <option value="all">All my productions</option> : null}
            </SelectField>
            <SelectField
              label="Consent status"
              value={params.consent}
              onChange={(e) => setParams({ consent: e.target.value as PerformerListParams['consent'] }, { resetPage: true })}
              data-testid="performers-consent"
            >
              {PERFORMER_CONSENT_FILTERS.map((f) => (
                <option key={f} value={f}>
                  {PERFORMER_CONSENT_FILTER_LABELS[f]}
                </option>
              ))}
            </SelectField>
            <SelectField
              label="Order"
              value={`${params.sort}:${params.dir}`}
              onChange={(e) => {
                const [sort, dir] = e.target.value.split(':') as [PerformerListParams['sort'], PerformerListParams['dir']];
                setParams({ sort, dir }, { resetPage: true });
              }}
            >
              {SORT_CHOICES.map((c) => (
                <option key={c.value} value={c.value}>
                  {c.label}
                </option>
              ))}
            </SelectField>
          </form>
        </search>
        <ConsentKey />
        <QueryView query={performers} loadingLabel="Loading performers…">
          {(data) => (
            <>
              {data.items.length === 0 ? (
                <EmptyState title={filtered ? 'No performer matches these filters.' : 'No performers yet.'}>
                  {filtered ? 'Try another spelling, or choose “Any consent status”.' : canManage ? 'Add the first one, or import a CSV.' : null}
                </EmptyState>
              ) : (
                <PerformerTable
                  items={data.items}
                  sort={params.sort}
                  dir={params.dir}
                  busy={performers.isPlaceholderData}
                  onSort={(sort, dir) => setParams({ sort, dir }, { resetPage: true })}
                  productionId={query.productionId}
                />
              )}
              <Pager page={data.page} pageSize={data.pageSize} total={data.total} noun="performers" onPage={(page) => setParams({ page }, { push: true })} />
            </>
          )}
        </QueryView>
      </Section>
    </>
  );
}

interface PerformerTableProps {
  items: PerformerListItem[];
  sort: PerformerListParams['sort'];
  dir: PerformerListParams['dir'];
  busy: boolean;
  onSort: (sort: PerformerListParams['sort'], dir: PerformerListParams['dir']) => void;
  /** The production filtered on: its part is the one shown; otherwise every part with its production. */
  productionId: string | undefined;
}

function PerformerTable({ items, sort, dir, busy, onSort, productionId }: PerformerTableProps) {
  return (
    <Table caption="Performers" captionHidden busy={busy} testId="performers-table">
      <Thead>
        <tr>
          <Th>
            <span className="sr-only">Portrait</span>
          </Th>
          <SortHeader label="Name" sortKey="name" sort={sort} dir={dir} onSort={onSort} />
          <Th>Pronouns</Th>
          <Th>Character</Th>
          <Th>Consents</Th>
        </tr>
      </Thead>
      <tbody>
        {items.map((p) => {
          const parts = p.engagements.filter((e) => !productionId || e.productionId === productionId);
          return (
            <Tr key={p.id}>
              <Td className="w-16">
                <Thumbnail url={p.thumbnailUrl} name={displayName(p)} />
              </Td>
              <Td>
                <Link to={paths.performer.href(p.id)} className="inline-flex min-h-11 items-center font-semibold" data-testid="performer-link">
                  <span>
                    <FullName performer={p} />
                  </span>
                </Link>
              </Td>
              <Td>{p.pronouns ?? <span className="text-ink-600">Not given</span>}</Td>
              <Td>
                {parts.length === 0 ? (
                  <span className="text-ink-600">None recorded</span>
                ) : (
                  <ul className="flex flex-col">
                    {parts.map((e) => (
                      <li key={e.productionId}>
                        {e.characterName ?? <span className="text-ink-600">No part named</span>}
                        {!productionId ? <span className="block text-sm text-ink-700">{e.productionName}</span> : null}
                      </li>
                    ))}
                  </ul>
                )}
              </Td>
              <Td>
                <ConsentKinds performer={p} />
              </Td>
            </Tr>
          );
        })}
      </tbody>
    </Table>
  );
}
