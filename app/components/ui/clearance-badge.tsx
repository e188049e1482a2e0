import { CLEARANCE_STATE_ICONS, CLEARANCE_STATE_LABELS, type ClearanceState } from '#shared/domain/clearance.ts';
import { StatusBadge, type BadgeTone } from './status-badge.tsx';

/** Five states, five words, five shapes, five colours: Untested is never drawn like Cleared. */
export const CLEARANCE_TONES: Record<ClearanceState, BadgeTone> = {
  cleared: 'good',
  caution: 'warning',
  do_not_use: 'danger',
  pending: 'info',
  untested: 'neutral',
};

export function ClearanceBadge({ state, testId = 'clearance-state' }: { state: ClearanceState; testId?: string }) {
  return (
    <StatusBadge icon={CLEARANCE_STATE_ICONS[state]} tone={CLEARANCE_TONES[state]} testId={testId}>
      {CLEARANCE_STATE_LABELS[state]}
    </StatusBadge>
  );
}
