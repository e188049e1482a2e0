import type { ReactNode } from 'react';

export type BadgeTone = 'neutral' | 'good' | 'warning' | 'danger' | 'accent';

// Each pair is >= 6.4:1; the words carry the meaning, colour only supports them.
const tones: Record<BadgeTone, string> = {
  neutral: 'bg-slate-100 text-slate-800',
  good: 'bg-sage-100 text-sage-800',
  warning: 'bg-amber-100 text-amber-800',
  danger: 'bg-brick-100 text-brick-800',
  accent: 'bg-clay-100 text-clay-900',
};

export function StatusBadge({ tone = 'neutral', children }: { tone?: BadgeTone; children: ReactNode }) {
  return <span className={`inline-flex items-center rounded-full px-2.5 py-0.5 text-sm font-semibold whitespace-nowrap ${tones[tone]}`}>{children}</span>;
}
