import { CLEARANCE_SEVERITY } from '#shared/domain/clearance.ts';
import { ICDRG_LABELS } from '#shared/domain/icdrg.ts';
import { READING_PATTERN_LABELS } from '#shared/domain/test-outcome.ts';
import type { ClearanceRow } from '#shared/schemas/patch-test-log.ts';
import { Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { formatDate } from '../../../lib/format.ts';
import { ClearanceBadge } from './clearance-badge.tsx';
import { OverrideForm } from './override-form.tsx';

/**
 * The clearance of each product for one performer, what stops an application first. Staff see the
 * state, why and until when; the lead and the performer also see the latest grades and pattern.
 */
export function ClearanceTable({
  rows,
  medical,
  performerId,
  canOverride,
  caption = 'Clearance per product',
  testId = 'clearance-table',
}: {
  rows: ClearanceRow[];
  medical: boolean;
  performerId: string;
  canOverride: boolean;
  caption?: string;
  testId?: string;
}) {
  const sorted = rows.toSorted((a, b) => CLEARANCE_SEVERITY[a.state] - CLEARANCE_SEVERITY[b.state] || a.productName.localeCompare(b.productName));
  return (
    <Table caption={caption} testId={testId}>
      <Thead>
        <Tr>
          <Th>Product</Th>
          <Th>Clearance</Th>
          <Th>Why</Th>
          <Th>Valid until</Th>
          {medical ? <Th>Latest test</Th> : null}
          {canOverride ? <Th>Lead’s decision</Th> : null}
        </Tr>
      </Thead>
      <tbody>
        {sorted.map((r) => (
          <Tr key={r.formulationId}>
            <Td className="font-semibold">{r.productName}</Td>
            <Td>
              <ClearanceBadge state={r.state} />
              {r.overridden ? <span className="ml-2 text-sm font-semibold text-clay-900">Override</span> : null}
            </Td>
            <Td>
              {r.reasons.map((x) => x.text).join('; ')}
              {r.override?.note ? <p className="mt-1 text-sm text-ink-700">Lead’s note: {r.override.note}</p> : null}
            </Td>
            <Td>{r.validUntil ? formatDate(r.validUntil.slice(0, 10)) : '—'}</Td>
            {medical ? (
              <Td>{r.outcome ? `Strongest ${r.outcome.strongest ?? '—'} (${r.outcome.strongest ? ICDRG_LABELS[r.outcome.strongest] : 'none'}), final ${r.outcome.final ?? '—'}; ${READING_PATTERN_LABELS[r.outcome.pattern]}` : '—'}</Td>
            ) : null}
            {canOverride ? (
              <Td>
                <OverrideForm performerId={performerId} row={r} />
              </Td>
            ) : null}
          </Tr>
        ))}
      </tbody>
    </Table>
  );
}
