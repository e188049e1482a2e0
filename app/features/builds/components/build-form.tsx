import { zodResolver } from '@hookform/resolvers/zod';
import { useEffect, useMemo, useState, type ReactNode } from 'react';
import { get, useForm, useWatch, type FieldErrors, type Path } from 'react-hook-form';
import type { z } from 'zod';
import { coatingVolumes } from '#shared/domain/coating.ts';
import { DEMOLD_DEFAULT_NOTE } from '#shared/domain/cure.ts';
import { mixForRun } from '#shared/domain/mix.ts';
import { BODY_REGION_LABELS } from '#shared/domain/archive-casts.ts';
import type { ProductListItem } from '#shared/schemas/catalogue.ts';
import type { MoldOption } from '#shared/schemas/builds.ts';
import { Button } from '../../../components/ui/button.tsx';
import { CheckboxField } from '../../../components/ui/checkbox-field.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { TextareaField } from '../../../components/ui/textarea-field.tsx';
import { ApiError } from '../../../lib/api-client.ts';
import { serverPaths } from '../../../lib/paths.ts';
import { BuildCautions } from './build-cautions.tsx';
import type { BuildFormSchema, BuildFormValues } from './build-values.ts';
import { CoatingFields, CoatingResult } from './coating-fields.tsx';
import { CoatingFormSchema, MixFormSchema, readLive } from './calc-values.ts';
import { MaterialRows } from './material-rows.tsx';
import { useChosenProduct } from './material-choice.tsx';
import { MixFields } from './mix-fields.tsx';
import { WeighOut } from './weigh-out.tsx';

interface BuildFormProps<Out> {
  initial: BuildFormValues;
  /** The API's schema read over the typed form. */
  schema: BuildFormSchema<Out>;
  molds: readonly MoldOption[];
  products: readonly ProductListItem[];
  /** Editing: the mold stays, and lots already listed stay on offer. */
  editing?: { listedLotIds: ReadonlySet<string> };
  submitLabel: string;
  pending: boolean;
  onSubmit: (input: Out) => Promise<unknown>;
  /** Shown above the buttons (a conflict notice, say). */
  notice?: ReactNode;
}

const decimal = { inputMode: 'decimal' as const, autoComplete: 'off' };

/** Which mold, when and by whom, every material with its lot, the weigh-out and what was weighed, coating, cure and pieces. */
export function BuildForm<Out>({ initial, schema, molds, products, editing, submitLabel, pending, onSubmit, notice }: BuildFormProps<Out>) {
  const [formError, setFormError] = useState<string[] | null>(null);
  const [serverErrors, setServerErrors] = useState<Record<string, string[]>>({});
  const form = useForm<z.input<typeof schema>, unknown, z.output<typeof schema>>({ resolver: zodResolver(schema), defaultValues: initial });
  const values = useWatch({ control: form.control }) as BuildFormValues;
  const partA = values.materials.find((m) => m.role === 'part_a');
  const silicone = useChosenProduct(partA?.productId ?? '');

  // The silicone's recorded figures stand in the mix, read-only, as the API insists on them.
  useEffect(() => {
    if (!silicone) return;
    if (silicone.mixRatio) {
      form.setValue('mix.ratio.partA', String(silicone.mixRatio.partA));
      form.setValue('mix.ratio.partB', String(silicone.mixRatio.partB));
    }
    if (silicone.makerMaxSoftenerPercent !== null) form.setValue('mix.softener.makerMaxPercent', String(silicone.makerMaxSoftenerPercent));
  }, [silicone, form]);

  const mix = useMemo(() => readLive(MixFormSchema, values.mix), [values.mix]);
  const plan = useMemo(() => (mix.data ? mixForRun(mix.data) : null), [mix.data]);
  const coating = useMemo(() => readLive(CoatingFormSchema, values.coating), [values.coating]);
  const { errors } = form.formState;
  // Server messages first (they know the catalogue and the archive), then the schema's own.
  const error = (name: string): string | undefined => serverErrors[name]?.join(' ') ?? messageAt(errors, name);
  const sheets = values.materials
    .map((m) => products.find((p) => p.id === m.productId))
    .filter((p): p is ProductListItem => Boolean(p?.hasSafetySheet))
    .map((p) => ({ name: p.name, url: serverPaths.safetySheet(p.id) }));

  const submit = form.handleSubmit(async (input) => {
    setFormError(null);
    setServerErrors({});
    try {
      await onSubmit(input);
    } catch (err) {
      if (err instanceof ApiError && Object.keys(err.fields).length) {
        setServerErrors(err.fields);
        const first = Object.keys(err.fields)[0]!;
        form.setFocus(first as Path<BuildFormValues>);
      } else setFormError([err instanceof Error ? err.message : 'The build was not saved.']);
    }
  });

  return (
    <form noValidate onSubmit={(e) => void submit(e)} className="flex flex-col gap-6" aria-label={submitLabel} data-testid="build-form">
      <BuildCautions sheets={sheets} />
      <Section title="The run">
        <div className="grid gap-4 md:grid-cols-2">
          <SelectField label="Mold" disabled={Boolean(editing)} error={error('moldId')} {...form.register('moldId')}>
            <option value="">Choose…</option>
            {molds.map((m) => (
              <option key={m.id} value={m.id}>
                {m.performerName}: {BODY_REGION_LABELS[m.region].toLowerCase()} {m.labelCode} ({m.productionName})
              </option>
            ))}
          </SelectField>
          <TextField label="Made on" type="date" error={error('madeOn')} {...form.register('madeOn')} />
          <TextField label="Made by" autoComplete="off" error={error('madeBy')} {...form.register('madeBy')} />
          <TextField label="Pieces made" inputMode="numeric" autoComplete="off" error={error('piecesMade')} {...form.register('piecesMade')} />
          <TextField label="Demold after (minutes)" inputMode="numeric" autoComplete="off" hint={DEMOLD_DEFAULT_NOTE} error={error('cureMinutes')} {...form.register('cureMinutes')} />
        </div>
      </Section>
      <Section title="Materials and lots">
        <p className="text-ink-700">Every material in the pieces touches the performer’s skin: name each one with its lot. Expired and retired lots are not offered.</p>
        <MaterialRows form={form} products={products} error={error} listedLotIds={editing?.listedLotIds ?? new Set()} />
      </Section>
      <Section title="The mix">
        <MixFields
          field={(name) => form.register(`mix.${name}` as Path<BuildFormValues>)}
          error={(name) => error(`mix.${name}`) ?? mix.errors[name]?.join(' ')}
          values={values.mix}
          locked={{ ratio: Boolean(silicone?.mixRatio), makerMax: silicone?.makerMaxSoftenerPercent != null }}
        />
        <h3 className="text-lg font-bold text-ink-900">Weigh-out</h3>
        <WeighOut plan={plan} resolution={mix.data?.scaleResolutionG ?? 0.1} />
        <fieldset className="flex flex-col gap-3">
          <legend className="mb-1 text-lg font-bold text-ink-900">What the scale showed</legend>
          <div className="grid gap-4 sm:grid-cols-4">
            <TextField label="Part A weighed (g)" {...decimal} error={error('weighed.partA')} {...form.register('weighed.partA')} />
            <TextField label="Softener weighed (g)" {...decimal} error={error('weighed.softener')} {...form.register('weighed.softener')} />
            <TextField label="Pigment weighed (g)" {...decimal} error={error('weighed.pigment')} {...form.register('weighed.pigment')} />
            <TextField label="Part B weighed (g)" {...decimal} error={error('weighed.partB')} {...form.register('weighed.partB')} />
          </div>
        </fieldset>
      </Section>
      <Section title="Encapsulation coating">
        <CheckboxField label="The pieces were encapsulated with a thinned cap material" {...form.register('withCoating')} />
        {values.withCoating ? (
          <>
            <CoatingFields field={(name) => form.register(`coating.${name}` as Path<BuildFormValues>)} error={(name) => error(`coating.${name}`) ?? coating.errors[name]?.join(' ')} />
            <CoatingResult volumes={coating.data ? coatingVolumes(coating.data, coating.data.targetMl) : null} />
          </>
        ) : null}
      </Section>
      <Section title="Notes">
        <TextareaField label="Notes (optional)" rows={3} error={error('notes')} {...form.register('notes')} />
      </Section>
      {notice}
      <FormError messages={formError} />
      <div>
        <Button type="submit" pending={pending} pendingLabel="Saving…">
          {submitLabel}
        </Button>
      </div>
    </form>
  );
}

/** A schema message at a dotted path; an array's own message sits on it or on its root. */
function messageAt(errors: FieldErrors<BuildFormValues>, name: string): string | undefined {
  const e = get(errors, name) as { message?: string; root?: { message?: string } } | undefined;
  return e?.message ?? e?.root?.message;
}
