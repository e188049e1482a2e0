import { useQuery } from '@tanstack/react-query';
import { CLEARANCE_STATE_ICONS, CLEARANCE_STATE_LABELS } from '#shared/domain/clearance.ts';
import { CLEARANCE_TONES } from '../../../components/ui/clearance-badge.tsx';
import { StatusBadge } from '../../../components/ui/status-badge.tsx';
import { formatNumber } from '../../../lib/format.ts';
import { performerPatchTestsQueryOptions } from '../api.ts';
import { COUNTED_STATES, countClearances } from './clearance-counts.ts';

/**
 * One line on clearances beside the consents line: how many products are Cleared, Caution, Do not use
 * and Pending for this performer, from the same answer as the clearance table (states only, which every
 * reader of the record may see), and a reminder that every other product is Untested.
 */
export function ClearanceSummaryLine({ performerId }: { performerId: string }) {
  const query = useQuery(performerPatchTestsQueryOptions(performerId));
  // The section below says why when the list cannot be read; the summary keeps quiet rather than guess.
  if (!query.data) return null;
  const counts = countClearances(query.data.clearances, query.data.sharedCautions.total);
  return (
    <div className="flex flex-col gap-2" data-testid="clearance-summary">
      <p className="text-sm font-semibold text-graphite-700">Clearances</p>
      <ul className="flex flex-wrap items-center gap-2" aria-label="Clearance summary">
        {COUNTED_STATES.map((state) => (
          <li key={state}>
            <StatusBadge tone={counts[state] > 0 ? CLEARANCE_TONES[state] : 'neutral'} icon={CLEARANCE_STATE_ICONS[state]} testId={`clearance-summary-${state}`}>
              {CLEARANCE_STATE_LABELS[state]}: {formatNumber(counts[state])}
            </StatusBadge>
          </li>
        ))}
        <li>
          <StatusBadge tone={CLEARANCE_TONES.untested} icon={CLEARANCE_STATE_ICONS.untested} testId="clearance-summary-untested">
            Any other product: {CLEARANCE_STATE_LABELS.untested}
          </StatusBadge>
        </li>
      </ul>
    </div>
  );
}
