import type { InputHTMLAttributes, ReactNode, Ref } from 'react';
import { LabelledField, controlClasses } from './field.tsx';

interface TextFieldProps extends Omit<InputHTMLAttributes<HTMLInputElement>, 'id'> {
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  ref?: Ref<HTMLInputElement>;
}

/** A labelled input; a visible label always, never a placeholder standing in for one. */
export function TextField({ label, hint, error, className = '', type = 'text', ...rest }: TextFieldProps) {
  return (
    <LabelledField label={label} hint={hint} error={error} className={className}>
      {(wiring) => <input {...wiring} type={type} className={controlClasses} {...rest} />}
    </LabelledField>
  );
}
