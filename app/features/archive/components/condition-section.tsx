import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { CONDITION_GRADES, CONDITION_GRADE_LABELS } from '#shared/domain/archive-casts.ts';
import { ConditionCheckInputSchema, type CastDetail } from '#shared/schemas/archive.ts';
import { Button } from '../../../components/ui/button.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { TextareaField } from '../../../components/ui/textarea-field.tsx';
import { formErrorsFrom } from '../../../lib/form-errors.ts';
import { formatDate } from '../../../lib/format.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { useRecordConditionCheck } from '../api.ts';
import { ConditionBadge } from './cast-status.tsx';
import { PhotoGrid } from './photo-grid.tsx';
import { PhotoUploader } from './photo-uploader.tsx';

const CheckFormSchema = ConditionCheckInputSchema.extend({ notes: z.string().trim().max(4000, 'At most 4000 characters') });
type CheckForm = z.input<typeof CheckFormSchema>;

function today(): string {
  const d = new Date();
  return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}-${String(d.getDate()).padStart(2, '0')}`;
}

/** What the cast was last seen like, every earlier look, and (for the archivist) a new check with photos. */
export function ConditionSection({ cast }: { cast: CastDetail }) {
  const session = useSession();
  const record = useRecordConditionCheck(cast.id);
  const [formError, setFormError] = useState<string[] | null>(null);
  const form = useForm<CheckForm, unknown, z.output<typeof CheckFormSchema>>({
    resolver: zodResolver(CheckFormSchema),
    defaultValues: { checkedOn: today(), checkedBy: session.user.displayName, grade: 'good', notes: '' },
  });
  const { errors } = form.formState;
  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      await record.mutateAsync({ ...values, notes: values.notes || null });
      form.reset({ checkedOn: today(), checkedBy: session.user.displayName, grade: 'good', notes: '' });
    } catch (err) {
      setFormError(formErrorsFrom(err, form.setError, ['checkedOn', 'checkedBy', 'grade', 'notes']));
    }
  });

  return (
    <Section title="Condition" testId="condition-section">
      <p className="flex flex-wrap items-center gap-2">
        <span className="font-semibold">Last seen:</span> <ConditionBadge grade={cast.condition} />
      </p>
      {cast.conditionChecks.length ? (
        <ol className="flex flex-col divide-y divide-sand-200">
          {cast.conditionChecks.map((k) => (
            <li key={k.id} className="flex flex-col gap-2 py-3">
              <p className="flex flex-wrap items-center gap-2">
                <span className="font-semibold">{formatDate(k.checkedOn)}</span>
                <ConditionBadge grade={k.grade} />
                <span className="text-ink-700">checked by {k.checkedBy}</span>
              </p>
              {k.notes ? <p className="max-w-prose">{k.notes}</p> : null}
              <PhotoGrid castId={cast.id} photos={k.photos} canManage={cast.canManage} label={`Photos of the check on ${formatDate(k.checkedOn)}`} />
              {cast.canManage ? <PhotoUploader castId={cast.id} conditionCheckId={k.id} label="Add photos to this check" /> : null}
            </li>
          ))}
        </ol>
      ) : (
        <p className="text-ink-700">No condition check recorded yet.</p>
      )}
      {cast.canManage ? (
        <form noValidate onSubmit={onSubmit} className="flex flex-col gap-4 border-t border-sand-200 pt-4" aria-label="Record a condition check">
          <h3 className="text-lg font-bold">Record a condition check</h3>
          <div className="grid gap-4 md:grid-cols-3">
            <TextField label="Checked on" type="date" error={errors.checkedOn?.message} {...form.register('checkedOn')} />
            <TextField label="Checked by" autoComplete="off" error={errors.checkedBy?.message} {...form.register('checkedBy')} />
            <SelectField label="Condition" error={errors.grade?.message} {...form.register('grade')}>
              {CONDITION_GRADES.map((g) => (
                <option key={g} value={g}>
                  {CONDITION_GRADE_LABELS[g]}
                </option>
              ))}
            </SelectField>
          </div>
          <TextareaField label="What was seen" hint="Needed for poor and damaged, so later checks can tell new damage from old." rows={3} error={errors.notes?.message} {...form.register('notes')} />
          <FormError messages={formError} />
          <div>
            <Button type="submit" pending={record.isPending} pendingLabel="Recording…">
              Record the check
            </Button>
          </div>
        </form>
      ) : null}
    </Section>
  );
}
