import { useQuery, useQueryClient } from '@tanstack/react-query';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { BODY_REGION_LABELS } from '#shared/domain/archive-casts.ts';
import { BUILD_MATERIAL_ROLE_LABELS } from '#shared/domain/builds.ts';
import { IdSchema } from '#shared/schemas/common.ts';
import type { BuildDetail } from '#shared/schemas/builds.ts';
import { NotFoundPage } from '../../../components/layout/not-found-page.tsx';
import { ButtonLink } from '../../../components/ui/button.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { formatDate } from '../../../lib/format.ts';
import { paths } from '../../../lib/paths.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { invalidate } from '../../../lib/query-keys.ts';
import { buildQueryOptions } from '../api.ts';
import { BuildCautions } from '../components/build-cautions.tsx';
import { BuildPhoto } from '../components/build-photo.tsx';
import { CoatingResult } from '../components/coating-fields.tsx';
import { PiecesSection } from '../components/pieces-section.tsx';
import { OutlookSummary, PlanForm } from '../components/plan-form.tsx';
import { WeighOut } from '../components/weigh-out.tsx';
import { useRecordProduction } from '../../../lib/session/use-record-production.ts';

export async function buildLoader({ params }: LoaderFunctionArgs) {
  const id = IdSchema.safeParse(params.id);
  if (id.success) await prefetchFor('builds.read', buildQueryOptions(id.data));
  return null;
}

export function BuildPage() {
  const id = IdSchema.safeParse(useParams().id);
  if (!id.success) return <NotFoundPage />;
  return <Build id={id.data} />;
}

function Build({ id }: { id: string }) {
  const queryClient = useQueryClient();
  const build = useQuery(buildQueryOptions(id));
  useRecordProduction(build.data?.productionId);
  return (
    <>
      <nav aria-label="Breadcrumb">
        <Link to={paths.builds.href()} className="inline-flex min-h-11 items-center font-semibold">
          <span aria-hidden="true">←</span>&nbsp;Appliance builds
        </Link>
      </nav>
      <QueryView query={build} loadingLabel="Loading the build…">
        {(b) => (
          <>
            <PageHeading
              title={`Build of ${formatDate(b.madeOn)}`}
              lead={`${b.performer.name}’s ${BODY_REGION_LABELS[b.mold.region].toLowerCase()} mold ${b.mold.labelCode}, made by ${b.madeBy} on ${formatDate(b.madeOn)} for ${b.productionName}.`}
              actions={b.canManage ? <ButtonLink to={paths.editBuild.href(b.id)}>Correct the build</ButtonLink> : null}
            >
              {b.performer.name}: {BODY_REGION_LABELS[b.mold.region].toLowerCase()} pieces of {formatDate(b.madeOn)}
            </PageHeading>
            <BuildCautions sheets={b.materials.flatMap((m) => (m.safetySheetUrl ? [{ name: m.product.name, url: m.safetySheetUrl }] : []))} />
            <Section title="For the shoot" testId="build-outlook">
              <OutlookSummary outlook={b.outlook} />
              {b.canPlan ? <PlanForm key={`${b.outlook.plan?.version ?? 0}`} outlook={b.outlook} /> : null}
            </Section>
            <PiecesSection build={b} onReload={() => void invalidate(queryClient, [buildQueryOptions(b.id).queryKey])} />
            <Materials build={b} />
            <Section title="Weigh-out and what was weighed">
              <WeighOut plan={b.plan} resolution={b.mix.scaleResolutionG} weighed={b.weighed} />
              <p className="text-ink-700">Demold after {b.cureMinutes} minutes.</p>
              {b.coatingVolumes && b.coating ? (
                <>
                  <h3 className="text-lg font-bold text-ink-900">
                    Encapsulation coating, {b.coating.capParts} : {b.coating.solventParts}
                  </h3>
                  <CoatingResult volumes={b.coatingVolumes} />
                </>
              ) : null}
              {b.notes ? <p className="whitespace-pre-line text-ink-800">{b.notes}</p> : null}
            </Section>
            <BuildPhoto build={b} />
          </>
        )}
      </QueryView>
    </>
  );
}

function Materials({ build: b }: { build: BuildDetail }) {
  return (
    <Section title="Materials and lots" testId="build-materials">
      <Table caption="Materials of this run, with their lots" captionHidden testId="materials-table">
        <Thead>
          <tr>
            <Th>Used as</Th>
            <Th>Product</Th>
            <Th>Lot</Th>
          </tr>
        </Thead>
        <tbody>
          {b.materials.map((m) => (
            <Tr key={m.position}>
              <Td className="font-semibold">{BUILD_MATERIAL_ROLE_LABELS[m.role]}</Td>
              <Td>
                <Link to={paths.product.href(m.product.id)} className="inline-flex min-h-11 items-center">
                  {m.product.name}
                </Link>
              </Td>
              <Td className="whitespace-nowrap">
                {m.lot.code}
                <span className="block text-sm text-ink-700">until {formatDate(m.lot.expiresOn)}</span>
              </Td>
            </Tr>
          ))}
        </tbody>
      </Table>
    </Section>
  );
}
