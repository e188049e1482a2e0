import { useId, type ReactNode, type Ref, type TextareaHTMLAttributes } from 'react';
import { FieldMessages, controlClasses, describedBy, labelClasses } from './field.tsx';

interface TextareaFieldProps extends Omit<TextareaHTMLAttributes<HTMLTextAreaElement>, 'id'> {
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  ref?: Ref<HTMLTextAreaElement>;
  /** Monospaced text, for source such as Markdown. */
  mono?: boolean;
}

export function TextareaField({ label, hint, error, className = '', rows = 4, mono = false, ...rest }: TextareaFieldProps) {
  const id = useId();
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  return (
    <div className={`flex flex-col gap-1 ${className}`}>
      <label htmlFor={id} className={labelClasses}>
        {label}
      </label>
      <textarea
        id={id}
        rows={rows}
        className={mono ? `${controlClasses} font-mono text-sm` : controlClasses}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(hintId, errorId, hint, error)}
        {...rest}
      />
      <FieldMessages hintId={hintId} errorId={errorId} hint={hint} error={error} />
    </div>
  );
}
