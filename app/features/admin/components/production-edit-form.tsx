import { zodResolver } from '@hookform/resolvers/zod';
import { useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { CreateProductionInputSchema, type ProductionDetail } from '#shared/schemas/admin.ts';
import { Button } from '../../../components/ui/button.tsx';
import { ApiError, errorMessage } from '../../../lib/api-client.ts';
import { useVersionedEdit } from '../../../lib/use-versioned-edit.ts';
import { applyServerErrors } from '../../../lib/form-errors.ts';
import { productionQueryOptions, useUpdateProduction } from '../api.ts';
import { VersionedEditNotice } from '../../../components/ui/versioned-edit-notice.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { PRODUCTION_FIELD_NAMES, ProductionFields, type ProductionFormValues } from './production-fields.tsx';

function valuesOf(p: ProductionDetail): ProductionFormValues {
  return { name: p.name, kind: p.kind, startsOn: p.startsOn, endsOn: p.endsOn };
}

function sameFields(a: ProductionDetail, b: ProductionDetail): boolean {
  return a.name === b.name && a.kind === b.kind && a.startsOn === b.startsOn && a.endsOn === b.endsOn;
}

/**
 * Edits name, kind and dates against the production as it was when the form was filled (`base`).
 * Team and lead changes also bump the production's version; when only those changed, nothing
 * this form shows can be lost, so saving uses the newer version instead of failing with 409.
 */
export function ProductionEditForm({ production }: { production: ProductionDetail }) {
  const queryClient = useQueryClient();
  const update = useUpdateProduction(production.id);
  const [base, setBase] = useState(production);
  const [formError, setFormError] = useState<string[] | null>(null);
  const [saved, setSaved] = useState(false);
  const form = useForm<ProductionFormValues, unknown, z.output<typeof CreateProductionInputSchema>>({
    resolver: zodResolver(CreateProductionInputSchema),
    defaultValues: valuesOf(production),
  });
  const { errors, isDirty } = form.formState;

  const edit = useVersionedEdit({
    refetch: () => queryClient.fetchQuery({ ...productionQueryOptions(production.id), staleTime: 0 }),
    onFresh: (fresh) => {
      form.reset(valuesOf(fresh));
      setBase(fresh);
    },
  });

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    setSaved(false);
    // If what this form edits is unchanged since it was filled, a newer version can only mean team
    // or lead changes, and sending it loses nothing. Otherwise send the old one and let the API say 409.
    const version = sameFields(production, base) ? production.version : base.version;
    try {
      const fresh = await edit.save(() => update.mutateAsync({ ...values, version }));
      if (!fresh) return;
      form.reset(valuesOf(fresh));
      setBase(fresh);
      setSaved(true);
    } catch (err) {
      const leftover = applyServerErrors(err, form.setError, PRODUCTION_FIELD_NAMES);
      const hadFields = err instanceof ApiError && Object.keys(err.fields).length > leftover.length;
      setFormError(leftover.length ? leftover : hadFields ? null : [errorMessage(err)]);
    }
  });


  return (
    <form noValidate onSubmit={onSubmit} className="flex flex-col gap-4" aria-label="Production details" data-testid="production-edit-form">
      <ProductionFields register={form.register} errors={errors} />
      <VersionedEditNotice edit={edit} />
      <FormError messages={formError} />
      <div className="flex flex-wrap items-center gap-4">
        <Button type="submit" pending={update.isPending} pendingLabel="Saving…" disabled={edit.conflict !== null}>
          Save changes
        </Button>
        {saved && !isDirty ? (
          <output className="font-semibold text-sage-800">Saved.</output>
        ) : null}
      </div>
    </form>
  );
}
