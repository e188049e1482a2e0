import { CLEARANCE_STATE_ICONS, CLEARANCE_STATE_LABELS, type ClearanceState } from '#shared/domain/clearance.ts';
import { Icon } from '../../../components/ui/icons.tsx';

// Word and shape carry the state; colour only backs them up (each pair is at least 6.4:1).
const TONES: Record<ClearanceState, string> = {
  cleared: 'bg-sage-100 text-sage-800',
  caution: 'bg-amber-100 text-amber-800',
  do_not_use: 'bg-brick-50 text-brick-800',
  pending: 'bg-slate-100 text-slate-800',
  untested: 'bg-slate-100 text-slate-800',
};

/** A clearance state with its icon and words. */
export function ClearanceBadge({ state }: { state: ClearanceState }) {
  return (
    <span className={`inline-flex items-center gap-1.5 rounded-full px-3 py-1 text-sm font-bold whitespace-nowrap ${TONES[state]}`}>
      <Icon name={CLEARANCE_STATE_ICONS[state]} />
      {CLEARANCE_STATE_LABELS[state]}
    </span>
  );
}
