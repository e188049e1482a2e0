import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { BODY_REGION_LABELS } from '#shared/domain/archive-casts.ts';
import { BUILD_MATERIAL_ROLE_LABELS } from '#shared/domain/builds.ts';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { formatDate } from '../../../lib/format.ts';
import { paths } from '../../../lib/paths.ts';
import { seatCan } from '../../../lib/session/seat.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { performerBuildsQueryOptions } from '../api.ts';

/**
 * The "Appliances" section of a performer's record: each run of pieces made from their molds with
 * every material and lot in it. The performer sees all of theirs; staff who read builds see them too.
 */
export function PerformerBuilds({ performerId, isSelf }: { performerId: string; isSelf: boolean }) {
  const session = useSession();
  const sees = isSelf || seatCan(session, 'builds.read');
  const builds = useQuery({ ...performerBuildsQueryOptions(performerId), enabled: sees });
  if (!sees) return null;
  return (
    <Section title="Appliances" testId="performer-builds">
      <QueryView query={builds} loadingLabel="Loading the appliances…">
        {(data) =>
          data.items.length === 0 ? (
            <EmptyState title={isSelf ? 'No appliance has been made for you.' : 'No appliance has been made from this performer’s molds.'} />
          ) : (
            <>
              {isSelf ? <p className="max-w-prose text-ink-700">Every run of pieces made from your molds, and every material and lot in it: all of it touches your skin.</p> : null}
              <ul className="flex flex-col divide-y divide-sand-200" aria-label="Appliance runs">
                {data.items.map((b) => (
                  <li key={b.id} className="flex flex-col gap-1 py-3">
                    <p className="font-semibold">
                      {isSelf ? (
                        `${BODY_REGION_LABELS[b.mold.region]} pieces of ${formatDate(b.madeOn)}`
                      ) : (
                        <Link to={paths.build.href(b.id)} className="inline-flex min-h-11 items-center">
                          {BODY_REGION_LABELS[b.mold.region]} pieces of {formatDate(b.madeOn)}
                        </Link>
                      )}{' '}
                      <span className="font-normal text-ink-700">
                        ({b.productionName}; {b.tally.remaining} of {b.tally.made} left)
                      </span>
                    </p>
                    <p className="text-sm text-ink-800">{b.materials.map((m) => `${BUILD_MATERIAL_ROLE_LABELS[m.role]}: ${m.product.name}, lot ${m.lot.code}`).join(' · ')}</p>
                  </li>
                ))}
              </ul>
            </>
          )
        }
      </QueryView>
    </Section>
  );
}
