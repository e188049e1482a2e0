import type { FieldErrors, Path, UseFormRegister } from 'react-hook-form';
import type { z } from 'zod';
import { type CreatePerformerInputSchema, PERFORMER_FIELD_KEYS } from '#shared/schemas/performers.ts';
import { TextField } from '../../../components/ui/text-field.tsx';
import { TextareaField } from '../../../components/ui/textarea-field.tsx';

/** The fields both performer forms hold; the edit form adds the version it was based on. */
export type PerformerFormValues = z.input<typeof CreatePerformerInputSchema>;

/** The performer's own fields, named as the API names them (so its field errors land here). */
export const PERFORMER_FIELD_NAMES: readonly Path<PerformerFormValues>[] = PERFORMER_FIELD_KEYS;

/** Every field an engagement row has, for each row on the form. */
export function engagementFieldNames(count: number): Path<PerformerFormValues>[] {
  const names: Path<PerformerFormValues>[] = ['engagements'];
  for (let i = 0; i < count; i++) {
    names.push(`engagements.${i}.productionId`, `engagements.${i}.characterName`, `engagements.${i}.startsOn`, `engagements.${i}.endsOn`);
  }
  return names;
}

// An emptied date box means "no date", which the API spells null, not "".
export const emptyToNull = (v: unknown) => (v === '' || v === undefined ? null : v);

interface FieldsProps {
  register: UseFormRegister<PerformerFormValues>;
  errors: FieldErrors<PerformerFormValues>;
}

/** Names, pronouns and contact details: the same fields on "Add performer" and on the edit page. */
export function PerformerFields({ register, errors }: FieldsProps) {
  return (
    <div className="flex flex-col gap-6">
      <fieldset className="flex flex-col gap-4">
        <legend className="mb-2 text-lg font-bold text-ink-900">Name</legend>
        <div className="grid gap-4 md:grid-cols-2">
          <TextField label="Legal name" autoComplete="off" hint="As on their contract." error={errors.legalName?.message} {...register('legalName')} />
          <TextField label="Preferred name" autoComplete="off" hint="Optional. Shown instead of the legal name." error={errors.preferredName?.message} {...register('preferredName')} />
          <TextField label="Pronouns" autoComplete="off" hint="Optional, in their words (for example “she/her”)." error={errors.pronouns?.message} {...register('pronouns')} />
        </div>
      </fieldset>
      <fieldset className="flex flex-col gap-4">
        <legend className="mb-2 text-lg font-bold text-ink-900">Contact</legend>
        <p className="text-sm text-ink-700">
          Optional. Seen only by those who manage performers and by the performer. The e-mail address is where signing links and signed copies go.
        </p>
        <div className="grid gap-4 md:grid-cols-2">
          <TextField
            label="E-mail"
            type="email"
            autoComplete="off"
            hint="The performer's own address. A new or changed address is unconfirmed until they confirm it from the e-mail Plinth sends there."
            error={errors.email?.message}
            {...register('email')}
          />
          <TextField label="Phone" type="tel" autoComplete="off" error={errors.phone?.message} {...register('phone')} />
          <TextField label="Emergency contact" autoComplete="off" error={errors.emergencyContactName?.message} {...register('emergencyContactName')} />
          <TextField label="Emergency contact’s phone" type="tel" autoComplete="off" error={errors.emergencyContactPhone?.message} {...register('emergencyContactPhone')} />
          <TextField label="Agent" autoComplete="off" error={errors.agentName?.message} {...register('agentName')} />
          <TextField label="Agent’s contact" autoComplete="off" hint="Phone or e-mail." error={errors.agentContact?.message} {...register('agentContact')} />
        </div>
        <TextareaField
          label="Notes"
          hint="Practical notes only. Health details never go here: the designated lead records them."
          rows={3}
          error={errors.notes?.message}
          {...register('notes')}
        />
      </fieldset>
    </div>
  );
}

/** One engagement: the part and the dates on one production. */
export function EngagementFields({
  index,
  productionName,
  register,
  errors,
  readOnly = false,
}: FieldsProps & { index: number; productionName: string; readOnly?: boolean }) {
  const e = errors.engagements?.[index];
  return (
    <fieldset className="flex flex-col gap-3 rounded-xl border border-sand-300 p-4" data-testid="engagement-fields">
      <legend className="px-1 font-bold text-ink-900">{productionName}</legend>
      <input type="hidden" {...register(`engagements.${index}.productionId`)} />
      {readOnly ? (
        <p className="text-sm text-ink-700">You do not manage performers on this production, so this engagement stays as it is.</p>
      ) : null}
      <div className="grid gap-4 md:grid-cols-3">
        <TextField label="Character" autoComplete="off" hint="Optional." readOnly={readOnly} error={e?.characterName?.message} {...register(`engagements.${index}.characterName`)} />
        <TextField label="From" type="date" hint="Optional." readOnly={readOnly} error={e?.startsOn?.message} {...register(`engagements.${index}.startsOn`, { setValueAs: emptyToNull })} />
        <TextField label="To" type="date" hint="Optional." readOnly={readOnly} error={e?.endsOn?.message} {...register(`engagements.${index}.endsOn`, { setValueAs: emptyToNull })} />
      </div>
      {e?.productionId?.message ? <p className="text-sm font-semibold text-brick-700">{e.productionId.message}</p> : null}
    </fieldset>
  );
}
