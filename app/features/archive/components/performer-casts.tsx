import { useQuery } from '@tanstack/react-query';
import { CAST_STATUS_LABELS } from '#shared/domain/archive-casts.ts';
import type { OwnCast } from '#shared/schemas/archive.ts';
import { ButtonLink } from '../../../components/ui/button.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { formatDate } from '../../../lib/format.ts';
import { paths } from '../../../lib/paths.ts';
import { seatCan } from '../../../lib/session/seat.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { performerCastsQueryOptions } from '../api.ts';
import { CastThumbnail, castTitle, RetentionBadge } from './cast-status.tsx';
import { CastTable } from './cast-table.tsx';

/**
 * The "Life casts" section of a performer's record. Staff who may see the performer's casts get
 * the archive's lines; the performer sees each of their casts and where it is kept.
 */
export function PerformerCasts({ performerId, name, isSelf }: { performerId: string; name: string; isSelf: boolean }) {
  const session = useSession();
  const seesCasts = isSelf || seatCan(session, 'casts.read');
  const casts = useQuery({ ...performerCastsQueryOptions(performerId), enabled: seesCasts });
  if (!seesCasts) return null;
  return (
    <Section title="Life casts" testId="life-casts">
      <QueryView query={casts} loadingLabel="Loading the casts…">
        {(data) =>
          data.view === 'own' ? (
            data.items.length === 0 ? (
              <EmptyState title="The department keeps no cast of you." />
            ) : (
              <>
                <p className="max-w-prose text-ink-700">Every mold and positive the department keeps of you, where it is, and until when your storage consent lets it keep it.</p>
                <ul className="flex flex-col divide-y divide-sand-200" aria-label="My casts">
                  {data.items.map((c) => (
                    <OwnCastRow key={c.id} cast={c} />
                  ))}
                </ul>
              </>
            )
          ) : (
            <>
              {data.items.length === 0 ? <EmptyState title="No cast of this performer is recorded." /> : <CastTable casts={data.items} caption={`Life casts of ${name}`} captionHidden showPerformer={false} testId="performer-casts" />}
              {data.canAdd && seatCan(session, 'casts.manage') ? (
                <div>
                  <ButtonLink variant="secondary" to={paths.newCast.href(performerId)}>
                    Record a cast of {name}
                  </ButtonLink>
                </div>
              ) : null}
            </>
          )
        }
      </QueryView>
    </Section>
  );
}

function OwnCastRow({ cast: c }: { cast: OwnCast }) {
  return (
    <li className="flex flex-wrap items-start gap-4 py-3">
      <CastThumbnail url={c.thumbnailUrl} />
      <div className="flex min-w-0 flex-1 flex-col gap-1">
        <p className="font-semibold">
          {castTitle(c)} <span className="font-mono font-normal text-ink-700">{c.labelCode}</span>
        </p>
        <p className="text-sm text-ink-700">
          {c.material} · {c.productionName} · made {formatDate(c.madeOn)} · {CAST_STATUS_LABELS[c.status]}
        </p>
        <p>
          <span className="font-semibold">Kept: </span>
          {c.where}
        </p>
        <p className="flex flex-col items-start gap-1 text-sm">
          <RetentionBadge state={c.retention.state} />
          <span>{c.retention.reason}</span>
        </p>
      </div>
    </li>
  );
}
