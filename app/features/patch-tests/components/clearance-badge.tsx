import { CLEARANCE_STATE_ICONS, CLEARANCE_STATE_LABELS, type ClearanceState } from '#shared/domain/clearance.ts';
import { Icon } from '../../../components/ui/icons.tsx';
import { StatusBadge, type BadgeTone } from '../../../components/ui/status-badge.tsx';

const TONES: Record<ClearanceState, BadgeTone> = { cleared: 'good', caution: 'warning', do_not_use: 'danger', pending: 'accent', untested: 'neutral' };

/** A clearance state by icon and word, colour only supporting them. */
export function ClearanceBadge({ state }: { state: ClearanceState }) {
  return (
    <StatusBadge tone={TONES[state]}>
      <Icon name={CLEARANCE_STATE_ICONS[state]} className="mr-1 size-4" />
      {CLEARANCE_STATE_LABELS[state]}
    </StatusBadge>
  );
}
