import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { Loading } from '../../../components/ui/loading.tsx';
import { ApiError, isApiError } from '../../../lib/api-client.ts';
import { paths } from '../../../lib/paths.ts';
import { forgetSigningKey, signingKeyFor } from '../../../lib/uuid.ts';
import { signingLinkQueryOptions, submitByLink } from '../api.ts';
import { PublicFrame } from '../../../components/layout/public-frame.tsx';
import { SigningFormView, type SubmitResult } from '../components/signing-form.tsx';

/** A one-time signing link, opened on the performer's own device. */
export function SignLinkPage() {
  const { token = '' } = useParams();
  // Once per page load, kept for this link in this tab: a retry after a dropped connection reuses it.
  const [idempotencyKey] = useState(() => signingKeyFor(token));
  const [signed, setSigned] = useState<SubmitResult | null>(null);
  const form = useQuery({ ...signingLinkQueryOptions(token), enabled: signed === null });

  if (signed) {
    return (
      <PublicFrame title="Signed" narrow>
        <div className="flex flex-col gap-4 rounded-2xl border border-sand-300 bg-white p-8" data-testid="signed-confirmation">
          <h1 className="text-3xl font-bold text-ink-900">Signed.</h1>
          <output className="block text-xl">
            {signed.emailedTo ? (
              <>
                A copy is on its way to <span className="font-bold break-all">{signed.emailedTo}</span>.
              </>
            ) : (
              'The department has your signed consent.'
            )}
          </output>
          <p className="text-lg text-ink-700">This link no longer works. You can close this page.</p>
          <p className="text-lg text-ink-700">
            You can withdraw this consent at any time, as easily as you gave it: ask the department, or{' '}
            <Link to={paths.withdrawRequest.href()} className="font-semibold">
              ask for a withdrawal link
            </Link>
            .
          </p>
        </div>
      </PublicFrame>
    );
  }

  if (form.isPending) {
    return (
      <PublicFrame title="Signing" narrow>
        <Loading label="Opening the form…" rows={4} />
      </PublicFrame>
    );
  }

  if (form.isError) {
    const { heading, advice } = linkProblem(form.error);
    return (
      <PublicFrame title={heading} narrow>
        <h1 className="text-3xl font-bold text-ink-900" data-testid="link-problem">
          {heading}
        </h1>
        <ErrorBanner error={form.error} onRetry={isApiError(form.error) && form.error.isClientError ? undefined : () => void form.refetch()} />
        <p className="text-lg text-ink-700">{advice}</p>
      </PublicFrame>
    );
  }

  return (
    <PublicFrame title={form.data.template.title}>
      <SigningFormView
        form={form.data}
        idempotencyKey={idempotencyKey}
        mode="link"
        submit={(input) => submitByLink(token, input)}
        onSigned={(result) => {
          forgetSigningKey(token);
          setSigned(result);
          window.scrollTo({ top: 0 });
        }}
      />
    </PublicFrame>
  );
}

/** What went wrong with the link, in words, and what the performer can do about it. */
function linkProblem(err: unknown): { heading: string; advice: string } {
  const reason = err instanceof ApiError ? err.details.reason : undefined;
  if (reason === 'cancelled') return { heading: 'This link was withdrawn', advice: 'The department cancelled this request. Ask the make-up department if you should sign a new one.' };
  if (reason === 'expired') return { heading: 'This link has expired', advice: 'Ask the make-up department to send you a new link.' };
  if (reason === 'signed') {
    return { heading: 'This form is already signed', advice: 'Each link works once. If you did not sign it, or want to change your answers, contact the make-up department.' };
  }
  if (isApiError(err, 404) || isApiError(err, 400)) {
    return {
      heading: 'This link does not work',
      advice: 'It may have been cancelled by the department, or copied only in part. Ask the make-up department to send you a new link.',
    };
  }
  if (isApiError(err, 409)) {
    return { heading: 'This link no longer works', advice: 'Ask the make-up department to send you a new link.' };
  }
  if (isApiError(err, 429)) return { heading: 'Please wait a moment', advice: 'Too many attempts were made from here. Try again in a minute.' };
  return { heading: 'The form could not be opened', advice: 'Check your connection and try again. If it keeps happening, contact the make-up department.' };
}
