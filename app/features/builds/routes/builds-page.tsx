import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { BODY_REGION_LABELS } from '#shared/domain/archive-casts.ts';
import type { ApplianceOutlook } from '#shared/schemas/builds.ts';
import { Button, ButtonLink } from '../../../components/ui/button.tsx';
import { Dialog } from '../../../components/ui/dialog.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { Pager } from '../../../components/ui/pager.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { formatDate } from '../../../lib/format.ts';
import { paths } from '../../../lib/paths.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { queryClient } from '../../../lib/query-client.ts';
import { sessionQueryOptions } from '../../../lib/session/api.ts';
import { seatProduction } from '../../../lib/session/seat-production.ts';
import { seatCan } from '../../../lib/session/seat.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { buildsQueryOptions, outlooksQueryOptions } from '../api.ts';
import { BuildCautions } from '../components/build-cautions.tsx';
import { ShortfallBadge } from '../components/piece-status.tsx';
import { OutlookSummary, PlanForm } from '../components/plan-form.tsx';

const PAGE_SIZE = 25;

export async function buildsLoader({ request }: { request: Request }) {
  const session = await queryClient.ensureQueryData(sessionQueryOptions()).catch(() => undefined);
  const productionId = session?.current?.productionId;
  const page = Number(new URL(request.url).searchParams.get('page')) || 1;
  if (productionId) await prefetchFor('builds.read', buildsQueryOptions({ productionId, page, pageSize: PAGE_SIZE, dir: 'desc' }), outlooksQueryOptions(productionId));
  return null;
}

/** The acting production's appliance builds, newest first, and each appliance's pieces against its shoot days. */
export function BuildsPage() {
  const session = useSession();
  const production = seatProduction(session);
  return (
    <>
      <PageHeading
        title="Appliance builds"
        lead={production ? `Runs of pieces poured from performers’ molds on ${production.name}, with every material’s lot, and the pieces left for the shoot.` : undefined}
        actions={
          production && seatCan(session, 'builds.manage') ? (
            <ButtonLink to={paths.newBuild.href()}>Record a build</ButtonLink>
          ) : null
        }
      >
        Appliance builds
      </PageHeading>
      <BuildCautions />
      {production ? (
        <>
          <Outlooks productionId={production.id} />
          <BuildList productionId={production.id} />
        </>
      ) : (
        <p className="text-ink-700">Switch “Acting as” to a production.</p>
      )}
    </>
  );
}

function Outlooks({ productionId }: { productionId: string }) {
  const outlooks = useQuery(outlooksQueryOptions(productionId));
  const [planning, setPlanning] = useState<ApplianceOutlook | null>(null);
  return (
    <Section title="Pieces for the shoot" testId="outlooks">
      <QueryView query={outlooks} loadingLabel="Loading the appliances…">
        {(data) =>
          data.items.length === 0 ? (
            <EmptyState title="No appliance has been run yet." />
          ) : (
            <>
              <Table caption="Appliances, pieces on the shelf against the shoot days still to come" captionHidden testId="outlooks-table">
                <Thead>
                  <tr>
                    <Th>Appliance</Th>
                    <Th>On the shelf</Th>
                    <Th>Needed</Th>
                    <Th>Cover</Th>
                    {data.canPlan ? <Th>Plan</Th> : null}
                  </tr>
                </Thead>
                <tbody>
                  {data.items.map((o) => (
                    <Tr key={o.mold.id}>
                      <Td>
                        <span className="font-semibold">{o.performer.name}</span>
                        <span className="block text-sm text-ink-700">
                          {BODY_REGION_LABELS[o.mold.region]} · {o.mold.labelCode}
                        </span>
                      </Td>
                      <Td className="tabular-nums">{o.tally.remaining}</Td>
                      <Td className="tabular-nums">{o.shortfall ? `${o.shortfall.needed} for ${o.plan!.shootDaysPlanned} days` : '—'}</Td>
                      <Td>
                        <ShortfallBadge outlook={o} />
                      </Td>
                      {data.canPlan ? (
                        <Td>
                          <Button variant="secondary" onClick={() => setPlanning(o)} aria-label={`Plan shoot days for ${o.performer.name}’s ${BODY_REGION_LABELS[o.mold.region].toLowerCase()}`}>
                            Plan
                          </Button>
                        </Td>
                      ) : null}
                    </Tr>
                  ))}
                </tbody>
              </Table>
              <Dialog open={planning !== null} onClose={() => setPlanning(null)} title="Shoot days still to come" testId="plan-dialog">
                {planning ? (
                  <>
                    <OutlookSummary outlook={planning} />
                    <PlanForm key={planning.mold.id} outlook={planning} onDone={() => setPlanning(null)} />
                  </>
                ) : null}
              </Dialog>
            </>
          )
        }
      </QueryView>
    </Section>
  );
}

function BuildList({ productionId }: { productionId: string }) {
  const [params, setParams] = useSearchParams();
  const page = Number(params.get('page')) || 1;
  const builds = useQuery(buildsQueryOptions({ productionId, page, pageSize: PAGE_SIZE, dir: 'desc' }));
  return (
    <Section title="Builds" testId="builds">
      <QueryView query={builds} loadingLabel="Loading the builds…">
        {(data) =>
          data.items.length === 0 ? (
            <EmptyState title="No build is recorded on this production yet." />
          ) : (
            <>
              <Table caption="Appliance builds, newest first" captionHidden busy={builds.isPlaceholderData} testId="builds-table">
                <Thead>
                  <tr>
                    <Th>Made</Th>
                    <Th>Performer and mold</Th>
                    <Th>Silicone</Th>
                    <Th>Pieces</Th>
                  </tr>
                </Thead>
                <tbody>
                  {data.items.map((b) => (
                    <Tr key={b.id}>
                      <Td>
                        <Link to={paths.build.href(b.id)} className="inline-flex min-h-11 items-center font-semibold" data-testid="build-link">
                          {formatDate(b.madeOn)}
                        </Link>
                        <span className="block text-sm text-ink-700">{b.madeBy}</span>
                      </Td>
                      <Td>
                        {b.performer.name}
                        <span className="block text-sm text-ink-700">
                          {BODY_REGION_LABELS[b.mold.region]} · {b.mold.labelCode}
                        </span>
                      </Td>
                      <Td>{b.silicone ? `${b.silicone.productName}, lot ${b.silicone.lotCode}` : '—'}</Td>
                      <Td className="whitespace-nowrap tabular-nums">
                        {b.tally.remaining} of {b.tally.made} left
                      </Td>
                    </Tr>
                  ))}
                </tbody>
              </Table>
              <Pager page={data.page} pageSize={data.pageSize} total={data.total} noun="builds" onPage={(p) => setParams({ page: String(p) })} />
            </>
          )
        }
      </QueryView>
    </Section>
  );
}
