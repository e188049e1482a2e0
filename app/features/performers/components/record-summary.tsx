import { useState } from 'react';
import { CONSENT_KIND_LABELS } from '#shared/domain/consent.ts';
import { summarizeConsents } from '#shared/domain/consent-summary.ts';
import type { PerformerDetail } from '#shared/schemas/performers.ts';
import { Icon, type IconName } from '../../../components/ui/icons.tsx';
import { BADGE_TONES, type BadgeTone } from '../../../components/ui/status-badge.tsx';
import { formatDate } from '../../../lib/format.ts';

/** Who the performer plays where: the acting production's engagement first, else every one. */
export function EngagementLine({ performer: p, productionId }: { performer: PerformerDetail; productionId: string | null }) {
  const here = p.engagements.filter((e) => e.productionId === productionId);
  const shown = here.length > 0 ? here : p.engagements;
  if (shown.length === 0) return <p className="text-graphite-700">Not engaged on a production you can see.</p>;
  return (
    <p className="text-lg text-graphite-900" data-testid="engagement-line">
      {shown.map((e, i) => (
        <span key={e.productionId}>
          {i > 0 ? '; ' : null}
          {e.characterName ? (
            <>
              <span className="font-semibold">{e.characterName}</span> in{' '}
            </>
          ) : null}
          <span className={e.characterName ? '' : 'font-semibold'}>{e.productionName}</span>
        </span>
      ))}
    </p>
  );
}

/**
 * One line on consents, the way staff act on them: what is in force, what ends within 30 days,
 * and what is missing, on the acting production (on every production for the performer themself).
 */
export function ConsentSummaryLine({ performer: p, production }: { performer: PerformerDetail; production: { id: string; name: string } | null }) {
  // The moment the page opened: the summary does not change under the reader's eyes.
  const [now] = useState(() => new Date());
  const summary = summarizeConsents(
    p.consents.map((c) => ({
      kind: c.kind,
      productionId: c.productionId,
      signedAt: new Date(c.signedAt),
      expiresAt: c.expiresAt ? new Date(c.expiresAt) : null,
      withdrawnAt: c.withdrawnAt ? new Date(c.withdrawnAt) : null,
    })),
    now,
    production?.id ?? null,
  );
  const inForce = summary.filter((k) => k.cover === 'in_force');
  const expiring = summary.flatMap((k) => (k.cover === 'expiring' ? [k] : []));
  const missing = summary.filter((k) => k.cover === 'missing');
  return (
    <div className="flex flex-col gap-2" data-testid="consent-summary">
      <p className="text-sm font-semibold text-graphite-700">Consents{production ? ` on ${production.name}` : ''}</p>
      <ul className="flex flex-wrap items-center gap-2" aria-label="Consent summary">
        <li>
          <SummaryPart tone="good" icon="check" testId="summary-in-force">
            In force: {inForce.length ? inForce.map((k) => CONSENT_KIND_LABELS[k.kind]).join(', ') : 'none'}
          </SummaryPart>
        </li>
        {expiring.map((k) => (
          <li key={k.kind}>
            <SummaryPart tone="warning" icon="clock" testId="summary-expiring">
              {CONSENT_KIND_LABELS[k.kind]} ends {formatDate(k.endsAt.toISOString())}
            </SummaryPart>
          </li>
        ))}
        {missing.length ? (
          <li>
            <SummaryPart tone="danger" icon="blocked" testId="summary-missing">
              Missing: {missing.map((k) => CONSENT_KIND_LABELS[k.kind]).join(', ')}
            </SummaryPart>
          </li>
        ) : null}
      </ul>
    </div>
  );
}

/** A chip of the summary that may wrap onto a second line (a list of kinds can be long). */
function SummaryPart({ tone, icon, testId, children }: { tone: BadgeTone; icon: IconName; testId: string; children: React.ReactNode }) {
  return (
    <span className={`inline-flex items-start gap-1.5 rounded-lg px-2.5 py-1 text-sm font-semibold ${BADGE_TONES[tone]}`} data-testid={testId}>
      <Icon name={icon} className="mt-0.5 size-4" />
      <span>{children}</span>
    </span>
  );
}
