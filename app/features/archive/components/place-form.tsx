import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { z } from 'zod';
import { canHaveParent, LOCATION_LEVELS, LOCATION_LEVEL_LABELS, type LocationLevel } from '#shared/domain/archive-locations.ts';
import { LocationLevelSchema, type Location } from '#shared/schemas/archive.ts';
import { Button } from '../../../components/ui/button.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { TextareaField } from '../../../components/ui/textarea-field.tsx';
import { formErrorsFrom } from '../../../lib/form-errors.ts';

const TOP = 'top';
const PlaceFormSchema = z.object({
  parentId: z.string(),
  level: LocationLevelSchema,
  code: z.string().trim().min(1, 'Give the place a short code, for example R2 or B4.').max(10, 'Keep the short code to 10 characters or fewer.'),
  name: z.string().trim().min(1, 'Give the place a name').max(120, 'At most 120 characters'),
  environment: z.string().trim().max(1000, 'At most 1000 characters'),
});
type PlaceForm = z.infer<typeof PlaceFormSchema>;
export interface PlaceValues {
  parentId: string | null;
  level: LocationLevel;
  code: string;
  name: string;
  environment: string | null;
}

/**
 * A place's parent, level, code, name and environment notes. The level list offers only what
 * may sit in the chosen parent; a place being edited keeps its level.
 */
export function PlaceForm({ places, initial, editing, submitLabel, pending, onSubmit, onCancel }: {
  places: readonly Location[];
  initial?: Partial<PlaceValues>;
  /** The place being edited: its own branch is not offered as a parent, and its level is fixed. */
  editing?: Location;
  submitLabel: string;
  pending: boolean;
  onSubmit: (values: PlaceValues) => Promise<unknown>;
  onCancel?: () => void;
}) {
  const [formError, setFormError] = useState<string[] | null>(null);
  const form = useForm<PlaceForm>({
    resolver: zodResolver(PlaceFormSchema),
    defaultValues: { parentId: initial?.parentId ?? TOP, level: initial?.level ?? 'room', code: initial?.code ?? '', name: initial?.name ?? '', environment: initial?.environment ?? '' },
  });
  const { errors } = form.formState;
  const parentId = useWatch({ control: form.control, name: 'parentId' });
  const parent = places.find((p) => p.id === parentId) ?? null;
  const levels = editing ? [editing.level] : LOCATION_LEVELS.filter((l) => canHaveParent(l, parent?.level ?? null));
  const parents = places.filter((p) => p.level !== 'bin' && (!editing || (p.id !== editing.id && !p.path.startsWith(`${editing.path}/`))));

  const submit = form.handleSubmit(async (v) => {
    setFormError(null);
    try {
      await onSubmit({ parentId: v.parentId === TOP ? null : v.parentId, level: v.level, code: v.code, name: v.name, environment: v.environment || null });
      if (!editing) form.reset({ ...v, code: '', name: '', environment: '' });
    } catch (err) {
      setFormError(formErrorsFrom(err, form.setError, ['parentId', 'level', 'code', 'name', 'environment']));
    }
  });

  return (
    <form noValidate onSubmit={submit} className="flex flex-col gap-4" aria-label={submitLabel}>
      <div className="grid gap-4 md:grid-cols-2">
        <SelectField label="Inside" error={errors.parentId?.message} {...form.register('parentId')}>
          <option value={TOP}>Nothing: a site at the top of the store</option>
          {parents.map((p) => (
            <option key={p.id} value={p.id}>
              {p.path} — {p.name}
            </option>
          ))}
        </SelectField>
        <SelectField label="Level" disabled={Boolean(editing)} error={errors.level?.message} {...form.register('level')}>
          {levels.map((l) => (
            <option key={l} value={l}>
              {LOCATION_LEVEL_LABELS[l]}
            </option>
          ))}
        </SelectField>
        <TextField label="Short code" autoComplete="off" hint="Capitals and digits, for example R2 or B4; unique inside its parent." error={errors.code?.message} {...form.register('code')} />
        <TextField label="Name" autoComplete="off" error={errors.name?.message} {...form.register('name')} />
      </div>
      <TextareaField label="Environment notes (optional)" hint="Temperature, relative humidity, light, anything a move should be judged against." rows={2} error={errors.environment?.message} {...form.register('environment')} />
      <FormError messages={formError} />
      <div className="flex flex-wrap gap-3">
        <Button type="submit" pending={pending} pendingLabel="Saving…">
          {submitLabel}
        </Button>
        {onCancel ? (
          <Button variant="secondary" onClick={onCancel}>
            Cancel
          </Button>
        ) : null}
      </div>
    </form>
  );
}
