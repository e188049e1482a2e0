import { useQuery } from '@tanstack/react-query';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { EXPOSURE_TYPE_LABELS, PRODUCT_CATEGORY_LABELS } from '#shared/domain/catalogue.ts';
import { IdSchema } from '#shared/schemas/common.ts';
import type { ProductDetail } from '#shared/schemas/catalogue.ts';
import { NotFoundPage } from '../../../components/layout/not-found-page.tsx';
import { ButtonLink } from '../../../components/ui/button.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { formatDateTime } from '../../../lib/format.ts';
import { paths } from '../../../lib/paths.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { seatCan } from '../../../lib/session/seat.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { productQueryOptions } from '../api.ts';
import { FormulationIngredients } from '../components/formulation-ingredients.tsx';
import { LotsSection } from '../components/lots-section.tsx';
import { SafetySheetPanel } from '../components/sds-panel.tsx';
import { SolventCaution } from '../components/solvent-caution.tsx';

export async function productLoader({ params }: LoaderFunctionArgs) {
  const id = IdSchema.safeParse(params.id);
  if (id.success) await prefetchFor('catalogue.read', productQueryOptions(id.data));
  return null;
}

export function ProductPage() {
  const params = useParams();
  const id = IdSchema.safeParse(params.id);
  if (!id.success) return <NotFoundPage />;
  return <ProductView id={id.data} />;
}

function ProductView({ id }: { id: string }) {
  const product = useQuery(productQueryOptions(id));
  const session = useSession();
  const canManage = seatCan(session, 'catalogue.manage');
  const title = product.data?.name ?? 'Product';
  return (
    <>
      <nav aria-label="Breadcrumb">
        <Link to={paths.catalogue.href()} className="inline-flex min-h-11 items-center font-semibold">
          <span aria-hidden="true">←</span>&nbsp;Catalogue
        </Link>
      </nav>
      <PageHeading
        title={title}
        testId="product-heading"
        lead={product.data ? [product.data.maker, PRODUCT_CATEGORY_LABELS[product.data.category], EXPOSURE_TYPE_LABELS[product.data.exposure]].filter(Boolean).join(' · ') : undefined}
        actions={canManage && product.data ? <ButtonLink to={paths.editProduct.href(id)}>Edit product</ButtonLink> : undefined}
      >
        {title}
      </PageHeading>
      <QueryView query={product} loadingLabel="Loading the product…">
        {(p) => <ProductSections product={p} canManage={canManage} />}
      </QueryView>
    </>
  );
}

function ProductSections({ product: p, canManage }: { product: ProductDetail; canManage: boolean }) {
  const current = p.formulations.find((f) => f.current) ?? null;
  const older = p.formulations.filter((f) => !f.current);
  return (
    <div className="flex flex-col gap-6">
      {p.solventCaution ? <SolventCaution /> : null}
      <Section title={current ? `Ingredients (formulation ${current.version})` : 'Ingredients'} testId="current-ingredients">
        <p className="text-sm text-ink-700">In label order: the first is the largest part by weight. A new formulation is untested again for every performer; a new lot is not.</p>
        {current ? <FormulationIngredients formulation={current} testId="ingredient-list" /> : null}
      </Section>
      {p.densityGPerCm3 !== null || p.mixRatio || p.makerMaxSoftenerPercent !== null ? (
        <Section title="Material figures">
          <dl className="grid gap-3 sm:grid-cols-3">
            <Figure term="Density" value={p.densityGPerCm3 !== null ? `${p.densityGPerCm3} g/cm³` : null} />
            <Figure term="Mix ratio A : B (by weight)" value={p.mixRatio ? `${p.mixRatio.partA} : ${p.mixRatio.partB}` : null} />
            <Figure term="Maker’s maximum softener" value={p.makerMaxSoftenerPercent !== null ? `${p.makerMaxSoftenerPercent} %` : null} />
          </dl>
        </Section>
      ) : null}
      <Section title="Lots" testId="lots-section">
        <LotsSection product={p} canManage={canManage} />
      </Section>
      <Section title="Safety data sheet">
        <SafetySheetPanel product={p} canManage={canManage} />
      </Section>
      {older.length ? (
        <Section title="Earlier formulations">
          {older.map((f) => (
            <details key={f.id} className="rounded-xl border border-sand-300 p-3">
              <summary className="flex min-h-11 cursor-pointer items-center font-semibold">
                Version {f.version} · recorded {formatDateTime(f.createdAt)}
                {f.createdBy ? ` by ${f.createdBy}` : ''}
              </summary>
              {f.note ? <p className="my-2 text-ink-700">{f.note}</p> : null}
              <FormulationIngredients formulation={f} />
            </details>
          ))}
        </Section>
      ) : null}
    </div>
  );
}

function Figure({ term, value }: { term: string; value: string | null }) {
  return (
    <div>
      <dt className="text-sm text-ink-700">{term}</dt>
      <dd className="font-semibold">{value ?? 'Not given'}</dd>
    </div>
  );
}
