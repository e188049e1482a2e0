import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { CONSENT_KIND_LABELS, type ConsentKind } from '#shared/domain/consent.ts';
import { Button } from '../../../components/ui/button.tsx';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { errorMessage, isApiError } from '../../../lib/api-client.ts';
import { templatesQueryOptions } from '../../consent-forms/index.ts';
import { handOver, useCreateSigningRequest } from '../api.ts';

/**
 * "Send the form now": the current form of the kind a session needs, signed here on the tablet
 * (the browser is lent to the performer at once) or sent as a one-time link to their confirmed address.
 */
export function SendFormNow({ performerId, productionId, kind }: { performerId: string; productionId: string; kind: ConsentKind }) {
  const queryClient = useQueryClient();
  const templates = useQuery(templatesQueryOptions());
  const create = useCreateSigningRequest();
  const [sentTo, setSentTo] = useState<string | null>(null);
  const [lending, setLending] = useState(false);
  const [error, setError] = useState<unknown>(null);
  const template = templates.data?.items.find((t) => t.kind === kind && !t.archived);

  async function send(mode: 'tablet' | 'link') {
    if (!template) return;
    setError(null);
    try {
      const request = await create.mutateAsync({ performerId, productionId, templateId: template.id, mode });
      if (mode === 'link') {
        setSentTo(request.sentTo ?? 'their e-mail address');
        return;
      }
      setLending(true);
      const { redirectTo } = await handOver(request.id);
      queryClient.clear();
      window.location.replace(redirectTo);
    } catch (err) {
      setLending(false);
      setError(err);
    }
  }

  if (templates.isPending) return <p className="text-ink-700">Looking for the {CONSENT_KIND_LABELS[kind].toLowerCase()} form…</p>;
  if (!template) return <p className="text-ink-700">There is no current {CONSENT_KIND_LABELS[kind].toLowerCase()} form to send. Forms are written under “Consent forms”.</p>;
  if (sentTo) {
    return (
      <output className="block font-semibold text-sage-800">
        The form “{template.title}” is on its way to <span className="break-all">{sentTo}</span>. The session waits for consent until it is signed.
      </output>
    );
  }
  const fields = isApiError(error) ? error.fields : {};
  return (
    <div className="flex flex-col gap-3" data-testid="send-form-now">
      <p className="font-semibold text-ink-900">Send the form now: “{template.title}”</p>
      <div className="flex flex-wrap gap-3">
        <Button onClick={() => void send('tablet')} pending={lending || (create.isPending && create.variables?.mode === 'tablet')} pendingLabel="Handing over…" disabled={create.isPending || lending}>
          Sign on this tablet now
        </Button>
        <Button variant="secondary" onClick={() => void send('link')} pending={create.isPending && create.variables?.mode === 'link'} pendingLabel="Sending…" disabled={create.isPending || lending}>
          Send a link by e-mail
        </Button>
      </div>
      {error ? <ErrorBanner message={fields.mode?.join(' ') ?? fields.performerId?.join(' ') ?? errorMessage(error)} /> : null}
    </div>
  );
}
