import { useQuery } from '@tanstack/react-query';
import { Link, type LoaderFunctionArgs } from 'react-router-dom';
import { PRODUCT_CATEGORIES, PRODUCT_CATEGORY_LABELS } from '#shared/domain/catalogue.ts';
import { ALLERGEN_GROUPS, ALLERGEN_GROUP_LABELS } from '#shared/domain/ingredients.ts';
import { ProductListQuerySchema, type ProductListItem, type ProductListQuery } from '#shared/schemas/catalogue.ts';
import { ButtonLink } from '../../../components/ui/button.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { Pager } from '../../../components/ui/pager.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { SortHeader, Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { formatDate } from '../../../lib/format.ts';
import { parseListParams, useDebouncedSearch, useListParams } from '../../../lib/list-params.ts';
import { paths } from '../../../lib/paths.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { seatCan } from '../../../lib/session/seat.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { productsQueryOptions } from '../api.ts';
import { GroupBadge, MarkedBadge } from '../components/badges.tsx';

export async function catalogueLoader({ request }: LoaderFunctionArgs) {
  await prefetchFor('catalogue.read', productsQueryOptions(parseListParams(ProductListQuerySchema, new URL(request.url).searchParams)));
  return null;
}

export function CataloguePage() {
  const session = useSession();
  const [params, setParams] = useListParams(ProductListQuerySchema);
  const products = useQuery(productsQueryOptions(params));
  const [search, setSearch] = useDebouncedSearch(params.q ?? '', (q) => setParams({ q }, { resetPage: true }));
  const canManage = seatCan(session, 'catalogue.manage');
  const filtered = Boolean(params.q || params.category || params.group || params.expiredLots);

  return (
    <>
      <PageHeading
        title="Catalogue"
        lead="The department’s products, shared by every production: ingredients as labelled, lots and safety data sheets."
        actions={
          <>
            {canManage ? <ButtonLink to={paths.newProduct.href()}>Add product</ButtonLink> : null}
            <ButtonLink variant="secondary" to={paths.ingredients.href()}>
              Ingredients
            </ButtonLink>
          </>
        }
      >
        Catalogue
      </PageHeading>
      <Section title="Products">
        <search aria-label="Find products">
          <form className="grid gap-4 md:grid-cols-2 lg:grid-cols-4" onSubmit={(e) => e.preventDefault()}>
            <TextField
              label="Search"
              type="search"
              hint="Product name, maker or an ingredient."
              value={search}
              onChange={(e) => setSearch(e.target.value)}
              data-testid="products-search"
            />
            <SelectField label="Category" value={params.category ?? ''} onChange={(e) => setParams({ category: (e.target.value || undefined) as ProductListQuery['category'] }, { resetPage: true })}>
              <option value="">Any category</option>
              {PRODUCT_CATEGORIES.map((c) => (
                <option key={c} value={c}>
                  {PRODUCT_CATEGORY_LABELS[c]}
                </option>
              ))}
            </SelectField>
            <SelectField label="Contains" value={params.group ?? ''} onChange={(e) => setParams({ group: (e.target.value || undefined) as ProductListQuery['group'] }, { resetPage: true })}>
              <option value="">Any allergen group</option>
              {ALLERGEN_GROUPS.map((g) => (
                <option key={g} value={g}>
                  {ALLERGEN_GROUP_LABELS[g]}
                </option>
              ))}
            </SelectField>
            <SelectField label="Lots" value={params.expiredLots ?? ''} onChange={(e) => setParams({ expiredLots: (e.target.value || undefined) as ProductListQuery['expiredLots'] }, { resetPage: true })}>
              <option value="">Any lots</option>
              <option value="true">Has expired lots</option>
              <option value="false">No expired lots</option>
            </SelectField>
          </form>
        </search>
        <QueryView query={products} loadingLabel="Loading products…">
          {(data) => (
            <>
              {data.items.length === 0 ? (
                <EmptyState title={filtered ? 'No product matches these filters.' : 'No products yet.'}>
                  {filtered ? 'Try another spelling or fewer filters.' : canManage ? 'Add the first one with its label list.' : null}
                </EmptyState>
              ) : (
                <ProductTable items={data.items} params={params} busy={products.isPlaceholderData} onSort={(sort, dir) => setParams({ sort, dir }, { resetPage: true })} />
              )}
              <Pager page={data.page} pageSize={data.pageSize} total={data.total} noun="products" onPage={(page) => setParams({ page }, { push: true })} />
            </>
          )}
        </QueryView>
      </Section>
    </>
  );
}

interface ProductTableProps {
  items: ProductListItem[];
  params: ProductListQuery;
  busy: boolean;
  onSort: (sort: ProductListQuery['sort'], dir: ProductListQuery['dir']) => void;
}

function ProductTable({ items, params, busy, onSort }: ProductTableProps) {
  return (
    <Table caption="Products" captionHidden busy={busy} testId="products-table">
      <Thead>
        <tr>
          <SortHeader label="Product" sortKey="name" sort={params.sort} dir={params.dir} onSort={onSort} />
          {/* On a portrait tablet the category sits under the name, so the table never scrolls sideways. */}
          <SortHeader label="Category" sortKey="category" sort={params.sort} dir={params.dir} onSort={onSort} className="hidden lg:table-cell" />
          <Th>Contains</Th>
          <Th>Lots</Th>
        </tr>
      </Thead>
      <tbody>
        {items.map((p) => (
          <Tr key={p.id}>
            <Td>
              <Link to={paths.product.href(p.id)} className="inline-flex min-h-11 items-center font-semibold" data-testid="product-link">
                {p.name}
              </Link>
              {p.maker ? <span className="block text-sm text-ink-700">{p.maker}</span> : null}
              <span className="block text-sm text-ink-700 lg:hidden">
                {PRODUCT_CATEGORY_LABELS[p.category]}
                {p.formulationVersion && p.formulationVersion > 1 ? ` · formulation ${p.formulationVersion}` : ''}
              </span>
              {p.solventCaution ? (
                <span className="mt-1 block">
                  <MarkedBadge icon="warning" tone="warning">
                    Solvent: ventilate, no flames
                  </MarkedBadge>
                </span>
              ) : null}
            </Td>
            <Td className="hidden lg:table-cell">
              {PRODUCT_CATEGORY_LABELS[p.category]}
              <span className="block text-sm text-ink-700">{p.formulationVersion && p.formulationVersion > 1 ? `Formulation ${p.formulationVersion}` : null}</span>
            </Td>
            <Td>
              {p.ingredientCount === null ? (
                <MarkedBadge icon="missing" tone="neutral">
                  Ingredients not recorded
                </MarkedBadge>
              ) : (
                <span className="flex flex-wrap gap-1">
                  {p.groups.filter((g) => g !== 'other').map((g) => (
                    <GroupBadge key={g} group={g} />
                  ))}
                  <span className="text-sm text-ink-700">{p.ingredientCount} ingredients</span>
                </span>
              )}
            </Td>
            <Td>
              <span className="flex flex-col items-start gap-1">
                {p.expiredLots > 0 ? (
                  <MarkedBadge icon="blocked" tone="danger" testId="expired-lots">
                    {p.expiredLots} expired
                  </MarkedBadge>
                ) : null}
                {p.usableLots > 0 ? (
                  <span className="text-sm">
                    {p.usableLots} in date
                    {p.nextExpiry ? <span className="block text-ink-700">next ends {formatDate(p.nextExpiry)}</span> : null}
                  </span>
                ) : (
                  <MarkedBadge icon="missing" tone="neutral">
                    None usable
                  </MarkedBadge>
                )}
              </span>
            </Td>
          </Tr>
        ))}
      </tbody>
    </Table>
  );
}
