import type { InputHTMLAttributes, ReactNode, Ref } from 'react';
import { LabelledField } from './field.tsx';

interface FileFieldProps extends Omit<InputHTMLAttributes<HTMLInputElement>, 'id' | 'type'> {
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  ref?: Ref<HTMLInputElement>;
}

const FILE_CLASSES =
  'block w-full text-base text-graphite-900 file:mr-3 file:min-h-11 file:cursor-pointer file:rounded-lg file:border file:border-verdigris-700 ' +
  'file:bg-white file:px-4 file:py-2 file:font-semibold file:text-verdigris-800 hover:file:bg-verdigris-50 disabled:opacity-60';

/** The browser's own file chooser (it works with every assistive technology), with a 44 px button. */
export function FileField({ label, hint, error, className = '', ...rest }: FileFieldProps) {
  return (
    <LabelledField label={label} hint={hint} error={error} className={className}>
      {(wiring) => <input {...wiring} type="file" className={FILE_CLASSES} {...rest} />}
    </LabelledField>
  );
}
