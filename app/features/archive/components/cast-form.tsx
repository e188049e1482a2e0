import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery } from '@tanstack/react-query';
import { useId, useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { z } from 'zod';
import { BODY_REGIONS, BODY_REGION_LABELS, CAST_KINDS, CAST_KIND_LABELS, CAST_MATERIAL_SUGGESTIONS } from '#shared/domain/archive-casts.ts';
import { isStorageLevel } from '#shared/domain/archive-locations.ts';
import { BodyRegionSchema, CastKindSchema, CreateCastInputSchema } from '#shared/schemas/archive.ts';
import { CalendarDateSchema } from '#shared/schemas/common.ts';
import { Button } from '../../../components/ui/button.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { TextareaField } from '../../../components/ui/textarea-field.tsx';
import { formErrorsFrom } from '../../../lib/form-errors.ts';
import { performerCastsQueryOptions, placesQueryOptions } from '../api.ts';
import { castTitle } from './cast-status.tsx';

const CastFormSchema = z.object({
  performerId: z.string().min(1, 'Choose the performer'),
  productionId: z.string().min(1, 'Choose the production the cast was made for'),
  region: BodyRegionSchema,
  kind: CastKindSchema,
  material: CreateCastInputSchema.shape.material,
  madeOn: CalendarDateSchema,
  madeBy: CreateCastInputSchema.shape.madeBy,
  pouredFromId: z.string(),
  locationId: z.string(),
  notes: z.string().trim().max(4000, 'At most 4000 characters'),
});
export type CastFormValues = z.infer<typeof CastFormSchema>;
const FIELDS = ['performerId', 'productionId', 'region', 'kind', 'material', 'madeOn', 'madeBy', 'pouredFromId', 'locationId', 'notes'] as const;

interface CastFormProps {
  initial: CastFormValues;
  performers: readonly { id: string; name: string }[];
  productions: readonly { id: string; name: string }[];
  /** Editing an existing cast: performer, production and place are fixed (places change by movements). */
  editingId?: string;
  submitLabel: string;
  pending: boolean;
  onSubmit: (values: CastFormValues) => Promise<unknown>;
}

/** What a cast is: whose, from which production, which region and kind, its material, maker and source. */
export function CastForm({ initial, performers, productions, editingId, submitLabel, pending, onSubmit }: CastFormProps) {
  const [formError, setFormError] = useState<string[] | null>(null);
  const materialsId = useId();
  const form = useForm<CastFormValues>({ resolver: zodResolver(CastFormSchema), defaultValues: initial });
  const { errors } = form.formState;
  const [performerId, kind] = useWatch({ control: form.control, name: ['performerId', 'kind'] });
  const casts = useQuery({ ...performerCastsQueryOptions(performerId), enabled: Boolean(performerId) });
  const places = useQuery({ ...placesQueryOptions(), enabled: !editingId });
  const molds = casts.data?.view === 'staff' ? casts.data.items.filter((c) => c.kind === 'mold' && c.id !== editingId) : [];

  const submit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      await onSubmit(values);
    } catch (err) {
      setFormError(formErrorsFrom(err, form.setError, FIELDS));
    }
  });

  return (
    <form noValidate onSubmit={submit} className="flex flex-col gap-4" aria-label={submitLabel} data-testid="cast-form">
      <datalist id={materialsId}>
        {CAST_MATERIAL_SUGGESTIONS.map((m) => (
          <option key={m} value={m}>
            {m}
          </option>
        ))}
      </datalist>
      <div className="grid gap-4 md:grid-cols-2">
        <SelectField label="Performer" disabled={Boolean(editingId)} error={errors.performerId?.message} {...form.register('performerId')}>
          <option value="">Choose…</option>
          {performers.map((p) => (
            <option key={p.id} value={p.id}>
              {p.name}
            </option>
          ))}
        </SelectField>
        <SelectField label="Made for (production)" disabled={Boolean(editingId)} error={errors.productionId?.message} {...form.register('productionId')}>
          <option value="">Choose…</option>
          {productions.map((p) => (
            <option key={p.id} value={p.id}>
              {p.name}
            </option>
          ))}
        </SelectField>
        <SelectField label="Body region" error={errors.region?.message} {...form.register('region')}>
          {BODY_REGIONS.map((r) => (
            <option key={r} value={r}>
              {BODY_REGION_LABELS[r]}
            </option>
          ))}
        </SelectField>
        <SelectField label="Kind" error={errors.kind?.message} {...form.register('kind')}>
          {CAST_KINDS.map((k) => (
            <option key={k} value={k}>
              {CAST_KIND_LABELS[k]}
            </option>
          ))}
        </SelectField>
        <TextField label="Material" list={materialsId} autoComplete="off" error={errors.material?.message} {...form.register('material')} />
        <TextField label="Made on" type="date" error={errors.madeOn?.message} {...form.register('madeOn')} />
        <TextField label="Made by" autoComplete="off" error={errors.madeBy?.message} {...form.register('madeBy')} />
        {kind === 'positive' || kind === 'core' ? (
          <SelectField label="Poured from (optional)" error={errors.pouredFromId?.message} {...form.register('pouredFromId')}>
            <option value="">Not poured from a mold in the archive</option>
            {molds.map((m) => (
              <option key={m.id} value={m.id}>
                {castTitle(m)} {m.labelCode}
              </option>
            ))}
          </SelectField>
        ) : null}
        {!editingId ? (
          <SelectField label="Shelf or bin" hint="Where it goes now; this is also its normal place." error={errors.locationId?.message} {...form.register('locationId')}>
            <option value="">Choose…</option>
            {(places.data?.items ?? [])
              .filter((p) => isStorageLevel(p.level))
              .map((p) => (
                <option key={p.id} value={p.id}>
                  {p.path} — {p.name}
                </option>
              ))}
          </SelectField>
        ) : null}
      </div>
      <TextareaField label="Notes (optional)" rows={3} error={errors.notes?.message} {...form.register('notes')} />
      <FormError messages={formError} />
      <div>
        <Button type="submit" pending={pending} pendingLabel="Saving…">
          {submitLabel}
        </Button>
      </div>
    </form>
  );
}
