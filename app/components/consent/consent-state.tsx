import { CONSENT_STATE_LABELS, type ConsentState } from '#shared/domain/consent.ts';
import type { IconName } from '../ui/icons.tsx';
import { StatusBadge, type BadgeTone } from '../ui/status-badge.tsx';

/** Each consent state has its own word, shape and colour. */
export const CONSENT_STATE_LOOK: Record<ConsentState, { icon: IconName; tone: BadgeTone }> = {
  active: { icon: 'check', tone: 'good' },
  expired: { icon: 'clock', tone: 'warning' },
  withdrawn: { icon: 'blocked', tone: 'danger' },
};

/** A status chip: icon and word together, so neither colour nor shape alone says it. */
export function IconBadge({ icon, tone, children, testId }: { icon: IconName; tone: BadgeTone; children: React.ReactNode; testId?: string }) {
  return (
    <StatusBadge icon={icon} tone={tone} testId={testId}>
      {children}
    </StatusBadge>
  );
}

export function ConsentStateBadge({ state }: { state: ConsentState }) {
  const look = CONSENT_STATE_LOOK[state];
  return (
    <StatusBadge icon={look.icon} tone={look.tone} testId="consent-state">
      {CONSENT_STATE_LABELS[state]}
    </StatusBadge>
  );
}
