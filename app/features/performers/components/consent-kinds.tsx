import { CONSENT_KINDS, CONSENT_KIND_LABELS, CONSENT_KIND_SHORT_LABELS } from '#shared/domain/consent.ts';
import type { PerformerListItem } from '#shared/schemas/performers.ts';
import { Icon } from '../../../components/ui/icons.tsx';
import { plural } from '../../../lib/format.ts';
import { IconBadge } from '../../../components/consent/consent-state.tsx';

/** The key above the table: what each mark means, in words. */
export function ConsentKey() {
  return (
    <p className="flex flex-wrap items-center gap-x-4 gap-y-1 text-sm text-ink-700" data-testid="consent-key">
      <span className="inline-flex items-center gap-1">
        <Icon name="check" className="size-4 text-sage-800" /> active consent
      </span>
      <span className="inline-flex items-center gap-1">
        <Icon name="missing" className="size-4 text-ink-600" /> none in force (never signed, expired or withdrawn)
      </span>
    </p>
  );
}

/** One line per consent kind, each with its mark and its word; then expiring and withdrawn counts. */
export function ConsentKinds({ performer: p }: { performer: PerformerListItem }) {
  const active = new Set(p.activeKinds);
  return (
    <div className="flex flex-col gap-1.5">
      <ul className="grid grid-cols-1 gap-x-3 gap-y-0.5 text-sm lg:grid-cols-2" aria-label="Consents by kind">
        {CONSENT_KINDS.map((kind) => (
          <li key={kind} className={`inline-flex items-center gap-1 whitespace-nowrap ${active.has(kind) ? 'font-semibold text-sage-800' : 'text-ink-600'}`}>
            <Icon name={active.has(kind) ? 'check' : 'missing'} />
            <span aria-hidden="true" title={CONSENT_KIND_LABELS[kind]}>{CONSENT_KIND_SHORT_LABELS[kind]}</span>
            <span className="sr-only">{`${CONSENT_KIND_LABELS[kind]}: ${active.has(kind) ? 'active' : 'none in force'}`}</span>
          </li>
        ))}
      </ul>
      {p.expiringSoon > 0 || p.withdrawn > 0 ? (
        <div className="flex flex-wrap gap-1">
          {p.expiringSoon > 0 ? (
            <IconBadge icon="clock" tone="warning">
              {plural(p.expiringSoon, 'expires', 'expire')} within 30 days
            </IconBadge>
          ) : null}
          {p.withdrawn > 0 ? (
            <IconBadge icon="blocked" tone="danger">
              {plural(p.withdrawn, 'withdrawn', 'withdrawn')}
            </IconBadge>
          ) : null}
        </div>
      ) : null}
    </div>
  );
}
