import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { Button } from '../../../components/ui/button.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { formatDate } from '../../../lib/format.ts';
import { paths } from '../../../lib/paths.ts';
import { healthWorklistQueryOptions, useConfirmHealthReview } from '../api.ts';
import { HealthAnswerList, MedicalReadNote } from './health-answers.tsx';

/** The designated lead's list: health answers given since the lead last confirmed having looked at each performer. */
export function HealthWorklist({ productionId }: { productionId: string }) {
  const worklist = useQuery(healthWorklistQueryOptions(productionId));
  const confirm = useConfirmHealthReview();
  return (
    <Section title="Health answers that need a look" testId="health-worklist">
      <MedicalReadNote />
      <QueryView query={worklist} loadingLabel="Loading health answers…">
        {(data) =>
          data.items.length === 0 ? (
            <EmptyState title="No new health answer needs a look." />
          ) : (
            <ul className="flex flex-col gap-4" aria-label="Performers with health answers to look at">
              {data.items.map((p) => (
                <li key={p.performerId} className="flex flex-col gap-3 rounded-xl border border-sand-300 bg-white p-4" data-testid="health-worklist-performer">
                  <div className="flex flex-wrap items-center justify-between gap-3">
                    <h3 className="text-lg font-bold">
                      <Link to={paths.performer.href(p.performerId)} className="inline-flex min-h-11 items-center">
                        {p.performerName}
                      </Link>
                    </h3>
                    <Button
                      variant="secondary"
                      pending={confirm.isPending && confirm.variables?.performerId === p.performerId}
                      pendingLabel="Saving…"
                      onClick={() => confirm.mutate({ performerId: p.performerId, productionId, reviewedAt: data.readAt })}
                    >
                      I have looked at these<span className="sr-only"> health answers of {p.performerName}</span>
                    </Button>
                  </div>
                  <p className="text-sm text-ink-700">{p.reviewedAt ? `Last confirmed ${formatDate(p.reviewedAt)}.` : 'Not yet confirmed on this production.'}</p>
                  <HealthAnswerList answers={p.answers} />
                </li>
              ))}
            </ul>
          )
        }
      </QueryView>
      {confirm.error ? <ErrorBanner error={confirm.error} /> : null}
    </Section>
  );
}
