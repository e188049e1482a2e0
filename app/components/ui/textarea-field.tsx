import type { ReactNode, Ref, TextareaHTMLAttributes } from 'react';
import { LabelledField, controlClasses } from './field.tsx';

interface TextareaFieldProps extends Omit<TextareaHTMLAttributes<HTMLTextAreaElement>, 'id'> {
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  ref?: Ref<HTMLTextAreaElement>;
  /** Monospaced text, for source such as Markdown. */
  mono?: boolean;
}

export function TextareaField({ label, hint, error, className = '', rows = 4, mono = false, ...rest }: TextareaFieldProps) {
  return (
    <LabelledField label={label} hint={hint} error={error} className={className}>
      {(wiring) => <textarea {...wiring} rows={rows} className={mono ? `${controlClasses} font-mono text-sm` : controlClasses} {...rest} />}
    </LabelledField>
  );
}
