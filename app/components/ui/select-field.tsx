import type { ReactNode, Ref, SelectHTMLAttributes } from 'react';
import { LabelledField, controlClasses } from './field.tsx';

interface SelectFieldProps extends Omit<SelectHTMLAttributes<HTMLSelectElement>, 'id'> {
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  ref?: Ref<HTMLSelectElement>;
  children: ReactNode;
}

export function SelectField({ label, hint, error, className = '', children, ...rest }: SelectFieldProps) {
  return (
    <LabelledField label={label} hint={hint} error={error} className={className}>
      {(wiring) => (
        <select {...wiring} className={`${controlClasses} pr-8`} {...rest}>
          {children}
        </select>
      )}
    </LabelledField>
  );
}
