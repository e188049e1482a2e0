import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { useNavigate } from 'react-router-dom';
import { z } from 'zod';
import type { Check } from '#shared/schemas/checks.ts';
import { Button } from '../../../components/ui/button.tsx';
import { CheckboxField } from '../../../components/ui/checkbox-field.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { TextareaField } from '../../../components/ui/textarea-field.tsx';
import { formErrorsFrom } from '../../../lib/form-errors.ts';
import { formatDate } from '../../../lib/format.ts';
import { paths } from '../../../lib/paths.ts';
import { useLogApplication } from '../api.ts';
import { localDate, localInputValue } from './local-time.ts';

const FormSchema = z.object({
  appliedOn: z.string().min(1, 'Choose the date'),
  startedAt: z
    .string()
    .min(1, 'Choose when it started')
    .refine((v) => !Number.isNaN(new Date(v).getTime()), 'Choose when it started'),
  description: z.string().max(500, 'At most 500 characters'),
  notes: z.string().max(2000, 'At most 2000 characters'),
  products: z.array(z.object({ used: z.boolean(), lotId: z.string() })),
});
type FormValues = z.infer<typeof FormSchema>;

/** Logs the application from a check that went: the products used with their lots, and when it started. */
export function LogApplicationForm({ check }: { check: Check }) {
  const navigate = useNavigate();
  const log = useLogApplication();
  const [formError, setFormError] = useState<string[] | null>(null);
  // Appliance materials went into the pieces; the products put on by hand are listed with their lots.
  const direct = check.items.filter((i) => i.fromPieceIds.length === 0);
  const lotsOf = (formulationId: string) => check.lots.filter((l) => l.formulationId === formulationId);
  const [now] = useState(() => new Date());
  const form = useForm<FormValues>({
    resolver: zodResolver(FormSchema),
    defaultValues: { appliedOn: localDate(now), startedAt: localInputValue(now), description: '', notes: '', products: direct.map((i) => ({ used: true, lotId: lotsOf(i.formulationId)[0]?.id ?? '' })) },
  });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit(async (v) => {
    setFormError(null);
    const chosen = direct.flatMap((item, i) => (v.products[i]!.used ? [{ index: i, productId: item.productId, lotId: v.products[i]!.lotId }] : []));
    const missing = chosen.find((c) => !c.lotId);
    if (missing) {
      form.setError(`products.${missing.index}.lotId`, { message: 'Choose the lot' }, { shouldFocus: true });
      return;
    }
    try {
      const a = await log.mutateAsync({
        checkId: check.id,
        appliedOn: v.appliedOn,
        startedAt: new Date(v.startedAt).toISOString(),
        description: v.description || null,
        notes: v.notes || null,
        products: chosen.map((c) => ({ productId: c.productId, lotId: c.lotId })),
        pieceIds: check.pieceIds,
      });
      await navigate(paths.application.href(a.id));
    } catch (err) {
      setFormError(formErrorsFrom(err, form.setError, ['appliedOn', 'startedAt', 'description', 'notes', ...direct.map((_, i) => `products.${i}.lotId` as const)]));
    }
  });

  return (
    <Section title="Log the application" testId="log-application">
      <form noValidate onSubmit={onSubmit} className="flex flex-col gap-4" aria-label="Log the application">
        <div className="grid gap-4 md:grid-cols-2">
          <TextField label="Date" type="date" error={errors.appliedOn?.message} {...form.register('appliedOn')} />
          <TextField label="Started at" type="datetime-local" error={errors.startedAt?.message} {...form.register('startedAt')} />
        </div>
        <TextField label="Appliance or description" hint="For example “scar appliance, left cheek”." autoComplete="off" error={errors.description?.message} {...form.register('description')} />
        <fieldset className="flex flex-col gap-3">
          <legend className="text-base font-semibold text-ink-900">Products used, with their lots</legend>
          {direct.map((item, i) => (
            <div key={item.formulationId} className="grid items-end gap-3 rounded-xl border border-sand-300 p-3 md:grid-cols-2">
              <CheckboxField label={`Used ${item.productName}`} {...form.register(`products.${i}.used`)} />
              <SelectField label={`Lot of ${item.productName}`} error={errors.products?.[i]?.lotId?.message} {...form.register(`products.${i}.lotId`)}>
                <option value="">Choose…</option>
                {lotsOf(item.formulationId).map((l) => (
                  <option key={l.id} value={l.id}>
                    {l.code} (use by {formatDate(l.expiresOn)})
                  </option>
                ))}
              </SelectField>
            </div>
          ))}
        </fieldset>
        {check.pieceIds.length ? <p className="text-ink-700">The {check.pieceIds.length === 1 ? 'appliance piece' : `${check.pieceIds.length} appliance pieces`} in the check will be marked as worn for this application.</p> : null}
        <TextareaField label="Notes" rows={3} error={errors.notes?.message} {...form.register('notes')} />
        <FormError messages={formError} />
        <div>
          <Button type="submit" pending={log.isPending} pendingLabel="Logging…">
            Log the application
          </Button>
        </div>
      </form>
    </Section>
  );
}
