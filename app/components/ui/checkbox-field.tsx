import { useId, type InputHTMLAttributes, type ReactNode, type Ref } from 'react';
import { FieldMessages, describedBy } from './field.tsx';

interface CheckboxFieldProps extends Omit<InputHTMLAttributes<HTMLInputElement>, 'id' | 'type'> {
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  ref?: Ref<HTMLInputElement>;
}

export function CheckboxField({ label, hint, error, className = '', ...rest }: CheckboxFieldProps) {
  const id = useId();
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  return (
    <div className={`flex flex-col gap-1 ${className}`}>
      {/* The whole label row is the 44 px target, not just the small box. */}
      <label htmlFor={id} className="inline-flex min-h-11 cursor-pointer items-center gap-3 font-semibold text-graphite-900">
        <input
          id={id}
          type="checkbox"
          className="size-6 shrink-0 cursor-pointer accent-verdigris-700"
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy(hintId, errorId, hint, error)}
          {...rest}
        />
        <span>{label}</span>
      </label>
      <FieldMessages hintId={hintId} errorId={errorId} hint={hint} error={error} />
    </div>
  );
}
