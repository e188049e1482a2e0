import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { CLEARANCE_STATE_LABELS, OVERRIDE_STATES } from '#shared/domain/clearance.ts';
import { OverrideInputSchema, type ClearanceRow } from '#shared/schemas/patch-test-log.ts';
import { Button } from '../../../components/ui/button.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextareaField } from '../../../components/ui/textarea-field.tsx';
import { formErrorsFrom } from '../../../lib/form-errors.ts';
import { useOverride } from '../api.ts';

const FormSchema = OverrideInputSchema.pick({ state: true, note: true });
type Values = z.input<typeof FormSchema>;

/** The lead's override of one product's clearance: a state and a required note, kept with the medical record. */
export function OverrideForm({ performerId, row }: { performerId: string; row: ClearanceRow }) {
  const [open, setOpen] = useState(false);
  const [formError, setFormError] = useState<string[] | null>(null);
  const override = useOverride(performerId);
  const form = useForm<Values, unknown, z.output<typeof FormSchema>>({ resolver: zodResolver(FormSchema), defaultValues: { state: 'caution', note: '' } });
  if (!open) {
    return (
      <Button variant="quiet" onClick={() => setOpen(true)} aria-label={`Override the clearance of ${row.productName}`}>
        Override…
      </Button>
    );
  }
  const onSubmit = form.handleSubmit(async (v) => {
    setFormError(null);
    try {
      await override.mutateAsync({ ...v, formulationId: row.formulationId });
      setOpen(false);
      form.reset();
    } catch (err) {
      setFormError(formErrorsFrom(err, form.setError, ['state', 'note']));
    }
  });
  return (
    <form noValidate onSubmit={onSubmit} className="flex min-w-64 flex-col gap-2" aria-label={`Override for ${row.productName}`}>
      <SelectField label="Set to" error={form.formState.errors.state?.message} {...form.register('state')}>
        {OVERRIDE_STATES.map((s) => (
          <option key={s} value={s}>
            {CLEARANCE_STATE_LABELS[s]}
          </option>
        ))}
      </SelectField>
      <TextareaField label="Note (required)" rows={3} error={form.formState.errors.note?.message} {...form.register('note')} />
      <FormError messages={formError} />
      <div className="flex gap-2">
        <Button type="submit" pending={override.isPending} pendingLabel="Saving…">
          Save the override
        </Button>
        <Button variant="secondary" onClick={() => setOpen(false)}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
