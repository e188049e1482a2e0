import { zodResolver } from '@hookform/resolvers/zod';
import { useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { UpdateUserInputSchema, type User } from '#shared/schemas/admin.ts';
import { Button } from '../../../components/ui/button.tsx';
import { CheckboxField } from '../../../components/ui/checkbox-field.tsx';
import { Dialog } from '../../../components/ui/dialog.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { ApiError, errorMessage } from '../../../lib/api-client.ts';
import { applyServerErrors } from '../../../lib/form-errors.ts';
import { useEndSessions, useUpdateUser, userQueryOptions } from '../api.ts';
import { VersionedEditNotice } from '../../../components/ui/versioned-edit-notice.tsx';
import { useVersionedEdit } from '../../../lib/use-versioned-edit.ts';
import { FormError } from '../../../components/ui/form-error.tsx';

export function EditUserDialog({ user, onClose }: { user: User | null; onClose: () => void }) {
  return (
    <Dialog open={user !== null} onClose={onClose} title={user ? `Edit ${user.displayName}` : 'Edit user'} testId="edit-user-dialog">
      {/* Keyed by id, so opening another person starts from their saved values. */}
      {user ? <EditUserForm key={user.id} user={user} onDone={onClose} /> : null}
    </Dialog>
  );
}

function EditUserForm({ user, onDone }: { user: User; onDone: () => void }) {
  const queryClient = useQueryClient();
  const update = useUpdateUser();
  const [formError, setFormError] = useState<string[] | null>(null);
  // The version travels with the form: it is the version this person saw, not whatever is newest.
  const form = useForm({
    resolver: zodResolver(UpdateUserInputSchema),
    defaultValues: { displayName: user.displayName, isAdmin: user.isAdmin, version: user.version },
  });
  const { errors } = form.formState;
  const edit = useVersionedEdit({
    refetch: () => queryClient.fetchQuery({ ...userQueryOptions(user.id), staleTime: 0 }),
    onFresh: (fresh) => form.reset({ displayName: fresh.displayName, isAdmin: fresh.isAdmin, version: fresh.version }),
  });

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      if (await edit.save(() => update.mutateAsync({ id: user.id, input: values }))) onDone();
    } catch (err) {
      const leftover = applyServerErrors(err, form.setError, ['displayName', 'isAdmin']);
      const hadFields = err instanceof ApiError && Object.keys(err.fields).length > leftover.length;
      setFormError(leftover.length ? leftover : hadFields ? null : [errorMessage(err)]);
    }
  });

  return (
    <form noValidate onSubmit={onSubmit} className="flex flex-col gap-4">
      <p className="text-ink-700">
        E-mail: <span className="font-semibold break-all text-ink-900">{user.email}</span>
      </p>
      <TextField label="Name" autoComplete="off" error={errors.displayName?.message} {...form.register('displayName')} />
      <CheckboxField label="Studio administrator" error={errors.isAdmin?.message} {...form.register('isAdmin')} />
      <VersionedEditNotice edit={edit} />
      <FormError messages={formError} />
      <EndSessions userId={user.id} name={user.displayName} />
      <div className="flex flex-wrap justify-end gap-3">
        <Button variant="secondary" onClick={onDone}>
          Cancel
        </Button>
        <Button type="submit" pending={update.isPending} pendingLabel="Saving…" disabled={edit.conflict !== null}>
          Save
        </Button>
      </div>
    </form>
  );
}

/** A lost tablet or a left-behind sign-in: every session of this person ends at once. */
function EndSessions({ userId, name }: { userId: string; name: string }) {
  const end = useEndSessions(userId);
  return (
    <div className="flex flex-wrap items-center gap-3 border-t border-sand-300 pt-4">
      <Button variant="secondary" pending={end.isPending} pendingLabel="Signing out…" onClick={() => end.mutate()}>
        Sign {name} out everywhere
      </Button>
      {end.isSuccess ? <output className="text-sm font-semibold">{end.data.ended === 1 ? '1 session ended.' : `${end.data.ended} sessions ended.`}</output> : null}
      {end.isError ? <output className="text-sm font-semibold">{errorMessage(end.error)}</output> : null}
    </div>
  );
}
