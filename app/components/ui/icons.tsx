/**
 * The few status icons Plinth uses. Always decorative: the word next to each carries the meaning,
 * the shape backs it up for a quick glance, and colour comes last.
 */
export type IconName = 'check' | 'clock' | 'blocked' | 'missing' | 'warning' | 'info';

const PATHS: Record<IconName, string> = {
  check: 'M4 10.5l4 4 8-9',
  clock: 'M10 3a7 7 0 1 0 0 14 7 7 0 0 0 0-14zm0 3v4l3 2',
  blocked: 'M10 3a7 7 0 1 0 0 14 7 7 0 0 0 0-14zM5 5l10 10',
  missing: 'M5 10h10',
  warning: 'M10 3l8 14H2L10 3zm0 5v4m0 2.5v.5',
  info: 'M10 3a7 7 0 1 0 0 14 7 7 0 0 0 0-14zm0 6v5m0-8v.5',
};

export function Icon({ name, className = 'size-4' }: { name: IconName; className?: string }) {
  return (
    <svg aria-hidden="true" viewBox="0 0 20 20" fill="none" stroke="currentColor" strokeWidth={2.2} strokeLinecap="round" strokeLinejoin="round" className={`shrink-0 ${className}`}>
      <path d={PATHS[name]} />
    </svg>
  );
}
