import { useQuery } from '@tanstack/react-query';
import { useParams } from 'react-router-dom';
import { PublicFrame } from '../../../components/layout/public-frame.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { Loading } from '../../../components/ui/loading.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { emailConfirmationQueryOptions, useConfirmEmail } from '../api.ts';

/** The performer says the address the department entered is theirs; until then it receives nothing else. */
export function ConfirmEmailPage() {
  const { token = '' } = useParams();
  const view = useQuery(emailConfirmationQueryOptions(token));
  const confirm = useConfirmEmail(token);

  if (view.isPending) {
    return (
      <PublicFrame title="Confirm your e-mail address" narrow>
        <Loading label="Opening the link…" />
      </PublicFrame>
    );
  }
  if (confirm.isSuccess) {
    return (
      <PublicFrame title="Address confirmed" narrow>
        <h1 className="text-3xl font-bold text-ink-900">Thank you, {confirm.data.performerName}</h1>
        <output className="block rounded-xl border-l-4 border-sage-700 bg-sage-100 p-4 text-lg text-sage-800" data-testid="email-confirmed">
          <span className="break-all">{confirm.data.email}</span> is confirmed as yours. The department can now send your signed copies and links here.
        </output>
      </PublicFrame>
    );
  }
  if (view.isError) {
    return (
      <PublicFrame title="This link does not work" narrow>
        <h1 className="text-3xl font-bold text-ink-900">{isApiError(view.error, 409) ? 'This link no longer works' : 'This link does not work'}</h1>
        <ErrorBanner error={view.error} />
        <p className="text-lg text-ink-700">Ask the make-up department to send a new confirmation request.</p>
      </PublicFrame>
    );
  }
  const data = view.data;
  return (
    <PublicFrame title="Confirm your e-mail address" narrow>
      <h1 className="text-3xl font-bold text-ink-900">Is this your address, {data.performerName}?</h1>
      <p className="text-lg text-ink-700">
        The make-up department entered <span className="font-semibold break-all text-ink-900">{data.email}</span> as your e-mail address. Plinth sends
        your signed consent copies and your signing and withdrawal links only to an address you have confirmed.
      </p>
      {confirm.error ? <ErrorBanner error={confirm.error} /> : null}
      <div className="flex flex-wrap gap-3">
        <Button pending={confirm.isPending} pendingLabel="Confirming…" onClick={() => confirm.mutate()}>
          Yes, this is my address
        </Button>
      </div>
      <p className="text-ink-700">If it is not yours, close this page: nothing more will be sent to it.</p>
    </PublicFrame>
  );
}
