import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { CONSENT_KIND_LABELS } from '#shared/domain/consent.ts';
import type { BundleLinkView } from '#shared/schemas/consent-bundles.ts';
import { PublicFrame } from '../../../components/layout/public-frame.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { Loading } from '../../../components/ui/loading.tsx';
import { ApiError, isApiError } from '../../../lib/api-client.ts';
import { paths } from '../../../lib/paths.ts';
import { forgetSigningKey, signingKeyFor } from '../../../lib/uuid.ts';
import { signingBundleLinkQueryOptions, submitBundleForm } from '../api.ts';
import { SigningFormView } from '../components/signing-form.tsx';

type Outcome = 'signed' | 'skipped';

/** One e-mailed link for several forms: each shown in turn, each its own consent; skipping one keeps the others. */
export function SignBundlePage() {
  const { token = '' } = useParams();
  const view = useQuery(signingBundleLinkQueryOptions(token));
  const [outcomes, setOutcomes] = useState<Record<string, Outcome>>({});
  const [emailedTo, setEmailedTo] = useState<string | null>(null);

  if (view.isPending) {
    return (
      <PublicFrame title="Signing" narrow>
        <Loading label="Opening the forms…" rows={4} />
      </PublicFrame>
    );
  }
  if (view.isError) {
    const reason = view.error instanceof ApiError ? view.error.details.reason : undefined;
    const heading = reason === 'expired' ? 'This link has expired' : reason === 'signed' ? 'These forms are already signed' : isApiError(view.error, 429) ? 'Please wait a moment' : 'This link does not work';
    return (
      <PublicFrame title={heading} narrow>
        <h1 className="text-3xl font-bold text-ink-900" data-testid="link-problem">
          {heading}
        </h1>
        <ErrorBanner error={view.error} onRetry={isApiError(view.error) && view.error.isClientError ? undefined : () => void view.refetch()} />
        <p className="text-lg text-ink-700">Ask the make-up department to send you a new link if you still need to sign.</p>
      </PublicFrame>
    );
  }

  const items = view.data.items;
  const toSign = items.filter((i) => i.state === 'to_sign' && !outcomes[i.requestId]);
  const current = toSign[0];
  if (!current?.form) return <Summary data={view.data} outcomes={outcomes} emailedTo={emailedTo} />;
  const position = items.indexOf(current) + 1;
  const settle = (outcome: Outcome) => {
    setOutcomes((o) => ({ ...o, [current.requestId]: outcome }));
    window.scrollTo({ top: 0 });
  };
  const keyName = `${token}:${current.requestId}`;

  return (
    <PublicFrame title={current.form.template.title}>
      <SigningFormView
        key={current.requestId}
        form={current.form}
        idempotencyKey={signingKeyFor(keyName)}
        mode="link"
        progress={{ position, total: items.length }}
        submit={(input) => submitBundleForm(token, current.requestId, input)}
        onSigned={(result) => {
          forgetSigningKey(keyName);
          if (result.emailedTo) setEmailedTo(result.emailedTo);
          settle('signed');
        }}
        decline={async () => undefined}
        onDeclined={() => settle('skipped')}
      />
    </PublicFrame>
  );
}

function Summary({ data, outcomes, emailedTo }: { data: BundleLinkView; outcomes: Record<string, Outcome>; emailedTo: string | null }) {
  const word = (i: BundleLinkView['items'][number]) => {
    if (i.state === 'signed' || outcomes[i.requestId] === 'signed') return 'Signed';
    if (i.state === 'unavailable') return 'No longer asked for by the department';
    return 'Not signed';
  };
  return (
    <PublicFrame title="Done" narrow>
      <div className="flex flex-col gap-4 rounded-2xl border border-sand-300 bg-white p-8" data-testid="bundle-done">
        <h1 className="text-3xl font-bold text-ink-900">Thank you.</h1>
        <ul className="flex flex-col gap-2 text-lg" aria-label="Your forms">
          {data.items.map((i) => (
            <li key={i.requestId} className="flex flex-col">
              <span className="font-semibold">{i.title}</span>
              <span className="text-ink-700">
                {CONSENT_KIND_LABELS[i.kind]} · {word(i)}
              </span>
            </li>
          ))}
        </ul>
        {emailedTo ? (
          <output className="block text-lg">
            A copy of each signed form is on its way to <span className="font-bold break-all">{emailedTo}</span>.
          </output>
        ) : null}
        <p className="text-lg text-ink-700">Forms you did not sign stay open until the link expires; you can come back to them through the same link.</p>
        <p className="text-lg text-ink-700">
          You can withdraw any consent at any time, as easily as you gave it: ask the department, or{' '}
          <Link to={paths.withdrawRequest.href()} className="font-semibold">
            ask for a withdrawal link
          </Link>
          .
        </p>
        <Button variant="secondary" onClick={() => window.location.reload()}>
          Look at the forms again
        </Button>
      </div>
    </PublicFrame>
  );
}
