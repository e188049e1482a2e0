import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { ALLERGEN_GROUPS, ALLERGEN_GROUP_LABELS } from '#shared/domain/ingredients.ts';
import type { IngredientInput } from '#shared/schemas/catalogue.ts';
import { IngredientSchema } from '#shared/schemas/patch-tests.ts';
import { Button } from '../../../components/ui/button.tsx';
import { CheckboxField } from '../../../components/ui/checkbox-field.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { ApiError, errorMessage } from '../../../lib/api-client.ts';

export interface IngredientFormValues {
  inci: string;
  /** Comma- or semicolon-separated, as people type them. */
  synonyms: string;
  cas: string;
  group: string;
  trivial: boolean;
}

/** The typed form, turned into the API's shape and checked by the shared schema (CAS check digit included). */
const FormSchema = z
  .object({ inci: z.string(), synonyms: z.string(), cas: z.string(), group: z.string(), trivial: z.boolean() })
  .transform((v) => ({
    inci: v.inci,
    synonyms: v.synonyms
      .split(/[;,]/)
      .map((s) => s.trim())
      .filter(Boolean),
    cas: v.cas.trim() === '' ? null : v.cas.trim(),
    group: v.group,
    trivial: v.trivial,
  }))
  .pipe(IngredientSchema);

export function ingredientFormValues(i?: Partial<IngredientInput>): IngredientFormValues {
  return { inci: i?.inci ?? '', synonyms: (i?.synonyms ?? []).join(', '), cas: i?.cas ?? '', group: i?.group ?? '', trivial: i?.trivial ?? false };
}

const FIELDS = ['inci', 'synonyms', 'cas', 'group', 'trivial'] as const;

interface IngredientFormProps {
  defaults: IngredientFormValues;
  submitLabel: string;
  onSubmit: (input: IngredientInput) => Promise<unknown>;
  onCancel?: () => void;
  testId?: string;
}

/** The vocabulary entry's fields; server refusals (a name already taken, say) land under their field. */
export function IngredientForm({ defaults, submitLabel, onSubmit, onCancel, testId }: IngredientFormProps) {
  const [formError, setFormError] = useState<string[] | null>(null);
  const form = useForm<IngredientFormValues, unknown, IngredientInput>({ resolver: zodResolver(FormSchema), defaultValues: defaults });
  const { errors, isSubmitting } = form.formState;

  const submit = form.handleSubmit(async (input) => {
    setFormError(null);
    try {
      await onSubmit(input);
    } catch (err) {
      if (!(err instanceof ApiError)) return setFormError([errorMessage(err)]);
      const leftover: string[] = [];
      for (const [key, messages] of Object.entries(err.fields)) {
        const field = FIELDS.find((f) => key === f || key.startsWith(`${f}.`));
        if (field) form.setError(field, { type: 'server', message: messages.join(' ') }, { shouldFocus: true });
        else leftover.push(...messages);
      }
      if (leftover.length || Object.keys(err.fields).length === 0) setFormError(leftover.length ? leftover : [err.message]);
    }
  });

  return (
    <form
      noValidate
      // Opened from within another form's screen: its submit is its own and goes no further.
      onSubmit={(e) => {
        e.stopPropagation();
        void submit(e);
      }}
      className="flex flex-col gap-4" data-testid={testId}>
      <div className="grid gap-4 md:grid-cols-2">
        <TextField label="INCI name" autoComplete="off" hint="As the label writes it, for example “Colophonium”." error={errors.inci?.message} {...form.register('inci')} />
        <TextField label="CAS number" autoComplete="off" inputMode="numeric" hint="Optional; only when you are sure of it (form 1234-56-7)." error={errors.cas?.message} {...form.register('cas')} />
        <TextField
          label="Other names"
          autoComplete="off"
          className="md:col-span-2"
          hint="Optional. Synonyms and trade spellings, separated by commas."
          error={errors.synonyms?.message}
          {...form.register('synonyms')}
        />
        <SelectField label="Allergen group" error={errors.group?.message} {...form.register('group')}>
          <option value="">Choose a group</option>
          {ALLERGEN_GROUPS.map((g) => (
            <option key={g} value={g}>
              {ALLERGEN_GROUP_LABELS[g]}
            </option>
          ))}
        </SelectField>
        <CheckboxField
          label="Trivial carrier"
          hint="A carrier such as water: two products that both contain it do not “share” an ingredient."
          error={errors.trivial?.message}
          {...form.register('trivial')}
        />
      </div>
      <FormError messages={formError} />
      <div className="flex flex-wrap gap-3">
        <Button type="submit" pending={isSubmitting} pendingLabel="Saving…">
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
