import { useId, type InputHTMLAttributes, type ReactNode, type Ref } from 'react';
import { FieldMessages, describedBy, labelClasses } from './field.tsx';

interface FileFieldProps extends Omit<InputHTMLAttributes<HTMLInputElement>, 'id' | 'type'> {
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  ref?: Ref<HTMLInputElement>;
}

/** The browser's own file chooser (it works with every assistive technology), with a 44 px button. */
export function FileField({ label, hint, error, className = '', ...rest }: FileFieldProps) {
  const id = useId();
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  return (
    <div className={`flex flex-col gap-1 ${className}`}>
      <label htmlFor={id} className={labelClasses}>
        {label}
      </label>
      <input
        id={id}
        type="file"
        className={
          'block w-full text-base text-ink-900 file:mr-3 file:min-h-11 file:cursor-pointer file:rounded-lg file:border file:border-clay-700 ' +
          'file:bg-white file:px-4 file:py-2 file:font-semibold file:text-clay-800 hover:file:bg-clay-50 disabled:opacity-60'
        }
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(hintId, errorId, hint, error)}
        {...rest}
      />
      <FieldMessages hintId={hintId} errorId={errorId} hint={hint} error={error} />
    </div>
  );
}
