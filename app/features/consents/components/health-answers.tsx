import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { CONSENT_KIND_LABELS } from '#shared/domain/consent.ts';
import type { HealthAnswer } from '#shared/schemas/consent-notices.ts';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { formatDate } from '../../../lib/format.ts';
import { paths } from '../../../lib/paths.ts';
import { healthSummaryQueryOptions } from '../api.ts';

/** Every view of health answers is written to the audit log; the reader is told so where they read them. */
export function MedicalReadNote() {
  return (
    <p className="rounded-lg bg-sand-100 px-3 py-2 text-sm text-ink-900" role="note">
      Health details: every view is logged with your name. Use them only for the performer’s care, and follow the production’s licensed medical staff and local rules on health data.
    </p>
  );
}

export function HealthAnswerList({ answers }: { answers: HealthAnswer[] }) {
  return (
    <dl className="flex flex-col gap-2">
      {answers.map((a) => (
        <div key={`${a.consentId}:${a.questionId}`} className="flex flex-col">
          <dt className="font-semibold text-ink-900">{a.label}</dt>
          <dd className="text-ink-900">
            <span data-testid="health-answer">{a.answer}</span>
            <span className="block text-sm text-ink-700">
              <Link to={paths.consent.href(a.consentId)} className="font-semibold">
                {a.title}
              </Link>{' '}
              ({CONSENT_KIND_LABELS[a.kind].toLowerCase()}) · signed <time dateTime={a.signedAt}>{formatDate(a.signedAt)}</time>
            </span>
          </dd>
        </div>
      ))}
    </dl>
  );
}

/** The lead's (or the performer's own) health summary on a performer page, gathered from every consent. */
export function HealthSummarySection({ performerId }: { performerId: string }) {
  const summary = useQuery(healthSummaryQueryOptions(performerId));
  return (
    <Section title="Health summary" testId="health-summary">
      <MedicalReadNote />
      <QueryView query={summary} loadingLabel="Loading health answers…">
        {(data) => (data.answers.length === 0 ? <EmptyState title="No health answers on record." /> : <HealthAnswerList answers={data.answers} />)}
      </QueryView>
    </Section>
  );
}
