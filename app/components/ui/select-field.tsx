import { useId, type ReactNode, type Ref, type SelectHTMLAttributes } from 'react';
import { FieldMessages, controlClasses, describedBy, labelClasses } from './field.tsx';

interface SelectFieldProps extends Omit<SelectHTMLAttributes<HTMLSelectElement>, 'id'> {
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  ref?: Ref<HTMLSelectElement>;
  children: ReactNode;
}

export function SelectField({ label, hint, error, className = '', children, ...rest }: SelectFieldProps) {
  const id = useId();
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  return (
    <div className={`flex flex-col gap-1 ${className}`}>
      <label htmlFor={id} className={labelClasses}>
        {label}
      </label>
      <select
        id={id}
        className={`${controlClasses} pr-8`}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(hintId, errorId, hint, error)}
        {...rest}
      >
        {children}
      </select>
      <FieldMessages hintId={hintId} errorId={errorId} hint={hint} error={error} />
    </div>
  );
}
