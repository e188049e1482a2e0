import { CONSENT_STATE_LABELS, type ConsentState } from '#shared/domain/consent.ts';
import { Icon, type IconName } from '../ui/icons.tsx';
import type { BadgeTone } from '../ui/status-badge.tsx';

const STATE_LOOK: Record<ConsentState, { icon: IconName; tone: BadgeTone }> = {
  active: { icon: 'check', tone: 'good' },
  expired: { icon: 'clock', tone: 'warning' },
  withdrawn: { icon: 'blocked', tone: 'danger' },
};

const TONES: Record<BadgeTone, string> = {
  neutral: 'bg-slate-100 text-slate-800',
  good: 'bg-sage-100 text-sage-800',
  warning: 'bg-amber-100 text-amber-800',
  danger: 'bg-brick-100 text-brick-800',
  accent: 'bg-clay-100 text-clay-900',
};

/** A status chip: icon and word together, so neither colour nor shape alone says it. */
export function IconBadge({ icon, tone, children, testId }: { icon: IconName; tone: BadgeTone; children: React.ReactNode; testId?: string }) {
  return (
    <span
      className={`inline-flex items-center gap-1 rounded-full px-2.5 py-0.5 text-sm font-semibold whitespace-nowrap ${TONES[tone]}`}
      data-testid={testId}
    >
      <Icon name={icon} />
      {children}
    </span>
  );
}

export function ConsentStateBadge({ state }: { state: ConsentState }) {
  const look = STATE_LOOK[state];
  return (
    <IconBadge icon={look.icon} tone={look.tone} testId="consent-state">
      {CONSENT_STATE_LABELS[state]}
    </IconBadge>
  );
}
