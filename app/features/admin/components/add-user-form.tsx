import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { CreateUserInputSchema, type User } from '#shared/schemas/admin.ts';
import { Button } from '../../../components/ui/button.tsx';
import { CheckboxField } from '../../../components/ui/checkbox-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { ApiError, errorMessage } from '../../../lib/api-client.ts';
import { applyServerErrors } from '../../../lib/form-errors.ts';
import { useCreateUser } from '../api.ts';
import { FormError } from '../../../components/ui/form-error.tsx';

export function AddUserForm() {
  const create = useCreateUser();
  const [formError, setFormError] = useState<string[] | null>(null);
  const [added, setAdded] = useState<User | null>(null);
  const form = useForm({
    resolver: zodResolver(CreateUserInputSchema),
    defaultValues: { email: '', displayName: '', isAdmin: false },
  });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    setAdded(null);
    try {
      const user = await create.mutateAsync(values);
      form.reset();
      setAdded(user);
    } catch (err) {
      const leftover = applyServerErrors(err, form.setError, ['email', 'displayName', 'isAdmin']);
      const hadFields = err instanceof ApiError && Object.keys(err.fields).length > leftover.length;
      setFormError(leftover.length ? leftover : hadFields ? null : [errorMessage(err)]);
    }
  });

  return (
    <form noValidate onSubmit={onSubmit} className="flex flex-col gap-4" aria-label="Add user" data-testid="add-user-form">
      <div className="grid gap-4 md:grid-cols-2">
        <TextField
          label="E-mail"
          type="email"
          autoComplete="off"
          hint="The address they will sign in with."
          error={errors.email?.message}
          {...form.register('email')}
        />
        <TextField label="Name" autoComplete="off" error={errors.displayName?.message} {...form.register('displayName')} />
      </div>
      <CheckboxField
        label="Studio administrator"
        hint="Administrators manage users, productions and the designated leads. They do not see health details."
        error={errors.isAdmin?.message}
        {...form.register('isAdmin')}
      />
      <FormError messages={formError} />
      <div className="flex flex-wrap items-center gap-4">
        <Button type="submit" pending={create.isPending} pendingLabel="Adding…">
          Add user
        </Button>
        {added ? (
          <output className="font-semibold text-sage-800">Added {added.displayName}. Give them a role on a production so they can start.</output>
        ) : null}
      </div>
    </form>
  );
}
