import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { z } from 'zod';
import { SKIN_CHECK_OUTCOME_LABELS, SKIN_CHECK_OUTCOMES } from '#shared/domain/applications.ts';
import type { Application } from '#shared/schemas/applications.ts';
import { Button } from '../../../components/ui/button.tsx';
import { CheckboxField } from '../../../components/ui/checkbox-field.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { TextareaField } from '../../../components/ui/textarea-field.tsx';
import { VersionedEditNotice } from '../../../components/ui/versioned-edit-notice.tsx';
import { api } from '../../../lib/api-client.ts';
import { formErrorsFrom } from '../../../lib/form-errors.ts';
import { useVersionedEdit } from '../../../lib/use-versioned-edit.ts';
import { CheckSchema } from '#shared/schemas/checks.ts';
import { useQuery } from '@tanstack/react-query';
import { applicationQueryOptions, useFinishApplication, useSkinCheck } from '../api.ts';
import { localInputValue } from './local-time.ts';

const FinishSchema = z.object({
  endedAt: z
    .string()
    .min(1, 'Choose when it came off')
    .refine((v) => !Number.isNaN(new Date(v).getTime()), 'Choose when it came off'),
  removal: z.array(z.object({ used: z.boolean(), lotId: z.string() })),
});
type FinishValues = z.infer<typeof FinishSchema>;

/** When the application came off and with which of the checked products (removers among them). */
export function FinishForm({ application }: { application: Application }) {
  const finish = useFinishApplication(application.id);
  const [formError, setFormError] = useState<string[] | null>(null);
  // The lots still usable of each checked product, from the check itself.
  const check = useQuery({ queryKey: ['checks', application.check.id], queryFn: ({ signal }) => api.get(`/api/checks/${encodeURIComponent(application.check.id)}`, CheckSchema, signal) });
  const items = application.check.items.filter((i) => i.fromPieceIds.length === 0);
  const lotsOf = (formulationId: string) => check.data?.lots.filter((l) => l.formulationId === formulationId) ?? [];
  const [openedAt] = useState(() => new Date());
  const form = useForm<FinishValues>({ resolver: zodResolver(FinishSchema), defaultValues: { endedAt: localInputValue(openedAt), removal: items.map(() => ({ used: false, lotId: '' })) } });
  const application$ = useQuery(applicationQueryOptions(application.id));
  const edit = useVersionedEdit({ refetch: async () => (await application$.refetch()).data!, onFresh: () => undefined });
  const { errors } = form.formState;
  const onSubmit = form.handleSubmit(async (v) => {
    setFormError(null);
    const chosen = items.flatMap((item, i) => (v.removal[i]!.used ? [{ index: i, productId: item.productId, lotId: v.removal[i]!.lotId }] : []));
    const missing = chosen.find((c) => !c.lotId);
    if (missing) return form.setError(`removal.${missing.index}.lotId`, { message: 'Choose the lot' }, { shouldFocus: true });
    try {
      await edit.save(() => finish.mutateAsync({ endedAt: new Date(v.endedAt).toISOString(), removalProducts: chosen.map((c) => ({ productId: c.productId, lotId: c.lotId })), version: application.version }));
    } catch (err) {
      setFormError(formErrorsFrom(err, form.setError, ['endedAt', ...items.map((_, i) => `removal.${i}.lotId` as const)]));
    }
  });
  return (
    <form noValidate onSubmit={onSubmit} className="flex flex-col gap-3" aria-label="Record the removal">
      <TextField label="Came off at" type="datetime-local" error={errors.endedAt?.message} {...form.register('endedAt')} />
      <fieldset className="flex flex-col gap-2">
        <legend className="text-base font-semibold text-ink-900">Removal products, with their lots</legend>
        {items.map((item, i) => (
          <div key={item.formulationId} className="grid items-end gap-3 md:grid-cols-2">
            <CheckboxField label={`Removed with ${item.productName}`} {...form.register(`removal.${i}.used`)} />
            <SelectField label={`Lot of ${item.productName} for removal`} error={errors.removal?.[i]?.lotId?.message} {...form.register(`removal.${i}.lotId`)}>
              <option value="">Choose…</option>
              {lotsOf(item.formulationId).map((l) => (
                <option key={l.id} value={l.id}>
                  {l.code}
                </option>
              ))}
            </SelectField>
          </div>
        ))}
      </fieldset>
      <VersionedEditNotice edit={edit} />
      <FormError messages={formError} />
      <div>
        <Button type="submit" pending={finish.isPending} pendingLabel="Saving…">
          Record the removal
        </Button>
      </div>
    </form>
  );
}

const SkinSchema = z
  .object({ outcome: z.enum(SKIN_CHECK_OUTCOMES, { message: 'Choose what you see' }), observation: z.string().max(4000, 'At most 4000 characters') })
  .superRefine((v, ctx) => {
    if (v.outcome !== 'clear' && !v.observation.trim()) ctx.addIssue({ code: 'custom', path: ['observation'], message: 'Describe what you see' });
  });
type SkinValues = z.input<typeof SkinSchema>;

/** The skin check after removal: clear, or redness or a reaction with what you see (sent to the lead, then out of view). */
export function SkinCheckForm({ application }: { application: Application }) {
  const record = useSkinCheck(application.id);
  const [formError, setFormError] = useState<string[] | null>(null);
  const form = useForm<SkinValues>({ resolver: zodResolver(SkinSchema), defaultValues: { outcome: undefined, observation: '' } });
  const outcome = useWatch({ control: form.control, name: 'outcome' });
  const { errors } = form.formState;
  const onSubmit = form.handleSubmit(async (v) => {
    setFormError(null);
    try {
      await record.mutateAsync({ outcome: v.outcome, observation: v.outcome === 'clear' ? null : v.observation });
    } catch (err) {
      setFormError(formErrorsFrom(err, form.setError, ['outcome', 'observation']));
    }
  });
  return (
    <form noValidate onSubmit={onSubmit} className="flex flex-col gap-3" aria-label="Skin check after removal">
      <fieldset className="flex flex-col gap-2" aria-describedby={errors.outcome ? 'outcome-error' : undefined}>
        <legend className="text-base font-semibold text-ink-900">What do you see?</legend>
        <div className="flex flex-wrap gap-2">
          {SKIN_CHECK_OUTCOMES.map((o) => (
            <label key={o} className="flex min-h-11 cursor-pointer items-center gap-2 rounded-lg border border-sand-300 px-4">
              <input type="radio" value={o} className="size-5" {...form.register('outcome')} />
              {SKIN_CHECK_OUTCOME_LABELS[o]}
            </label>
          ))}
        </div>
        {errors.outcome ? (
          <p id="outcome-error" className="text-sm font-semibold text-brick-700">
            {errors.outcome.message}
          </p>
        ) : null}
      </fieldset>
      {outcome && outcome !== 'clear' ? (
        <TextareaField label="What you see" rows={3} hint="Where, how large, and how it changed. This goes to the designated lead; once sent, you will see only that it was sent." error={errors.observation?.message} {...form.register('observation')} />
      ) : null}
      <FormError messages={formError} />
      <div>
        <Button type="submit" pending={record.isPending} pendingLabel="Saving…">
          {outcome && outcome !== 'clear' ? 'Send the report to the lead' : 'Record the skin check'}
        </Button>
      </div>
    </form>
  );
}
