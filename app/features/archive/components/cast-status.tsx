import { BODY_REGION_LABELS, CAST_KIND_LABELS, CAST_STATUS_LABELS, CONDITION_GRADE_LABELS, type BodyRegion, type CastKind, type CastStatus, type ConditionGrade } from '#shared/domain/archive-casts.ts';
import { RETENTION_STATE_LABELS, type RetentionState } from '#shared/domain/archive-retention.ts';
import { Icon, type IconName } from '../../../components/ui/icons.tsx';
import { StatusBadge, type BadgeTone } from '../../../components/ui/status-badge.tsx';

/** "Face positive": what the cast is, in the archive's words. */
export function castTitle(c: { region: BodyRegion; kind: CastKind }): string {
  return `${BODY_REGION_LABELS[c.region]} ${CAST_KIND_LABELS[c.kind].toLowerCase()}`;
}

const STATUS: Record<CastStatus, { tone: BadgeTone; icon: IconName }> = {
  in_store: { tone: 'good', icon: 'check' },
  checked_out: { tone: 'accent', icon: 'clock' },
  on_loan: { tone: 'accent', icon: 'clock' },
  returned_to_performer: { tone: 'neutral', icon: 'missing' },
  destroyed: { tone: 'neutral', icon: 'blocked' },
};

/** The cast's status by icon and word; an overdue one says so in words too. */
export function CastStatusBadge({ status, overdue = false }: { status: CastStatus; overdue?: boolean }) {
  if (overdue) {
    return (
      <StatusBadge tone="danger">
        <Icon name="warning" className="mr-1 size-4" />
        {CAST_STATUS_LABELS[status]}, overdue
      </StatusBadge>
    );
  }
  const s = STATUS[status];
  return (
    <StatusBadge tone={s.tone}>
      <Icon name={s.icon} className="mr-1 size-4" />
      {CAST_STATUS_LABELS[status]}
    </StatusBadge>
  );
}

const GRADE: Record<ConditionGrade, BadgeTone> = { good: 'good', fair: 'neutral', poor: 'warning', damaged: 'danger' };

export function ConditionBadge({ grade }: { grade: ConditionGrade | null }) {
  if (!grade) return <span className="text-ink-600">Not checked yet</span>;
  return (
    <StatusBadge tone={GRADE[grade]}>
      <Icon name={grade === 'good' ? 'check' : grade === 'fair' ? 'info' : 'warning'} className="mr-1 size-4" />
      {CONDITION_GRADE_LABELS[grade]}
    </StatusBadge>
  );
}

const RETENTION: Record<RetentionState, { tone: BadgeTone; icon: IconName }> = {
  kept: { tone: 'good', icon: 'check' },
  review_soon: { tone: 'warning', icon: 'clock' },
  due: { tone: 'danger', icon: 'warning' },
  ended: { tone: 'neutral', icon: 'missing' },
};

export function RetentionBadge({ state }: { state: RetentionState }) {
  const r = RETENTION[state];
  return (
    <StatusBadge tone={r.tone}>
      <Icon name={r.icon} className="mr-1 size-4" />
      {RETENTION_STATE_LABELS[state]}
    </StatusBadge>
  );
}

/** A cast photo's thumbnail, or a plain tile saying there is none. The words beside it name the cast. */
export function CastThumbnail({ url, size = 'sm' }: { url: string | null; size?: 'sm' | 'lg' }) {
  const box = size === 'lg' ? 'size-32' : 'size-16';
  if (url) return <img src={url} alt="" width={size === 'lg' ? 128 : 64} height={size === 'lg' ? 128 : 64} loading="lazy" className={`${box} shrink-0 rounded-lg border border-sand-300 object-cover`} />;
  return (
    <span aria-hidden="true" className={`${box} inline-flex shrink-0 items-center justify-center rounded-lg bg-sand-200 text-xs font-semibold text-ink-700`}>
      No photo
    </span>
  );
}
