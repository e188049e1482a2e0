import { PIECE_STATUS_LABELS, type PieceStatus } from '#shared/domain/builds.ts';
import type { ApplianceOutlook } from '#shared/schemas/builds.ts';
import { Icon, type IconName } from '../../../components/ui/icons.tsx';
import { BADGE_TONES as TONES, type BadgeTone } from '../../../components/ui/status-badge.tsx';

function Badge({ icon, tone, children, testId }: { icon: IconName; tone: BadgeTone; children: string; testId?: string }) {
  return (
    <span className={`inline-flex items-center gap-1 rounded-full px-2.5 py-0.5 text-sm font-semibold whitespace-nowrap ${TONES[tone]}`} data-testid={testId}>
      <Icon name={icon} />
      {children}
    </span>
  );
}

const PIECE_LOOK: Record<PieceStatus, { icon: IconName; tone: BadgeTone }> = {
  on_hand: { icon: 'check', tone: 'good' },
  used: { icon: 'missing', tone: 'neutral' },
  spoiled: { icon: 'blocked', tone: 'danger' },
};

/** A piece's state in words with its icon; the colour only backs them up. */
export function PieceStatusBadge({ status }: { status: PieceStatus }) {
  return <Badge {...PIECE_LOOK[status]}>{PIECE_STATUS_LABELS[status]}</Badge>;
}

/** Whether an appliance's pieces cover its shoot days planned plus spares, in words. */
export function ShortfallBadge({ outlook }: { outlook: ApplianceOutlook }) {
  if (!outlook.shortfall) return <Badge icon="info" tone="neutral" testId="shortfall">No shoot days planned</Badge>;
  return outlook.shortfall.short ? (
    <Badge icon="warning" tone="warning" testId="shortfall">{`Short by ${outlook.shortfall.shortBy}`}</Badge>
  ) : (
    <Badge icon="check" tone="good" testId="shortfall">Covered</Badge>
  );
}
