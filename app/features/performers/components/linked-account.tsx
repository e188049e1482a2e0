import { useState } from 'react';
import type { PerformerDetail } from '#shared/schemas/performers.ts';
import { Button } from '../../../components/ui/button.tsx';
import { ConflictNotice } from '../../../components/ui/conflict-notice.tsx';
import { ConfirmDialog } from '../../../components/ui/dialog.tsx';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { useInviteToSignIn, useUnlinkAccount } from '../api.ts';
import { displayName } from './names.tsx';

/**
 * Which sign-in is the performer's own, so they can see their record and withdraw consents.
 * Staff never pick it: they send an invitation to the address the performer confirmed, and the
 * performer accepts it signed in. Staff may unlink.
 */
export function LinkedAccount({ performer: p, isSelf, onReload }: { performer: PerformerDetail; isSelf: boolean; onReload: () => Promise<unknown> }) {
  const session = useSession();
  const mayAct = session.user.isAdmin || p.canEdit;
  if (!p.linkedUser && !mayAct) return null;
  return (
    <Section title="Sign-in" testId="linked-account">
      {p.linkedUser && isSelf ? (
        <p>
          You sign in as <span className="font-semibold break-all">{p.linkedUser.email}</span>.
        </p>
      ) : p.linkedUser ? (
        <p>
          {displayName(p)} signs in as <span className="font-semibold">{p.linkedUser.displayName}</span> (<span className="break-all">{p.linkedUser.email}</span>).
        </p>
      ) : (
        <p className="text-ink-700">No sign-in is linked. With one, {displayName(p)} can see their own record and withdraw a consent themself.</p>
      )}
      {mayAct && !isSelf ? p.linkedUser ? <UnlinkControl performer={p} onReload={onReload} /> : <InviteControl performer={p} /> : null}
    </Section>
  );
}

function InviteControl({ performer: p }: { performer: PerformerDetail }) {
  const invite = useInviteToSignIn(p.id);
  // Contact details are hidden from an administrator who does not manage the performer; the server decides.
  const unconfirmed = p.contact !== null && (!p.contact.email || !p.contact.emailConfirmed);
  return (
    <div className="flex flex-col gap-3">
      <p className="text-sm text-ink-700">
        Plinth sends {displayName(p)} a one-time invitation at the address they confirmed. Nothing is linked until they accept it, signed in with their
        own sign-in.
      </p>
      {unconfirmed ? (
        <p className="text-sm font-semibold text-ink-800">
          {p.contact?.email ? 'Their e-mail address is not confirmed yet; the invitation can be sent once they confirm it.' : 'Add their e-mail address first.'}
        </p>
      ) : null}
      {invite.isError ? <ErrorBanner error={invite.error} /> : null}
      <div className="flex flex-wrap items-center gap-3">
        <Button variant="secondary" pending={invite.isPending} pendingLabel="Sending…" disabled={unconfirmed} onClick={() => invite.mutate()}>
          Invite to sign in
        </Button>
        {invite.isSuccess ? (
          <output className="font-semibold text-sage-800">
            Invitation sent to <span className="break-all">{invite.data.sentTo}</span>.
          </output>
        ) : null}
      </div>
    </div>
  );
}

function UnlinkControl({ performer: p, onReload }: { performer: PerformerDetail; onReload: () => Promise<unknown> }) {
  const unlink = useUnlinkAccount(p.id);
  const [asking, setAsking] = useState(false);
  const [reloading, setReloading] = useState(false);
  const conflict = isApiError(unlink.error, 409) ? unlink.error : null;

  async function reload() {
    setReloading(true);
    try {
      await onReload();
      unlink.reset();
    } finally {
      setReloading(false);
    }
  }

  return (
    <div className="flex flex-col gap-3">
      {conflict ? <ConflictNotice error={conflict} onReload={() => void reload()} reloading={reloading} /> : null}
      <div>
        <Button variant="danger" disabled={conflict !== null} onClick={() => setAsking(true)}>
          Unlink sign-in
        </Button>
      </div>
      <ConfirmDialog
        open={asking}
        title="Unlink this sign-in?"
        confirmLabel="Unlink"
        pending={unlink.isPending}
        error={unlink.error && !conflict ? unlink.error : null}
        onCancel={() => {
          setAsking(false);
          unlink.reset();
        }}
        onConfirm={() =>
          unlink.mutate(p.version, {
            onSuccess: () => setAsking(false),
            onError: (err) => {
              if (isApiError(err, 409)) setAsking(false);
            },
          })
        }
      >
        <p>
          {displayName(p)} will no longer see their record in Plinth. They and the designated lead are told by e-mail. Linking again needs a new
          invitation that {displayName(p)} accepts.
        </p>
      </ConfirmDialog>
    </div>
  );
}
