import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { useNavigate } from 'react-router-dom';
import type { z } from 'zod';
import { CreateProductionInputSchema } from '#shared/schemas/admin.ts';
import { Button } from '../../../components/ui/button.tsx';
import { ApiError, errorMessage } from '../../../lib/api-client.ts';
import { applyServerErrors } from '../../../lib/form-errors.ts';
import { paths } from '../../../lib/paths.ts';
import { useCreateProduction } from '../api.ts';
import { FormError } from '../../../components/ui/form-error.tsx';
import { PRODUCTION_FIELD_NAMES, ProductionFields, type ProductionFormValues } from './production-fields.tsx';

export function NewProductionForm() {
  const navigate = useNavigate();
  const create = useCreateProduction();
  const [formError, setFormError] = useState<string[] | null>(null);
  const form = useForm<ProductionFormValues, unknown, z.output<typeof CreateProductionInputSchema>>({
    resolver: zodResolver(CreateProductionInputSchema),
    defaultValues: { name: '', startsOn: null, endsOn: null },
  });

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      const production = await create.mutateAsync(values);
      // Next comes the team and the lead, which live on the production's own page.
      void navigate(paths.production.href(production.id));
    } catch (err) {
      const leftover = applyServerErrors(err, form.setError, PRODUCTION_FIELD_NAMES);
      const hadFields = err instanceof ApiError && Object.keys(err.fields).length > leftover.length;
      setFormError(leftover.length ? leftover : hadFields ? null : [errorMessage(err)]);
    }
  });

  return (
    <form noValidate onSubmit={onSubmit} className="flex flex-col gap-4" aria-label="New production" data-testid="new-production-form">
      <ProductionFields register={form.register} errors={form.formState.errors} />
      <FormError messages={formError} />
      <div>
        <Button type="submit" pending={create.isPending} pendingLabel="Creating…">
          Create production
        </Button>
      </div>
    </form>
  );
}
