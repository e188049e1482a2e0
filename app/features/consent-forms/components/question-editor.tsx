import { useWatch, type Control, type FieldErrors, type UseFormRegister, type UseFormSetValue } from 'react-hook-form';
import { QUESTION_TYPES, type QuestionType } from '#shared/domain/questionnaire.ts';
import type { CreateTemplateInput } from '#shared/schemas/consents.ts';
import { Button } from '../../../components/ui/button.tsx';
import { CheckboxField } from '../../../components/ui/checkbox-field.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { TextareaField } from '../../../components/ui/textarea-field.tsx';
import type { TemplateValues } from './template-values.ts';

const QUESTION_TYPE_LABELS: Record<QuestionType, string> = { yes_no: 'Yes or no', short_text: 'Short text', choice: 'Choice of options' };

/** "Known allergies?" → "known_allergies": a first id for a new question, from its label. */
function slugOf(label: string): string {
  return label
    .toLowerCase()
    .normalize('NFKD')
    .replace(/[^a-z0-9]+/g, '_')
    .replace(/^_+|_+$/g, '')
    .slice(0, 40);
}

export interface QuestionEditorProps {
  index: number;
  count: number;
  control: Control<TemplateValues, unknown, CreateTemplateInput>;
  register: UseFormRegister<TemplateValues>;
  setValue: UseFormSetValue<TemplateValues>;
  errors: FieldErrors<TemplateValues>;
  onMove: (to: number) => void;
  onRemove: () => void;
}

/** One question of the form: its text, answer type, id, help, options and flags, with moves up and down. */
export function QuestionEditor({ index: i, count, control, register, setValue, errors, onMove, onRemove }: QuestionEditorProps) {
  const type = useWatch({ control, name: `questions.${i}.type` });
  const id = useWatch({ control, name: `questions.${i}.id` });
  // Every answer to a health-data form is a health detail; the server stores it so whatever is sent.
  const healthForm = useWatch({ control, name: 'kind' }) === 'health_data';
  const e = errors.questions?.[i];
  const n = i + 1;
  return (
    <fieldset className="flex flex-col gap-4 rounded-xl border border-sand-300 p-4" data-testid="question-editor">
      <legend className="px-1 font-bold text-ink-900">Question {n}</legend>
      <div className="grid gap-4 md:grid-cols-3">
        <TextareaField
          label="Question text"
          rows={2}
          className="md:col-span-2"
          error={e?.label?.message}
          {...register(`questions.${i}.label`, {
            onBlur: (ev: React.FocusEvent<HTMLTextAreaElement>) => {
              if (!id) setValue(`questions.${i}.id`, slugOf(ev.target.value), { shouldDirty: true });
            },
          })}
        />
        <SelectField label="Answer" error={e?.type?.message} {...register(`questions.${i}.type`)}>
          {QUESTION_TYPES.map((t) => (
            <option key={t} value={t}>
              {QUESTION_TYPE_LABELS[t]}
            </option>
          ))}
        </SelectField>
        <TextField
          label="Id"
          autoComplete="off"
          hint="Lower-case letters, digits and _. Names the answer on the record."
          error={e?.id?.message}
          {...register(`questions.${i}.id`)}
        />
        <TextField label="Help (optional)" autoComplete="off" className="md:col-span-2" error={e?.help?.message} {...register(`questions.${i}.help`)} />
        {type === 'choice' ? (
          <TextareaField label="Options" hint="One per line; at least two." rows={4} className="md:col-span-3" error={e?.options?.message} {...register(`questions.${i}.options`)} />
        ) : null}
      </div>
      <div className="flex flex-wrap gap-x-6">
        <CheckboxField label="Required" error={e?.required?.message} {...register(`questions.${i}.required`)} />
        {healthForm ? (
          <p className="flex min-h-11 items-center text-sm font-semibold text-ink-800">Health detail: always, on a health-data form.</p>
        ) : (
          <CheckboxField
            label="Health detail"
            hint="Seen only by the designated lead and the performer. Once published, only a designated lead can turn this off."
            error={e?.medical?.message}
            {...register(`questions.${i}.medical`)}
          />
        )}
      </div>
      <div className="flex flex-wrap gap-2">
        <Button variant="secondary" disabled={i === 0} onClick={() => onMove(i - 1)} aria-label={`Move question ${n} up`}>
          <span aria-hidden="true">↑</span> Up
        </Button>
        <Button variant="secondary" disabled={i === count - 1} onClick={() => onMove(i + 1)} aria-label={`Move question ${n} down`}>
          <span aria-hidden="true">↓</span> Down
        </Button>
        <Button variant="quiet" onClick={onRemove} aria-label={`Remove question ${n}`}>
          Remove
        </Button>
      </div>
    </fieldset>
  );
}
