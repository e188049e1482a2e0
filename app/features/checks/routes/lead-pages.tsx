import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { SKIN_CHECK_OUTCOME_LABELS } from '#shared/domain/applications.ts';
import { CLEARANCE_STATE_LABELS } from '#shared/domain/clearance.ts';
import { Button } from '../../../components/ui/button.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { TextareaField } from '../../../components/ui/textarea-field.tsx';
import { ApiError, errorMessage } from '../../../lib/api-client.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { paths } from '../../../lib/paths.ts';
import { incidentQueryOptions, leadRequestQueryOptions, useCloseIncident, useDecideRequest } from '../api.ts';

function messagesOf(err: unknown): string[] {
  return err instanceof ApiError && Object.keys(err.fields).length ? Object.values(err.fields).flat() : [errorMessage(err)];
}

/** The lead answers an artist's question about a product for a performer, with a note for the health record. */
export function LeadRequestPage() {
  const { id = '' } = useParams();
  const request = useQuery(leadRequestQueryOptions(id));
  const decide = useDecideRequest(id);
  const [note, setNote] = useState('');
  const [errors, setErrors] = useState<string[] | null>(null);
  return (
    <QueryView query={request} loadingLabel="Loading the request…">
      {(r) => (
        <>
          <PageHeading title={`Request: ${r.productName} for ${r.performerName}`} lead={`${r.requestedByName ?? 'An artist'} asked at ${formatDateTime(r.requestedAt)}.`}>
            {r.productName} for {r.performerName}
          </PageHeading>
          <Section title="What the check said" testId="request-check">
            <p>
              <span className="font-semibold">{CLEARANCE_STATE_LABELS[r.stateAtRequest]}</span>: {r.reasons.map((x) => x.text).join('; ')}
            </p>
            <p className="text-ink-700">Approving a Caution lets this performer’s checks with this product go. A Do not use stays stop until its clearance is changed.</p>
          </Section>
          <Section title="Your answer" testId="request-answer">
            {r.status === 'waiting' ? (
              <form noValidate className="flex flex-col gap-3" aria-label="Answer the request" onSubmit={(e) => e.preventDefault()}>
                <TextareaField label="Note for the health record" rows={3} value={note} onChange={(e) => setNote(e.target.value)} hint="Kept with the performer’s health record; the artist sees only your answer." />
                <FormError messages={errors} />
                <div className="flex flex-wrap gap-3">
                  {(['approved', 'refused'] as const).map((decision) => (
                    <Button
                      key={decision}
                      variant={decision === 'approved' ? 'primary' : 'danger'}
                      pending={decide.isPending}
                      onClick={() => {
                        setErrors(null);
                        decide.mutate({ decision, note, version: r.version }, { onError: (err) => setErrors(messagesOf(err)) });
                      }}
                    >
                      {decision === 'approved' ? 'Approve' : 'Refuse'}
                    </Button>
                  ))}
                </div>
              </form>
            ) : (
              <output className="block font-semibold">
                {r.status === 'approved' ? 'Approved' : 'Refused'} by {r.decidedByName} at {formatDateTime(r.decidedAt)}
                {r.note ? `: ${r.note}` : '.'}
              </output>
            )}
          </Section>
        </>
      )}
    </QueryView>
  );
}

/** An incident for the lead: what the artist saw after removal, and the products and lots on the performer. */
export function IncidentPage() {
  const { id = '' } = useParams();
  const incident = useQuery(incidentQueryOptions(id));
  const close = useCloseIncident(id);
  const [note, setNote] = useState('');
  const [errors, setErrors] = useState<string[] | null>(null);
  return (
    <QueryView query={incident} loadingLabel="Loading the incident…">
      {(i) => (
        <>
          <PageHeading title={`Incident: ${i.performerName}`} lead={`Reported by ${i.reportedByName ?? 'an artist'} at ${formatDateTime(i.reportedAt)}.`}>
            Incident for {i.performerName}
          </PageHeading>
          <Section title="What the artist saw" testId="incident-detail">
            <p className="text-lg font-semibold">{SKIN_CHECK_OUTCOME_LABELS[i.outcome]}</p>
            {i.observation ? <p>{i.observation}</p> : null}
            <p>
              <Link className="font-semibold underline" to={paths.application.href(i.applicationId)}>Open the application</Link>
            </p>
          </Section>
          <Section title="Products and lots on the performer" testId="incident-products">
            <ul className="flex flex-col gap-1">
              {[...i.products, ...i.removalProducts.map((p) => ({ ...p, removal: true }))].map((p) => (
                <li key={`${p.lotId}-${'removal' in p ? 'r' : 'a'}`}>
                  {p.productName}, lot <Link className="font-semibold underline" to={paths.lotTrace.href(p.lotId)}>{p.lotCode}</Link>
                  {'removal' in p ? ' (removal)' : ''}
                </li>
              ))}
            </ul>
          </Section>
          <Section title={i.status === 'open' ? 'Close the incident' : 'Closed'} testId="incident-close">
            {i.status === 'open' ? (
              <form noValidate className="flex flex-col gap-3" aria-label="Close the incident" onSubmit={(e) => e.preventDefault()}>
                <TextareaField label="Closing note for the health record" rows={3} value={note} onChange={(e) => setNote(e.target.value)} />
                <FormError messages={errors} />
                <div>
                  <Button pending={close.isPending} onClick={() => close.mutate({ note, version: i.version }, { onError: (err) => setErrors(messagesOf(err)) })}>
                    Close the incident
                  </Button>
                </div>
              </form>
            ) : (
              <output className="block">
                Closed at {formatDateTime(i.closedAt)}
                {i.closingNote ? `: ${i.closingNote}` : '.'}
              </output>
            )}
          </Section>
        </>
      )}
    </QueryView>
  );
}
