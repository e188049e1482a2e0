import { useId, type ReactNode } from 'react';

/** The hint and error lines under a control, wired to it through aria-describedby. */
export function FieldMessages({ hintId, errorId, hint, error }: { hintId: string; errorId: string; hint?: ReactNode; error?: string }) {
  return (
    <>
      {hint ? (
        <p id={hintId} className="text-sm text-graphite-600">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={errorId} className="flex items-start gap-1 text-sm font-semibold text-brick-700">
          <span aria-hidden="true">!</span>
          {error}
        </p>
      ) : null}
    </>
  );
}

export function describedBy(hintId: string, errorId: string, hint: unknown, error: unknown): string | undefined {
  const ids = [hint ? hintId : null, error ? errorId : null].filter(Boolean);
  return ids.length ? ids.join(' ') : undefined;
}

export const controlClasses =
  'block min-h-11 w-full rounded-lg border border-graphite-500 bg-white px-3 py-2 text-base text-graphite-900 ' +
  'aria-invalid:border-brick-700 aria-invalid:border-2 disabled:bg-plaster-100 disabled:text-graphite-600';

export const labelClasses = 'block text-sm font-semibold text-graphite-900';

export interface ControlWiring {
  id: string;
  'aria-invalid': true | undefined;
  'aria-describedby': string | undefined;
}

/**
 * The frame every form control shares: a visible label, the control (given the id and ARIA
 * wiring to spread on itself), then the hint and error lines it is described by.
 */
export function LabelledField({
  label,
  hint,
  error,
  className = '',
  children,
}: {
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  className?: string;
  children: (wiring: ControlWiring) => ReactNode;
}) {
  const id = useId();
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  return (
    <div className={`flex flex-col gap-1 ${className}`}>
      <label htmlFor={id} className={labelClasses}>
        {label}
      </label>
      {children({ id, 'aria-invalid': error ? true : undefined, 'aria-describedby': describedBy(hintId, errorId, hint, error) })}
      <FieldMessages hintId={hintId} errorId={errorId} hint={hint} error={error} />
    </div>
  );
}
