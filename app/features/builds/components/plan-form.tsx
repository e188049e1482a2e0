import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { get, useForm, useWatch, type FieldErrors } from 'react-hook-form';
import { z } from 'zod';
import { BODY_REGION_LABELS } from '#shared/domain/archive-casts.ts';
import { SetPlanInputSchema, type ApplianceOutlook } from '#shared/schemas/builds.ts';
import { Button } from '../../../components/ui/button.tsx';
import { ConflictNotice } from '../../../components/ui/conflict-notice.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { formErrorsFrom } from '../../../lib/form-errors.ts';
import { useSetPlan } from '../api.ts';
import { typedNumber } from './calc-values.ts';
import { ShortfallBadge } from './piece-status.tsx';

interface PlanValues {
  shootDaysPlanned: string;
  sparesKind: 'total' | 'perDay';
  spares: string;
  piecesPerDay: string;
}

function planSchema(o: ApplianceOutlook) {
  return z
    .custom<PlanValues>()
    .transform((v): unknown => ({
      productionId: o.productionId,
      moldId: o.mold.id,
      shootDaysPlanned: typedNumber(v.shootDaysPlanned),
      spares: v.sparesKind === 'total' ? { kind: 'total', spares: typedNumber(v.spares) } : { kind: 'perDay', sparesPerDay: typedNumber(v.spares) },
      piecesPerDay: typedNumber(v.piecesPerDay),
      version: o.plan?.version ?? null,
    }))
    .pipe(SetPlanInputSchema);
}

/** The appliance's pieces across its builds against the shoot days still to come, in words. */
export function OutlookSummary({ outlook: o }: { outlook: ApplianceOutlook }) {
  const name = `${o.performer.name}’s ${BODY_REGION_LABELS[o.mold.region].toLowerCase()} (${o.mold.labelCode})`;
  return (
    <div className="flex flex-col gap-2" data-testid="outlook">
      <p className="flex flex-wrap items-center gap-2">
        <ShortfallBadge outlook={o} />
        <span>
          {name}: {o.tally.remaining} {o.tally.remaining === 1 ? 'piece' : 'pieces'} on the shelf across {o.builds} {o.builds === 1 ? 'build' : 'builds'}
          {o.shortfall ? `, ${o.shortfall.needed} needed for ${o.plan!.shootDaysPlanned} shoot ${o.plan!.shootDaysPlanned === 1 ? 'day' : 'days'} still to come with spares.` : '.'}
        </span>
      </p>
      {o.plan ? (
        <p className="text-sm text-ink-700">
          {o.plan.piecesPerDay} {o.plan.piecesPerDay === 1 ? 'piece' : 'pieces'} a day;{' '}
          {o.plan.spares.kind === 'total' ? `${o.plan.spares.spares} spares in all` : `${o.plan.spares.sparesPerDay} spare a day`}. Planned {formatDateTime(o.plan.updatedAt)}
          {o.plan.updatedBy ? ` by ${o.plan.updatedBy}` : ''}.
        </p>
      ) : null}
    </div>
  );
}

/** The head sets the shoot days still to come for one appliance, with spares; the warning on the home page follows. */
export function PlanForm({ outlook: o, onDone }: { outlook: ApplianceOutlook; onDone?: () => void }) {
  const setPlan = useSetPlan();
  const [conflict, setConflict] = useState<unknown>(null);
  const [formError, setFormError] = useState<string[] | null>(null);
  const schema = planSchema(o);
  const form = useForm<z.input<typeof schema>, unknown, z.output<typeof schema>>({
    resolver: zodResolver(schema),
    defaultValues: {
      shootDaysPlanned: o.plan ? String(o.plan.shootDaysPlanned) : '',
      sparesKind: o.plan?.spares.kind ?? 'total',
      spares: o.plan ? String(o.plan.spares.kind === 'total' ? o.plan.spares.spares : o.plan.spares.sparesPerDay) : '2',
      piecesPerDay: String(o.plan?.piecesPerDay ?? 1),
    },
  });
  const kind = useWatch({ control: form.control, name: 'sparesKind' });
  const { errors } = form.formState;
  const message = (name: string) => (get(errors as FieldErrors, name) as { message?: string } | undefined)?.message;
  const submit = form.handleSubmit(async (input) => {
    setFormError(null);
    try {
      await setPlan.mutateAsync(input);
      onDone?.();
    } catch (err) {
      if (isApiError(err, 409)) return setConflict(err);
      setFormError(formErrorsFrom(err, form.setError, ['shootDaysPlanned', 'spares', 'piecesPerDay']));
    }
  });
  return (
    <form noValidate onSubmit={(e) => void submit(e)} aria-label="Plan shoot days" className="flex flex-col gap-3" data-testid="plan-form">
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField label="Shoot days still to come" inputMode="numeric" autoComplete="off" error={message('shootDaysPlanned')} {...form.register('shootDaysPlanned')} />
        <TextField label="Pieces worn a day" inputMode="numeric" autoComplete="off" error={message('piecesPerDay')} {...form.register('piecesPerDay')} />
        <SelectField label="Spares" {...form.register('sparesKind')}>
          <option value="total">A number for the whole shoot</option>
          <option value="perDay">So many for each day</option>
        </SelectField>
        <TextField
          label={kind === 'total' ? 'Spares in all' : 'Spares a day'}
          inputMode="numeric"
          autoComplete="off"
          error={message('spares.spares') ?? message('spares.sparesPerDay') ?? message('spares')}
          {...form.register('spares')}
        />
      </div>
      {conflict ? <ConflictNotice error={conflict} onReload={() => onDone?.()} /> : null}
      <FormError messages={formError} />
      <div>
        <Button type="submit" pending={setPlan.isPending} pendingLabel="Saving…" disabled={conflict !== null}>
          Save the plan
        </Button>
      </div>
    </form>
  );
}
