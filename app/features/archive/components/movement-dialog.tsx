import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery } from '@tanstack/react-query';
import { useId, useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { z } from 'zod';
import { isStorageLevel } from '#shared/domain/archive-locations.ts';
import { MOVEMENT_KIND_LABELS, type MovementKind } from '#shared/domain/archive-movements.ts';
import type { CastDetail, MovementInput } from '#shared/schemas/archive.ts';
import { Button } from '../../../components/ui/button.tsx';
import { CheckboxField } from '../../../components/ui/checkbox-field.tsx';
import { Dialog } from '../../../components/ui/dialog.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { TextareaField } from '../../../components/ui/textarea-field.tsx';
import { formErrorsFrom } from '../../../lib/form-errors.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { castPeopleQueryOptions, placesQueryOptions, useRecordMovement } from '../api.ts';

const text = (max: number) => z.string().trim().max(max, `At most ${max} characters`);
// The archive's rules say what each kind of move needs; the form only bounds lengths and shapes.
const MoveFormSchema = z.object({
  movedBy: text(160),
  authorisedBy: text(160),
  holderUserId: z.string(),
  holder: text(160),
  reason: text(500),
  dueBackAt: z.string(),
  to: z.string(),
  alsoNormal: z.boolean(),
  production: text(160),
  contact: text(200),
  witness: text(160),
  method: text(200),
  note: text(1000),
});
type MoveForm = z.infer<typeof MoveFormSchema>;
const FIELDS = ['movedBy', 'authorisedBy', 'holderUserId', 'holder', 'reason', 'dueBackAt', 'to', 'production', 'contact', 'witness', 'method', 'note'] as const;
const SOMEONE_ELSE = 'someone-else';

/** A date chosen in the form means the end of that working day, in the tablet's time zone. */
function endOfDay(date: string): string | null {
  if (!date) return null;
  const d = new Date(`${date}T17:00`);
  return Number.isNaN(d.getTime()) ? null : d.toISOString();
}

function inputFor(kind: MovementKind, v: MoveForm, version: number): MovementInput {
  const base = { version, movedBy: v.movedBy, authorisedBy: v.authorisedBy, note: v.note || null };
  switch (kind) {
    case 'check_out':
      return { ...base, kind, holderUserId: v.holderUserId && v.holderUserId !== SOMEONE_ELSE ? v.holderUserId : null, holder: v.holder, reason: v.reason, dueBackAt: endOfDay(v.dueBackAt) };
    case 'check_in':
      return { ...base, kind, to: v.to || null };
    case 'relocation':
      return { ...base, kind, to: v.to || null, alsoNormal: v.alsoNormal, reason: v.reason || null };
    case 'loan':
      return { ...base, kind, production: v.production, contact: v.contact || null, reason: v.reason || null, dueBackAt: endOfDay(v.dueBackAt) };
    case 'return_to_performer':
      return { ...base, kind, reason: v.reason || null };
    case 'destruction':
      return { ...base, kind, witness: v.witness, reason: v.reason, method: v.method || null };
  }
}

const TITLES: Record<MovementKind, string> = {
  check_out: 'Check out this cast',
  check_in: 'Check this cast back in',
  relocation: 'Move this cast to another place',
  loan: 'Lend this cast to another production',
  return_to_performer: 'Return this cast to the performer',
  destruction: 'Record the destruction of this cast',
};

/** The form for one kind of move: who moves it and who authorised it, and what that kind needs. */
export function MovementDialog({ cast, kind, onClose }: { cast: CastDetail; kind: MovementKind; onClose: () => void }) {
  const session = useSession();
  const record = useRecordMovement(cast.id);
  const people = useQuery(castPeopleQueryOptions(cast.id));
  const places = useQuery({ ...placesQueryOptions(), enabled: kind === 'check_in' || kind === 'relocation' });
  const [formError, setFormError] = useState<string[] | null>(null);
  const namesId = useId();
  const form = useForm<MoveForm>({
    resolver: zodResolver(MoveFormSchema),
    defaultValues: { movedBy: session.user.displayName, authorisedBy: '', holderUserId: '', holder: '', reason: '', dueBackAt: '', to: '', alsoNormal: false, production: '', contact: '', witness: '', method: '', note: '' },
  });
  const { errors } = form.formState;
  const holderChoice = useWatch({ control: form.control, name: 'holderUserId' });
  const storage = (places.data?.items ?? []).filter((p) => isStorageLevel(p.level));

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      await record.mutateAsync(inputFor(kind, values, cast.version));
      onClose();
    } catch (err) {
      setFormError(formErrorsFrom(err, form.setError, kind === 'check_out' && values.holderUserId !== SOMEONE_ELSE ? FIELDS.filter((f) => f !== 'holder') : FIELDS));
    }
  });

  return (
    <Dialog open onClose={onClose} title={TITLES[kind]} testId="movement-dialog">
      <form noValidate onSubmit={onSubmit} className="flex flex-col gap-4" aria-label={MOVEMENT_KIND_LABELS[kind]}>
        <datalist id={namesId}>
          {(people.data?.items ?? []).map((p) => (
            <option key={p.userId} value={p.name}>
              {p.name}
            </option>
          ))}
        </datalist>
        {kind === 'check_out' ? (
          <>
            <SelectField label="Who is taking it" error={errors.holderUserId?.message} {...form.register('holderUserId')}>
              <option value="">Choose…</option>
              {(people.data?.items ?? []).map((p) => (
                <option key={p.userId} value={p.userId}>
                  {p.name}
                </option>
              ))}
              <option value={SOMEONE_ELSE}>Someone not in Plinth</option>
            </SelectField>
            {holderChoice === SOMEONE_ELSE ? <TextField label="Their name" autoComplete="off" error={errors.holder?.message} {...form.register('holder')} /> : null}
            <TextField label="Why" autoComplete="off" error={errors.reason?.message} {...form.register('reason')} />
            <TextField label="Due back" type="date" hint="Holders in Plinth are e-mailed each day it is overdue." error={errors.dueBackAt?.message} {...form.register('dueBackAt')} />
          </>
        ) : null}
        {kind === 'check_in' || kind === 'relocation' ? (
          <SelectField label={kind === 'check_in' ? 'Back to' : 'To'} error={errors.to?.message} {...form.register('to')}>
            <option value="">{kind === 'check_in' && cast.normalLocation ? `Its normal place (${cast.normalLocation.path})` : 'Choose a shelf or bin…'}</option>
            {storage.map((p) => (
              <option key={p.id} value={p.id}>
                {p.path} — {p.name}
              </option>
            ))}
          </SelectField>
        ) : null}
        {kind === 'relocation' ? (
          <>
            <CheckboxField label="Make this its normal place too" {...form.register('alsoNormal')} />
            <TextField label="Reason (optional)" autoComplete="off" error={errors.reason?.message} {...form.register('reason')} />
          </>
        ) : null}
        {kind === 'loan' ? (
          <>
            <TextField label="Lent to (production)" autoComplete="off" error={errors.production?.message} {...form.register('production')} />
            <TextField label="Contact there (optional)" autoComplete="off" error={errors.contact?.message} {...form.register('contact')} />
            <TextField label="Reason (optional)" autoComplete="off" error={errors.reason?.message} {...form.register('reason')} />
            <TextField label="Due back" type="date" error={errors.dueBackAt?.message} {...form.register('dueBackAt')} />
          </>
        ) : null}
        {kind === 'return_to_performer' ? <TextField label="Reason (optional)" autoComplete="off" error={errors.reason?.message} {...form.register('reason')} /> : null}
        {kind === 'destruction' ? (
          <>
            <p className="rounded-xl border-l-4 border-brick-700 bg-brick-50 p-3 text-ink-900">A destruction cannot be undone. A second person witnesses it, and the reason is kept with the cast’s history.</p>
            <TextField label="Reason" autoComplete="off" error={errors.reason?.message} {...form.register('reason')} />
            <TextField label="Witness" list={namesId} autoComplete="off" hint="Someone other than the person destroying it." error={errors.witness?.message} {...form.register('witness')} />
            <TextField label="How (optional)" autoComplete="off" error={errors.method?.message} {...form.register('method')} />
          </>
        ) : null}
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField label="Moved by" list={namesId} autoComplete="off" error={errors.movedBy?.message} {...form.register('movedBy')} />
          <TextField label="Authorised by" list={namesId} autoComplete="off" error={errors.authorisedBy?.message} {...form.register('authorisedBy')} />
        </div>
        <TextareaField label="Note (optional)" rows={2} error={errors.note?.message} {...form.register('note')} />
        <FormError messages={formError} />
        <div className="flex flex-wrap justify-end gap-3">
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button type="submit" variant={kind === 'destruction' ? 'danger' : 'primary'} pending={record.isPending} pendingLabel="Recording…">
            {`Record the ${MOVEMENT_KIND_LABELS[kind].toLowerCase()}`}
          </Button>
        </div>
      </form>
    </Dialog>
  );
}
