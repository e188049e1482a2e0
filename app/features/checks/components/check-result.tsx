import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import type { Check, CheckItemView } from '#shared/schemas/checks.ts';
import { Button } from '../../../components/ui/button.tsx';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { Icon } from '../../../components/ui/icons.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { formatDate, formatDateTime } from '../../../lib/format.ts';
import { checkQueryOptions, useAskLead } from '../api.ts';
import { ClearanceBadge } from './clearance-badge.tsx';
import { LogApplicationForm } from './log-application-form.tsx';

function RequestLine({ item }: { item: CheckItemView }) {
  const r = item.request;
  if (!r) return null;
  if (r.status === 'waiting') return <p className="font-semibold text-ink-700">Asked the lead at {formatDateTime(r.requestedAt)}; waiting for an answer…</p>;
  return (
    <p className={`font-semibold ${r.status === 'approved' ? 'text-sage-800' : 'text-brick-700'}`}>
      {r.status === 'approved' ? 'Approved' : 'Refused'} by {r.decidedByName ?? 'the lead'} at {formatDateTime(r.decidedAt)}
      {r.status === 'approved' && item.state === 'do_not_use' ? ': a Do not use still stops the application until the lead changes the clearance.' : '.'}
    </p>
  );
}

function ItemRow({ check, item }: { check: Check; item: CheckItemView }) {
  const ask = useAskLead();
  const [error, setError] = useState<unknown>(null);
  const canAsk = check.canAskLead && !item.request && (item.state === 'caution' || item.state === 'do_not_use') && !check.applicationId;
  return (
    <li className="flex flex-col gap-2 border-b border-sand-300 py-3 last:border-b-0" data-testid="check-item">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <span className="text-lg font-semibold text-ink-900">{item.productName}</span>
        <ClearanceBadge state={item.state} />
      </div>
      <p className="text-ink-700">
        {item.reasons.map((r) => r.text).join('; ')}
        {item.validUntil ? ` · valid until ${formatDate(item.validUntil.slice(0, 10))}` : ''}
        {item.fromPieceIds.length ? ' · in the appliance pieces' : ''}
      </p>
      {item.approved ? (
        <p className="flex items-center gap-1 font-semibold text-sage-800">
          <Icon name="check" /> The designated lead approved this Caution for this performer.
        </p>
      ) : null}
      <RequestLine item={item} />
      {canAsk ? (
        <div>
          <Button
            variant="secondary"
            pending={ask.isPending}
            pendingLabel="Asking…"
            onClick={() => {
              setError(null);
              ask.mutate({ checkId: check.id, formulationId: item.formulationId }, { onError: setError });
            }}
          >
            Ask the lead about {item.productName}
          </Button>
        </div>
      ) : null}
      {error ? <ErrorBanner error={error} /> : null}
    </li>
  );
}

/** The check's answer, refreshed while the lead is being asked, and the application form once it goes. */
export function CheckResult({ checkId }: { checkId: string }) {
  const check = useQuery(checkQueryOptions(checkId));
  return (
    <QueryView query={check} loadingLabel="Checking…">
      {(c) => (
        <>
          <Section title={`Check for ${c.performerName}`} testId="check-result">
            <output
              className={`flex items-center gap-3 rounded-xl p-4 text-xl font-bold ${c.verdict === 'go' ? 'bg-sage-100 text-sage-800' : 'bg-brick-50 text-brick-800'}`}
              data-testid="verdict"
            >
              <Icon name={c.verdict === 'go' ? 'check' : 'blocked'} className="size-7" />
              {c.message}
            </output>
            <ul className="flex flex-col">
              {c.items.map((item) => (
                <ItemRow key={item.formulationId} check={c} item={item} />
              ))}
            </ul>
            <p className="text-sm text-ink-600">Checked at {formatDateTime(c.runAt)}. Reasons are in plain words; the health record itself stays with the designated lead.</p>
          </Section>
          {c.verdict === 'go' && c.canLog && !c.applicationId ? <LogApplicationForm check={c} /> : null}
        </>
      )}
    </QueryView>
  );
}
