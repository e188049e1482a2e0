import type { FieldErrors, UseFormRegister } from 'react-hook-form';
import type { z } from 'zod';
import { PRODUCTION_KINDS, PRODUCTION_KIND_LABELS, type CreateProductionInputSchema } from '#shared/schemas/admin.ts';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';

export type ProductionFormValues = z.input<typeof CreateProductionInputSchema>;
export const PRODUCTION_FIELD_NAMES = ['name', 'kind', 'startsOn', 'endsOn'] as const;

// An emptied date box means "no date", which the API spells null, not "".
const emptyToNull = (v: unknown) => (v === '' || v === undefined ? null : v);

/** The fields shared by "New production" and the edit form. */
export function ProductionFields({ register, errors }: { register: UseFormRegister<ProductionFormValues>; errors: FieldErrors<ProductionFormValues> }) {
  return (
    <div className="grid gap-4 md:grid-cols-2">
      <TextField label="Name" autoComplete="off" error={errors.name?.message} {...register('name')} />
      <SelectField label="Kind" error={errors.kind?.message} {...register('kind')}>
        <option value="">Choose a kind…</option>
        {PRODUCTION_KINDS.map((kind) => (
          <option key={kind} value={kind}>
            {PRODUCTION_KIND_LABELS[kind]}
          </option>
        ))}
      </SelectField>
      <TextField label="Starts on" type="date" hint="Optional." error={errors.startsOn?.message} {...register('startsOn', { setValueAs: emptyToNull })} />
      <TextField label="Ends on" type="date" hint="Optional." error={errors.endsOn?.message} {...register('endsOn', { setValueAs: emptyToNull })} />
    </div>
  );
}
