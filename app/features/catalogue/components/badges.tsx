import type { ReactNode } from 'react';
import { LOT_STATE_LABELS, type LotState } from '#shared/domain/catalogue.ts';
import { ALLERGEN_GROUP_LABELS, type AllergenGroup } from '#shared/domain/ingredients.ts';
import { Icon, type IconName } from '../../../components/ui/icons.tsx';
import { BADGE_TONES as TONES, type BadgeTone } from '../../../components/ui/status-badge.tsx';

/** A state in words with its icon; the colour only backs them up. */
export function MarkedBadge({ icon, tone, children, testId }: { icon: IconName; tone: BadgeTone; children: ReactNode; testId?: string }) {
  return (
    <span className={`inline-flex items-center gap-1 rounded-full px-2.5 py-0.5 text-sm font-semibold whitespace-nowrap ${TONES[tone]}`} data-testid={testId}>
      <Icon name={icon} />
      {children}
    </span>
  );
}

const LOT_LOOK: Record<LotState, { icon: IconName; tone: BadgeTone }> = {
  in_date: { icon: 'check', tone: 'good' },
  expiring: { icon: 'clock', tone: 'warning' },
  expired: { icon: 'blocked', tone: 'danger' },
  retired: { icon: 'missing', tone: 'neutral' },
};

export function LotStateBadge({ state }: { state: LotState }) {
  const look = LOT_LOOK[state];
  return (
    <MarkedBadge icon={look.icon} tone={look.tone} testId="lot-state">
      {LOT_STATE_LABELS[state]}
    </MarkedBadge>
  );
}

/** An allergen group by name; "other" is shown plainly, since it names no family. */
export function GroupBadge({ group }: { group: AllergenGroup }) {
  return <span className={`inline-flex items-center rounded-full px-2.5 py-0.5 text-sm font-semibold whitespace-nowrap ${group === 'other' ? TONES.neutral : TONES.accent}`}>{ALLERGEN_GROUP_LABELS[group]}</span>;
}
