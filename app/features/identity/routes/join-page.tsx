import { useQuery } from '@tanstack/react-query';
import { Link, useParams } from 'react-router-dom';
import { PublicFrame } from '../../../components/layout/public-frame.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { Loading } from '../../../components/ui/loading.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { paths } from '../../../lib/paths.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { invitationQueryOptions, useAcceptInvitation } from '../api.ts';

/** The performer, signed in with their own sign-in, accepts the department's invitation to see their record. */
export function JoinPage() {
  const { token = '' } = useParams();
  const session = useSession();
  const view = useQuery(invitationQueryOptions(token));
  const accept = useAcceptInvitation(token);

  if (view.isPending) {
    return (
      <PublicFrame title="Your own sign-in" narrow>
        <Loading label="Opening the invitation…" />
      </PublicFrame>
    );
  }
  if (accept.isSuccess) {
    return (
      <PublicFrame title="Sign-in linked" narrow>
        <h1 className="text-3xl font-bold text-ink-900">Your sign-in is linked</h1>
        <output className="block rounded-xl border-l-4 border-sage-700 bg-sage-100 p-4 text-lg text-sage-800" data-testid="invitation-accepted">
          You can now see your own record: your consents, results and casts.
        </output>
        <p>
          <Link to={paths.performer.href(accept.data.performerId)} className="text-lg font-semibold">
            Open my record
          </Link>
        </p>
      </PublicFrame>
    );
  }
  if (view.isError) {
    return (
      <PublicFrame title="This invitation does not work" narrow>
        <h1 className="text-3xl font-bold text-ink-900">{isApiError(view.error, 409) ? 'This invitation no longer works' : 'This invitation does not work'}</h1>
        <ErrorBanner error={view.error} />
        <p className="text-lg text-ink-700">Ask the make-up department to send a new one.</p>
      </PublicFrame>
    );
  }
  return (
    <PublicFrame title="Your own sign-in" narrow>
      <h1 className="text-3xl font-bold text-ink-900">Link your sign-in, {view.data.performerName}?</h1>
      <p className="text-lg text-ink-700">
        You are signed in as <span className="font-semibold break-all text-ink-900">{session.user.email}</span>. Accepting links this sign-in to your
        record at the make-up department, so you can see it and withdraw a consent yourself. Use your own, personal sign-in; a member of staff’s
        sign-in cannot be linked.
      </p>
      {accept.error ? <ErrorBanner error={accept.error} /> : null}
      <div className="flex flex-wrap gap-3">
        <Button pending={accept.isPending} pendingLabel="Linking…" onClick={() => accept.mutate()}>
          Link this sign-in to my record
        </Button>
      </div>
      <p className="text-ink-700">If this is not your sign-in, sign out and open the link again.</p>
    </PublicFrame>
  );
}
