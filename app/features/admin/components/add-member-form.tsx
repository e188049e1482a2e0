import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { PRODUCTION_ROLES, ROLE_LABELS } from '#shared/policy.ts';
import { AddMembershipInputSchema, type ProductionDetail } from '#shared/schemas/admin.ts';
import { Button } from '../../../components/ui/button.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { ApiError, errorMessage } from '../../../lib/api-client.ts';
import { applyServerErrors } from '../../../lib/form-errors.ts';
import { PICKER_QUERY, useAddMembership, userPickerQueryOptions } from '../api.ts';
import { FormError } from '../../../components/ui/form-error.tsx';

// Empty choices get plain words first; a real choice is then checked by the API's own schema.
const AddMemberFormSchema = z
  .object({ userId: z.string().min(1, 'Choose a person'), role: z.string().min(1, 'Choose a role') })
  .pipe(AddMembershipInputSchema);

export function AddMemberForm({ production }: { production: ProductionDetail }) {
  const users = useQuery(userPickerQueryOptions());
  const add = useAddMembership(production.id);
  const [formError, setFormError] = useState<string[] | null>(null);
  const [added, setAdded] = useState<string | null>(null);
  const form = useForm({ resolver: zodResolver(AddMemberFormSchema), defaultValues: { userId: '', role: '' } });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    setAdded(null);
    try {
      const detail = await add.mutateAsync(values);
      const person = detail.memberships.find((m) => m.userId === values.userId)?.displayName ?? 'They';
      form.reset();
      setAdded(`${person} is now ${ROLE_LABELS[values.role]} on ${detail.name}. Plinth has e-mailed them.`);
    } catch (err) {
      const leftover = applyServerErrors(err, form.setError, ['userId', 'role']);
      const hadFields = err instanceof ApiError && Object.keys(err.fields).length > leftover.length;
      setFormError(leftover.length ? leftover : hadFields ? null : [errorMessage(err)]);
    }
  });

  return (
    <QueryView query={users} loadingLabel="Loading people…">
      {(data) => (
        <form noValidate onSubmit={onSubmit} className="flex flex-col gap-4" aria-label="Add to team" data-testid="add-member-form">
          <div className="grid gap-4 md:grid-cols-2">
            <SelectField
              label="Person"
              error={errors.userId?.message}
              hint={data.total > PICKER_QUERY.pageSize ? `Showing the first ${PICKER_QUERY.pageSize} people by name.` : undefined}
              {...form.register('userId')}
            >
              <option value="">Choose a person…</option>
              {data.items.map((u) => (
                <option key={u.id} value={u.id}>
                  {u.displayName} ({u.email})
                </option>
              ))}
            </SelectField>
            <SelectField label="Role" error={errors.role?.message} {...form.register('role')}>
              <option value="">Choose a role…</option>
              {PRODUCTION_ROLES.map((role) => (
                <option key={role} value={role}>
                  {ROLE_LABELS[role]}
                </option>
              ))}
            </SelectField>
          </div>
          <FormError messages={formError} />
          <div className="flex flex-wrap items-center gap-4">
            <Button type="submit" pending={add.isPending} pendingLabel="Adding…">
              Add to team
            </Button>
            {added ? (
              <output className="font-semibold text-sage-800">{added}</output>
            ) : null}
          </div>
        </form>
      )}
    </QueryView>
  );
}
