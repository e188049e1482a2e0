import type { ReactNode } from 'react';
import { Icon, type IconName } from './icons.tsx';

export type BadgeTone = 'neutral' | 'good' | 'warning' | 'danger' | 'accent' | 'info';

// Text on fill, each pair >= 7:1 (tests/unit/palette-contrast.test.ts). The word carries the
// meaning and the icon backs it up; colour comes last.
export const BADGE_TONES: Record<BadgeTone, string> = {
  neutral: 'bg-slate-100 text-slate-800',
  good: 'bg-sage-100 text-sage-800',
  warning: 'bg-amber-100 text-amber-800',
  danger: 'bg-brick-100 text-brick-800',
  accent: 'bg-verdigris-100 text-verdigris-900',
  info: 'bg-dusk-100 text-dusk-800',
};

interface StatusBadgeProps {
  tone?: BadgeTone;
  /** A shape for the state, so two states never differ by colour alone. */
  icon?: IconName;
  children: ReactNode;
  testId?: string;
}

/** A state chip. It never wraps or shrinks, so a table that cannot fit it reflows instead of cutting it. */
export function StatusBadge({ tone = 'neutral', icon, children, testId }: StatusBadgeProps) {
  return (
    <span
      className={`inline-flex shrink-0 items-center gap-1 rounded-full px-2.5 py-0.5 text-sm font-semibold whitespace-nowrap ${BADGE_TONES[tone]}`}
      data-testid={testId}
      data-tone={tone}
    >
      {icon ? <Icon name={icon} /> : null}
      {children}
    </span>
  );
}
