import { useId } from 'react';

/**
 * A determinate bar for an upload: the label says what is moving, the percentage is in words too,
 * so the bar's colour is never the only sign of progress.
 */
export function ProgressBar({ label, value, testId }: { label: string; value: number; testId?: string }) {
  const id = useId();
  const percent = Math.round(Math.min(1, Math.max(0, value)) * 100);
  return (
    <div className="flex flex-col gap-1" data-testid={testId}>
      <div className="flex items-baseline justify-between gap-3 text-sm">
        <label htmlFor={id} className="font-semibold text-graphite-900">
          {label}
        </label>
        <span className="text-graphite-700" aria-hidden="true">
          {percent}%
        </span>
      </div>
      <progress
        id={id}
        max={100}
        value={percent}
        className={
          'h-3 w-full appearance-none overflow-hidden rounded-full border border-graphite-500 bg-plaster-100 ' +
          '[&::-moz-progress-bar]:bg-verdigris-700 [&::-webkit-progress-bar]:bg-plaster-100 [&::-webkit-progress-value]:bg-verdigris-700'
        }
      >
        {percent}%
      </progress>
    </div>
  );
}
