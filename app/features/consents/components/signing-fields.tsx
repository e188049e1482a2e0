// The big, finger-sized fields of the signing form: one question, a text box, and an error line.
import { useId } from 'react';
import { useController, type Control } from 'react-hook-form';
import type { Question } from '#shared/domain/questionnaire.ts';
import { describedBy } from '../../../components/ui/field.tsx';
import type { SigningValues } from './signing-form.tsx';

export function ErrorLine({ id, message }: { id: string; message: string }) {
  return (
    <p id={id} className="flex items-start gap-1 text-lg font-semibold text-brick-700">
      <span aria-hidden="true">!</span>
      {message}
    </p>
  );
}

type BigTextFieldProps = React.InputHTMLAttributes<HTMLInputElement> & { label: string; hint?: string; error?: string; ref?: React.Ref<HTMLInputElement> };

export function BigTextField({ label, hint, error, ...rest }: BigTextFieldProps) {
  const id = useId();
  return (
    <div className="flex flex-col gap-2">
      <label htmlFor={id} className="text-xl font-semibold text-ink-900">
        {label}
      </label>
      {hint ? (
        <p id={`${id}-hint`} className="text-ink-700">
          {hint}
        </p>
      ) : null}
      <input
        id={id}
        type="text"
        className="block min-h-14 w-full rounded-xl border-2 border-ink-500 bg-white px-4 py-2 text-xl text-ink-900 aria-invalid:border-brick-700 disabled:bg-sand-100"
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(`${id}-hint`, `${id}-error`, hint, error)}
        {...rest}
      />
      {error ? <ErrorLine id={`${id}-error`} message={error} /> : null}
    </div>
  );
}

export function QuestionField({ question: q, control, error, disabled }: { question: Question; control: Control<SigningValues>; error?: string; disabled: boolean }) {
  const id = useId();
  const name = `answers.${q.id}` as const;
  const { field } = useController({ control, name });
  const helpId = `${id}-help`;
  const errorId = `${id}-error`;
  const medicalId = `${id}-medical`;
  const described = [q.help ? helpId : null, q.medical ? medicalId : null, error ? errorId : null].filter(Boolean).join(' ') || undefined;

  const legend = (
    <>
      <span>{q.label}</span> <span className="text-base font-normal text-ink-700">{q.required ? '(required)' : '(optional)'}</span>
    </>
  );
  const notes = (
    <>
      {q.help ? (
        <p id={helpId} className="text-ink-700">
          {q.help}
        </p>
      ) : null}
      {q.medical ? (
        <p id={medicalId} className="text-base text-ink-700">
          Health detail: only the production’s designated lead and you will see this answer.
        </p>
      ) : null}
      {error ? <ErrorLine id={errorId} message={error} /> : null}
    </>
  );

  if (q.type === 'short_text') {
    return (
      <div className="flex flex-col gap-2" data-testid={`question-${q.id}`}>
        <label htmlFor={id} className="text-xl font-semibold text-ink-900">
          {legend}
        </label>
        <input
          id={id}
          ref={field.ref}
          name={field.name}
          type="text"
          autoComplete="off"
          value={typeof field.value === 'string' ? field.value : ''}
          onChange={(e) => field.onChange(e.target.value)}
          onBlur={field.onBlur}
          disabled={disabled}
          className="block min-h-14 w-full rounded-xl border-2 border-ink-500 bg-white px-4 py-2 text-xl text-ink-900 aria-invalid:border-brick-700 disabled:bg-sand-100"
          aria-invalid={error ? true : undefined}
          aria-describedby={described}
        />
        {notes}
      </div>
    );
  }

  const options: { label: string; value: boolean | string }[] =
    q.type === 'yes_no' ? [{ label: 'Yes', value: true }, { label: 'No', value: false }] : (q.options ?? []).map((o) => ({ label: o, value: o }));

  return (
    <fieldset className="flex flex-col gap-3" aria-describedby={described} data-testid={`question-${q.id}`}>
      <legend className="mb-2 text-xl font-semibold text-ink-900">{legend}</legend>
      <div className={q.type === 'yes_no' ? 'grid grid-cols-2 gap-3' : 'flex flex-col gap-3'}>
        {options.map((o, i) => (
          <label
            key={String(o.value)}
            className={`flex min-h-14 cursor-pointer items-center gap-4 rounded-xl border-2 bg-white px-4 py-2 text-xl font-semibold text-ink-900 has-checked:border-clay-700 has-checked:bg-clay-50 ${
              error ? 'border-brick-700' : 'border-ink-500'
            }`}
          >
            <input
              ref={i === 0 ? field.ref : undefined}
              type="radio"
              name={`${id}-${q.id}`}
              className="size-7 shrink-0 cursor-pointer accent-clay-700"
              checked={field.value === o.value}
              onChange={() => field.onChange(o.value)}
              onBlur={field.onBlur}
              disabled={disabled}
            />
            <span>{o.label}</span>
          </label>
        ))}
      </div>
      {notes}
    </fieldset>
  );
}
