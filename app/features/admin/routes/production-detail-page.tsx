import { useQuery } from '@tanstack/react-query';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { PRODUCTION_KIND_LABELS } from '#shared/schemas/admin.ts';
import { IdSchema } from '#shared/schemas/common.ts';
import { NotFoundPage } from '../../../components/layout/not-found-page.tsx';
import { ButtonLink } from '../../../components/ui/button.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { paths } from '../../../lib/paths.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { productionQueryOptions, userPickerQueryOptions } from '../api.ts';
import { DateRange } from '../components/date-range.tsx';
import { LeadSection } from '../components/lead-section.tsx';
import { ProductionEditForm } from '../components/production-edit-form.tsx';
import { TeamSection } from '../components/team-section.tsx';

export async function productionDetailLoader({ params }: LoaderFunctionArgs) {
  const id = IdSchema.safeParse(params.id);
  if (id.success) await prefetchFor('productions.manage', productionQueryOptions(id.data), userPickerQueryOptions());
  return null;
}

export function ProductionDetailPage() {
  const params = useParams();
  const id = IdSchema.safeParse(params.id);
  // A malformed id can name no production; say so without asking the server.
  if (!id.success) return <NotFoundPage />;
  return <ProductionDetail id={id.data} />;
}

function ProductionDetail({ id }: { id: string }) {
  const production = useQuery(productionQueryOptions(id));
  const p = production.data;

  if (!p && isApiError(production.error, 404)) {
    return (
      <>
        <PageHeading title="Production not found">Production not found</PageHeading>
        <p className="max-w-prose text-ink-700">There is no production at this address. The link may be wrong.</p>
        <div>
          <ButtonLink to={paths.productions.href()}>All productions</ButtonLink>
        </div>
      </>
    );
  }

  return (
    <>
      <nav aria-label="Breadcrumb">
        <Link to={paths.productions.href()} className="inline-flex min-h-11 items-center font-semibold">
          <span aria-hidden="true">←</span>&nbsp;All productions
        </Link>
      </nav>
      <PageHeading
        title={p?.name ?? 'Production'}
        testId="production-heading"
        lead={
          p ? (
            <>
              {PRODUCTION_KIND_LABELS[p.kind]} · <DateRange startsOn={p.startsOn} endsOn={p.endsOn} />
            </>
          ) : undefined
        }
      >
        {p?.name ?? 'Production'}
      </PageHeading>
      <QueryView query={production} loadingLabel="Loading the production…">
        {(data) => (
          <div className="flex flex-col gap-6">
            <Section title="Details">
              {/* Keyed by id: moving to another production starts a fresh form. */}
              <ProductionEditForm key={data.id} production={data} />
            </Section>
            <TeamSection production={data} />
            <LeadSection key={data.id} production={data} />
          </div>
        )}
      </QueryView>
    </>
  );
}
