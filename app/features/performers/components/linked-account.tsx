import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import type { PerformerDetail } from '#shared/schemas/performers.ts';
import { Button } from '../../../components/ui/button.tsx';
import { ConflictNotice } from '../../../components/ui/conflict-notice.tsx';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { PICKER_QUERY, userPickerQueryOptions } from '../../admin/api.ts';
import { useSession } from '../../session/session-context.tsx';
import { useLinkAccount } from '../api.ts';
import { displayName } from './names.tsx';

/**
 * Which sign-in is the performer's own, so they can see their record and withdraw consents.
 * Everyone who may see it sees the link; only a studio administrator picks the user (the user
 * list is theirs alone).
 */
export function LinkedAccount({ performer: p, isSelf, onReload }: { performer: PerformerDetail; isSelf: boolean; onReload: () => Promise<unknown> }) {
  const session = useSession();
  const isAdmin = session.user.isAdmin;
  if (!p.linkedUser && !isAdmin && !p.canEdit) return null;
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
      {isAdmin ? <LinkPicker performer={p} onReload={onReload} /> : !p.linkedUser ? <p className="text-sm text-ink-700">A studio administrator links sign-ins.</p> : null}
    </Section>
  );
}

function LinkPicker({ performer: p, onReload }: { performer: PerformerDetail; onReload: () => Promise<unknown> }) {
  const users = useQuery(userPickerQueryOptions());
  const link = useLinkAccount(p.id);
  const [userId, setUserId] = useState(p.linkedUser?.id ?? '');
  const [reloading, setReloading] = useState(false);
  const conflict = isApiError(link.error, 409) ? link.error : null;
  const fieldError = isApiError(link.error, 400) ? link.error.fields.userId?.join(' ') : undefined;

  async function reload() {
    setReloading(true);
    try {
      await onReload();
      link.reset();
    } finally {
      setReloading(false);
    }
  }

  return (
    <QueryView query={users} loadingLabel="Loading people…">
      {(data) => (
        <form
          noValidate
          className="flex flex-col gap-3"
          aria-label="Link a sign-in"
          onSubmit={(e) => {
            e.preventDefault();
            link.mutate({ userId: userId || null, version: p.version });
          }}
        >
          <SelectField
            label="Link a sign-in"
            className="max-w-md"
            value={userId}
            error={fieldError}
            hint={data.total > PICKER_QUERY.pageSize ? `Showing the first ${PICKER_QUERY.pageSize} people by name.` : 'They get the performer role on this performer’s productions.'}
            onChange={(e) => setUserId(e.target.value)}
          >
            <option value="">No sign-in</option>
            {data.items.map((u) => (
              <option key={u.id} value={u.id}>
                {u.displayName} ({u.email})
              </option>
            ))}
          </SelectField>
          {conflict ? <ConflictNotice error={conflict} onReload={() => void reload()} reloading={reloading} /> : null}
          {link.error && !conflict && !fieldError ? <ErrorBanner error={link.error} /> : null}
          <div className="flex flex-wrap items-center gap-3">
            <Button type="submit" pending={link.isPending} pendingLabel="Saving…" disabled={conflict !== null || userId === (p.linkedUser?.id ?? '')}>
              {userId ? 'Link this sign-in' : 'Unlink'}
            </Button>
            {link.isSuccess ? <output className="font-semibold text-sage-800">Saved.</output> : null}
          </div>
        </form>
      )}
    </QueryView>
  );
}
