import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { CONSENT_KIND_LABELS } from '#shared/domain/consent.ts';
import { formatAnswer } from '#shared/domain/questionnaire.ts';
import { IdSchema } from '#shared/schemas/common.ts';
import type { ConsentDetail } from '#shared/schemas/consents.ts';
import { NotFoundPage } from '../../../components/layout/not-found-page.tsx';
import { Button, buttonClasses, ButtonLink } from '../../../components/ui/button.tsx';
import { Icon } from '../../../components/ui/icons.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { StatusBadge } from '../../../components/ui/status-badge.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { paths, serverPaths } from '../../../lib/paths.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { PERFORMER_PAGE_ACTIONS } from '../../../lib/session/seat.ts';
import { consentQueryOptions, useWithdrawConsent } from '../api.ts';
import { ConsentStateBadge } from '../../../components/consent/consent-state.tsx';
import { ConsentText } from '../../../components/consent/consent-text.tsx';
import { WithdrawDialog } from '../components/withdraw-dialog.tsx';
import { useRecordProduction } from '../../../lib/session/use-record-production.ts';

export async function consentLoader({ params }: LoaderFunctionArgs) {
  const id = IdSchema.safeParse(params.id);
  if (id.success) await prefetchFor(PERFORMER_PAGE_ACTIONS, consentQueryOptions(id.data));
  return null;
}

export function ConsentPage() {
  const params = useParams();
  const id = IdSchema.safeParse(params.id);
  if (!id.success) return <NotFoundPage />;
  return <ConsentView id={id.data} />;
}

const METHOD_LABELS: Record<ConsentDetail['signingMethod'], string> = {
  tablet: 'On the department’s tablet',
  link: 'Through a one-time link',
};

const WITHDRAWN_VIA_LABELS: Record<NonNullable<ConsentDetail['withdrawnVia']>, string> = {
  performer: 'by the performer, signed in',
  lead: 'by the designated lead',
  link: 'by the performer, through a withdrawal link',
};

function ConsentView({ id }: { id: string }) {
  const consent = useQuery(consentQueryOptions(id));
  const c = consent.data;

  if (!c && isApiError(consent.error, 404)) {
    return (
      <>
        <PageHeading title="Consent not found">Consent not found</PageHeading>
        <p className="max-w-prose text-ink-700">There is no consent at this address. The link may be wrong.</p>
      </>
    );
  }

  return (
    <>
      {c ? (
        <nav aria-label="Breadcrumb">
          <Link to={paths.performer.href(c.performerId)} className="inline-flex min-h-11 items-center font-semibold">
            <span aria-hidden="true">←</span>&nbsp;{c.performerName}
          </Link>
        </nav>
      ) : null}
      <PageHeading
        title={c ? `${c.title} · ${c.performerName}` : 'Consent'}
        testId="consent-heading"
        lead={
          c ? (
            <span className="flex flex-wrap items-center gap-2">
              {CONSENT_KIND_LABELS[c.kind]} · version {c.templateVersion} · <ConsentStateBadge state={c.state} />
            </span>
          ) : undefined
        }
      >
        {c?.title ?? 'Consent'}
      </PageHeading>
      <QueryView query={consent} loadingLabel="Loading the consent…">
        {(data) => <ConsentBody consent={data} />}
      </QueryView>
    </>
  );
}

function ConsentBody({ consent: c }: { consent: ConsentDetail }) {
  useRecordProduction(c.productionId);
  const withdraw = useWithdrawConsent(c.id);
  const [open, setOpen] = useState(false);

  function close() {
    setOpen(false);
    withdraw.reset();
  }

  return (
    <div className="flex flex-col gap-6">
      <Section
        title="Record"
        actions={
          <div className="flex flex-wrap gap-3">
            {c.canDownloadPdf ? (
              <a href={serverPaths.consentPdf(c.id)} download={`consent-${c.id}.pdf`} className={buttonClasses('secondary')} data-testid="download-pdf">
                Download PDF
              </a>
            ) : null}
            {c.canWithdraw ? (
              <Button variant="danger" onClick={() => setOpen(true)} data-testid="withdraw-open">
                Withdraw this consent
              </Button>
            ) : null}
          </div>
        }
      >
        <dl className="grid gap-x-6 gap-y-3 sm:grid-cols-[max-content_1fr]" data-testid="consent-record">
          <dt className="font-semibold text-ink-700">Performer</dt>
          <dd>
            <Link to={paths.performer.href(c.performerId)} className="font-semibold">
              {c.performerName}
            </Link>
          </dd>
          <dt className="font-semibold text-ink-700">State</dt>
          <dd>
            <ConsentStateBadge state={c.state} />
          </dd>
          <dt className="font-semibold text-ink-700">Signed</dt>
          <dd>
            <time dateTime={c.signedAt}>{formatDateTime(c.signedAt)}</time> by <span className="font-semibold">{c.signerName}</span>
          </dd>
          <dt className="font-semibold text-ink-700">How</dt>
          <dd>{METHOD_LABELS[c.signingMethod]}</dd>
          <dt className="font-semibold text-ink-700">Expires</dt>
          <dd>{c.expiresAt ? <time dateTime={c.expiresAt}>{formatDateTime(c.expiresAt)}</time> : 'Runs until withdrawn'}</dd>
          {c.withdrawnAt ? (
            <>
              <dt className="font-semibold text-ink-700">Withdrawn</dt>
              <dd>
                <time dateTime={c.withdrawnAt}>{formatDateTime(c.withdrawnAt)}</time>
                {c.withdrawnVia ? ` ${WITHDRAWN_VIA_LABELS[c.withdrawnVia]}` : ''}
                {c.withdrawalReason ? <span className="block text-ink-700">Reason: {c.withdrawalReason}</span> : null}
              </dd>
            </>
          ) : null}
        </dl>
        {!c.canDownloadPdf ? (
          <p className="text-ink-700">The signed PDF holds health answers, so only the designated lead and the performer can download it.</p>
        ) : null}
      </Section>

      <Section title="Answers" testId="consent-answers">
        {c.medicalWithheld ? (
          <p className="flex items-start gap-2 rounded-xl bg-sand-100 p-4 text-ink-900" data-testid="medical-withheld">
            <Icon name="info" className="mt-1 size-5 text-ink-700" />
            Health answers are visible only to the designated lead and the performer.
          </p>
        ) : null}
        {c.answers.length === 0 ? (
          <p className="text-ink-700">{c.medicalWithheld ? 'There are no other answers on this form.' : 'This form asked no questions.'}</p>
        ) : (
          <dl className="flex flex-col divide-y divide-sand-200">
            {c.answers.map((a) => (
              <div key={a.questionId} className="flex flex-col gap-1 py-3 sm:grid sm:grid-cols-[2fr_1fr] sm:gap-6">
                <dt className="text-ink-900">
                  {a.label}
                  {a.medical ? (
                    <span className="ml-2 align-middle">
                      <StatusBadge tone="accent">Health detail</StatusBadge>
                    </span>
                  ) : null}
                </dt>
                <dd className="font-semibold text-ink-900">{answerText(a.answer)}</dd>
              </div>
            ))}
          </dl>
        )}
      </Section>

      <Section title="The text that was signed">
        <div className="rounded-xl bg-sand-50 p-4 sm:p-6">
          <ConsentText body={c.body} headingLevel={3} testId="consent-text" />
        </div>
      </Section>

      <Section title="Fingerprints">
        <p className="max-w-prose text-ink-700">
          These SHA-256 values identify this exact record. Anyone holding the PDF can check it on “Check a PDF”.
        </p>
        <dl className="grid gap-x-6 gap-y-3 sm:grid-cols-[max-content_1fr]">
          <dt className="font-semibold text-ink-700">PDF (SHA-256)</dt>
          <dd className="font-mono text-sm break-all" data-testid="pdf-sha256">
            {c.pdfSha256}
          </dd>
          <dt className="font-semibold text-ink-700">Signed content (SHA-256)</dt>
          <dd className="font-mono text-sm break-all">{c.contentSha256}</dd>
        </dl>
      </Section>

      <div>
        <ButtonLink variant="secondary" to={paths.performer.href(c.performerId)}>
          Back to {c.performerName}
        </ButtonLink>
      </div>

      <WithdrawDialog
        open={open}
        consent={c}
        consequences={c.consequences}
        pending={withdraw.isPending}
        error={withdraw.error}
        onCancel={close}
        onConfirm={(reason) => withdraw.mutate({ reason, version: c.version }, { onSuccess: close })}
      />
    </div>
  );
}

/** Stored answers keep their value, not their question's type: a boolean can only be a yes/no. */
function answerText(answer: boolean | string | null): string {
  return formatAnswer({ type: typeof answer === 'boolean' ? 'yes_no' : 'short_text' }, answer ?? undefined);
}
