import { useQuery } from '@tanstack/react-query';
import { BODY_REGIONS, BODY_REGION_LABELS, CAST_KINDS, CAST_KIND_LABELS, CAST_STATUSES, CAST_STATUS_LABELS } from '#shared/domain/archive-casts.ts';
import { CastListQuerySchema, type CastListQuery } from '#shared/schemas/archive.ts';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { buttonClasses, ButtonLink } from '../../../components/ui/button.tsx';
import { CheckboxField } from '../../../components/ui/checkbox-field.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { Pager } from '../../../components/ui/pager.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { parseListParams, useDebouncedSearch, useListParams } from '../../../lib/list-params.ts';
import { paths, serverPaths } from '../../../lib/paths.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { seatCan } from '../../../lib/session/seat.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { castsQueryOptions } from '../api.ts';
import { CastTable } from '../components/cast-table.tsx';
import { LabelScanner } from '../components/label-scanner.tsx';

/** The URL's state: the API's own query, so a link, the loader and the page ask for the same casts. */
const FindParamsSchema = CastListQuerySchema;

export async function findLoader({ request }: LoaderFunctionArgs) {
  await prefetchFor('archive.view', castsQueryOptions(parseListParams(FindParamsSchema, new URL(request.url).searchParams)));
  return null;
}

const SORTS: { value: `${CastListQuery['sort']}:${CastListQuery['dir']}`; label: string }[] = [
  { value: 'relevance:asc', label: 'Best match' },
  { value: 'performer:asc', label: 'Performer, A to Z' },
  { value: 'madeOn:desc', label: 'Newest first' },
  { value: 'madeOn:asc', label: 'Oldest first' },
  { value: 'labelCode:asc', label: 'Label code' },
];

const optional = <T extends string>(v: string) => (v === '' ? undefined : (v as T));

export function FindPage() {
  const session = useSession();
  const [params, setParams] = useListParams(FindParamsSchema);
  const casts = useQuery(castsQueryOptions(params));
  const [search, setSearch] = useDebouncedSearch(params.q ?? '', (q) => setParams({ q }, { resetPage: true }));
  const filtered = Boolean(params.q || params.region || params.kind || params.status || params.overdue);

  return (
    <>
      <PageHeading
        title="Find a cast"
        lead="Search the archive, or scan the label on a cast or a shelf with the tablet’s camera."
        actions={
          seatCan(session, 'casts.manage') ? (
            <ButtonLink to={paths.newCast.href()} data-testid="add-cast">
              Record a cast
            </ButtonLink>
          ) : undefined
        }
      >
        Find a cast
      </PageHeading>
      <LabelScanner />
      <Section title="Search the archive">
        <search aria-label="Find casts">
          <form className="grid gap-4 md:grid-cols-2 lg:grid-cols-3" onSubmit={(e) => e.preventDefault()}>
            <TextField
              label="Search"
              type="search"
              hint="Performer (close spellings match), production, region, kind, a shelf code such as R2, a path such as GH/NORTH/R1, or a label code."
              value={search}
              onChange={(e) => setSearch(e.target.value)}
              className="md:col-span-2 lg:col-span-3"
              data-testid="cast-search"
            />
            <SelectField label="Body region" value={params.region ?? ''} onChange={(e) => setParams({ region: optional(e.target.value) }, { resetPage: true })}>
              <option value="">Any region</option>
              {BODY_REGIONS.map((r) => (
                <option key={r} value={r}>
                  {BODY_REGION_LABELS[r]}
                </option>
              ))}
            </SelectField>
            <SelectField label="Kind" value={params.kind ?? ''} onChange={(e) => setParams({ kind: optional(e.target.value) }, { resetPage: true })}>
              <option value="">Any kind</option>
              {CAST_KINDS.map((k) => (
                <option key={k} value={k}>
                  {CAST_KIND_LABELS[k]}
                </option>
              ))}
            </SelectField>
            <SelectField label="Status" value={params.status ?? ''} onChange={(e) => setParams({ status: optional(e.target.value) }, { resetPage: true })}>
              <option value="">Any status</option>
              {CAST_STATUSES.map((s) => (
                <option key={s} value={s}>
                  {CAST_STATUS_LABELS[s]}
                </option>
              ))}
            </SelectField>
            <SelectField
              label="Order"
              value={`${params.sort}:${params.dir}`}
              onChange={(e) => {
                const [sort, dir] = e.target.value.split(':') as [CastListQuery['sort'], CastListQuery['dir']];
                setParams({ sort, dir }, { resetPage: true });
              }}
            >
              {SORTS.map((s) => (
                <option key={s.value} value={s.value}>
                  {s.label}
                </option>
              ))}
            </SelectField>
            <CheckboxField label="Only overdue check-outs and loans" checked={params.overdue === 'true'} onChange={(e) => setParams({ overdue: e.target.checked ? 'true' : undefined }, { resetPage: true })} />
          </form>
        </search>
        <QueryView query={casts} loadingLabel="Searching the archive…">
          {(data) => (
            <>
              {data.place ? (
                <p className="text-ink-700" data-testid="search-place">
                  Casts at {data.place.breadcrumb} <span className="font-mono">({data.place.path})</span> and below it.
                </p>
              ) : null}
              {data.items.length === 0 ? (
                <EmptyState title={filtered ? 'No cast matches.' : 'The archive is empty.'}>{filtered ? 'Try another spelling, fewer words, or clear a filter.' : null}</EmptyState>
              ) : (
                <>
                  <CastTable casts={data.items} caption="Casts found" captionHidden busy={casts.isPlaceholderData} />
                  <div>
                    <a href={serverPaths.labelSheet({ casts: data.items.map((c) => c.id) })} className={buttonClasses('secondary')} target="_blank" rel="noopener">
                      Print labels for the casts on this page
                    </a>
                  </div>
                </>
              )}
              <Pager page={data.page} pageSize={data.pageSize} total={data.total} noun="casts" onPage={(page) => setParams({ page }, { push: true })} />
            </>
          )}
        </QueryView>
      </Section>
    </>
  );
}

