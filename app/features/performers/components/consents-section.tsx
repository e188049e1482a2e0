import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useId, useState } from 'react';
import { Link } from 'react-router-dom';
import { CONSENT_KIND_LABELS } from '#shared/domain/consent.ts';
import type { SigningRequest } from '#shared/schemas/consents.ts';
import type { PerformerDetail } from '#shared/schemas/performers.ts';
import { Button } from '../../../components/ui/button.tsx';
import { ConfirmDialog, Dialog } from '../../../components/ui/dialog.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { StatusBadge } from '../../../components/ui/status-badge.tsx';
import { Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { errorMessage, isApiError } from '../../../lib/api-client.ts';
import { formatDate, formatDateTime } from '../../../lib/format.ts';
import { paths } from '../../../lib/paths.ts';
import { templatesQueryOptions } from '../../consent-forms/index.ts';
import { handOver, handOverBundle, signingRequestsQueryOptions, useCancelSigningRequest, useCreateSigningBundle, useCreateSigningRequest } from '../../consents/index.ts';
import { ConsentStateBadge } from '../../../components/consent/consent-state.tsx';
import { displayName } from './names.tsx';

interface ConsentsSectionProps {
  performer: PerformerDetail;
  /** The acting production, when this seat may ask the performer to sign on it. */
  requestOn: { id: string; name: string } | null;
}

export function ConsentsSection({ performer: p, requestOn }: ConsentsSectionProps) {
  const [asking, setAsking] = useState(false);
  return (
    <Section
      title="Consents"
      testId="consents-section"
      actions={
        requestOn ? (
          <Button onClick={() => setAsking(true)} data-testid="ask-to-sign">
            Ask to sign…
          </Button>
        ) : undefined
      }
    >
      {p.consents.length === 0 ? (
        <EmptyState title="No consents signed yet.">{requestOn ? 'Use “Ask to sign…” to send a form or sign one here on the tablet.' : null}</EmptyState>
      ) : (
        <Table caption={`Consents of ${displayName(p)}, newest first`} captionHidden testId="performer-consents-table">
          <Thead>
            <tr>
              <Th>Kind</Th>
              <Th>Form</Th>
              <Th>Signed</Th>
              <Th>Expires</Th>
              <Th>State</Th>
            </tr>
          </Thead>
          <tbody>
            {p.consents.map((c) => (
              <Tr key={c.id}>
                <Td className="whitespace-nowrap">{CONSENT_KIND_LABELS[c.kind]}</Td>
                <Td>
                  <Link to={paths.consent.href(c.id)} className="inline-flex min-h-11 items-center font-semibold" data-testid="consent-link" data-kind={c.kind}>
                    <span>
                      {c.title} <span className="font-normal text-ink-700">v{c.templateVersion}</span>
                    </span>
                  </Link>
                </Td>
                <Td className="whitespace-nowrap">
                  <time dateTime={c.signedAt}>{formatDate(c.signedAt)}</time>
                </Td>
                <Td className="whitespace-nowrap">{c.expiresAt ? <time dateTime={c.expiresAt}>{formatDate(c.expiresAt)}</time> : 'Until withdrawn'}</Td>
                <Td>
                  <ConsentStateBadge state={c.state} />
                </Td>
              </Tr>
            ))}
          </tbody>
        </Table>
      )}
      {requestOn ? <OpenRequests performer={p} production={requestOn} /> : null}
      {requestOn ? <AskToSignDialog open={asking} onClose={() => setAsking(false)} performer={p} production={requestOn} /> : null}
    </Section>
  );
}

/**
 * Lending this browser to the performer: the server locks the session to the one form, and a full
 * page load leaves nothing of the staff's screens in memory (or in history: it replaces this page).
 */
async function lendTablet(queryClient: ReturnType<typeof useQueryClient>, requestId: string, bundle = false) {
  const { redirectTo } = await (bundle ? handOverBundle(requestId) : handOver(requestId));
  queryClient.clear();
  // Through the identity provider's sign-out (ending the staff member's remembered sign-in), then to the form.
  window.location.replace(redirectTo);
}

function OpenRequests({ performer: p, production }: { performer: PerformerDetail; production: { id: string; name: string } }) {
  const queryClient = useQueryClient();
  const requests = useQuery(signingRequestsQueryOptions(production.id, p.id));
  const cancel = useCancelSigningRequest();
  const [cancelling, setCancelling] = useState<SigningRequest | null>(null);
  const [lending, setLending] = useState<string | null>(null);
  const [lendError, setLendError] = useState<unknown>(null);

  async function lend(id: string) {
    setLending(id);
    setLendError(null);
    try {
      await lendTablet(queryClient, id);
    } catch (err) {
      setLendError(err);
      setLending(null);
    }
  }

  function close() {
    setCancelling(null);
    cancel.reset();
  }

  return (
    <div className="flex flex-col gap-3" data-testid="open-requests">
      <h3 className="text-lg font-bold text-ink-900">Waiting to be signed</h3>
      <QueryView query={requests} loadingLabel="Loading open requests…">
        {(data) =>
          data.items.length === 0 ? (
            <p className="text-ink-700">No form is waiting for {displayName(p)} on {production.name}.</p>
          ) : (
            <Table caption="Signing requests still open" captionHidden testId="signing-requests-table">
              <Thead>
                <tr>
                  <Th>Form</Th>
                  <Th>How</Th>
                  <Th>Open until</Th>
                  <Th>
                    <span className="sr-only">Actions</span>
                  </Th>
                </tr>
              </Thead>
              <tbody>
                {data.items.map((r) => (
                  <Tr key={r.id}>
                    <Td>
                      <span className="font-semibold">{r.template.title}</span>
                      <span className="block text-sm text-ink-700">{CONSENT_KIND_LABELS[r.template.kind]}</span>
                    </Td>
                    <Td>{r.mode === 'tablet' ? 'On the tablet' : <>Link sent to <span className="break-all">{r.sentTo ?? 'their e-mail'}</span></>}</Td>
                    <Td className="whitespace-nowrap">
                      {r.status === 'expired' ? <StatusBadge tone="warning">Expired</StatusBadge> : <time dateTime={r.expiresAt}>{formatDateTime(r.expiresAt)}</time>}
                    </Td>
                    <Td className="text-right">
                      <div className="flex flex-wrap justify-end gap-2">
                        {r.mode === 'tablet' && r.status === 'open' ? (
                          <Button variant="secondary" pending={lending === r.id} pendingLabel="Handing over…" onClick={() => void lend(r.id)}>
                            Sign here on this tablet
                          </Button>
                        ) : null}
                        <Button variant="secondary" aria-label={`Cancel the request for ${r.template.title}`} onClick={() => setCancelling(r)}>
                          Cancel
                        </Button>
                      </div>
                    </Td>
                  </Tr>
                ))}
              </tbody>
            </Table>
          )
        }
      </QueryView>
      {lendError ? <ErrorBanner error={lendError} /> : null}
      <ConfirmDialog
        open={cancelling !== null}
        title="Cancel this request?"
        confirmLabel="Cancel the request"
        pending={cancel.isPending}
        error={cancel.error}
        onCancel={close}
        onConfirm={() => {
          if (cancelling) cancel.mutate(cancelling.id, { onSuccess: close });
        }}
      >
        <p>
          {cancelling?.mode === 'link' ? 'The link e-mailed to the performer stops working.' : 'The form can no longer be signed on the tablet.'} You can ask again at any time.
        </p>
      </ConfirmDialog>
    </div>
  );
}

function AskToSignDialog({ open, onClose, performer: p, production }: { open: boolean; onClose: () => void; performer: PerformerDetail; production: { id: string; name: string } }) {
  return (
    <Dialog open={open} onClose={onClose} title={`Ask ${displayName(p)} to sign`} testId="ask-to-sign-dialog">
      {open ? <AskToSign performer={p} production={production} onDone={onClose} /> : null}
    </Dialog>
  );
}

function AskToSign({ performer: p, production, onDone }: { performer: PerformerDetail; production: { id: string; name: string }; onDone: () => void }) {
  const queryClient = useQueryClient();
  const templates = useQuery(templatesQueryOptions());
  const createOne = useCreateSigningRequest();
  const createBundle = useCreateSigningBundle();
  const [templateIds, setTemplateIds] = useState<string[]>([]);
  const pendingMode = createOne.isPending ? createOne.variables?.mode : createBundle.isPending ? createBundle.variables?.mode : undefined;
  const [choiceError, setChoiceError] = useState<string | null>(null);
  const [error, setError] = useState<unknown>(null);
  const [sentTo, setSentTo] = useState<string | null>(null);
  const [lending, setLending] = useState(false);
  const groupId = useId();
  const email = p.contact?.email ?? null;
  const unconfirmed = email !== null && p.contact?.emailConfirmed === false;
  const busy = pendingMode !== undefined || lending;

  async function ask(mode: 'tablet' | 'link') {
    setError(null);
    if (templateIds.length === 0) {
      setChoiceError('Choose at least one form first.');
      document.getElementById(`${groupId}-first`)?.focus();
      return;
    }
    setChoiceError(null);
    try {
      // One form is a single request; several go as one bundle: one hand-over, or one e-mail with one link.
      const sent =
        templateIds.length === 1
          ? await createOne.mutateAsync({ performerId: p.id, templateId: templateIds[0]!, productionId: production.id, mode })
          : await createBundle.mutateAsync({ performerId: p.id, templateIds, productionId: production.id, mode });
      if (mode === 'tablet') {
        setLending(true);
        await lendTablet(queryClient, sent.id, templateIds.length > 1);
        return;
      }
      setSentTo(sent.sentTo ?? email ?? 'their e-mail address');
    } catch (err) {
      setLending(false);
      setError(err);
    }
  }

  if (sentTo) {
    return (
      <div className="flex flex-col gap-4">
        <output className="block text-lg">
          Sent. {templateIds.length > 1 ? `One link for all ${templateIds.length} forms` : 'A one-time link'} is on its way to <span className="font-semibold break-all">{sentTo}</span>; it works for 7 days.
        </output>
        <div className="flex justify-end">
          <Button onClick={onDone}>Done</Button>
        </div>
      </div>
    );
  }

  const fieldErrors = isApiError(error) ? error.fields : {};
  const templateError = fieldErrors.templateId ?? fieldErrors.templateIds ?? Object.entries(fieldErrors).find(([k]) => k.startsWith('templateIds.'))?.[1];
  return (
    <QueryView query={templates} loadingLabel="Loading consent forms…">
      {(data) =>
        data.items.length === 0 ? (
          <EmptyState title="There are no consent forms to send.">Forms are written under “Consent forms”.</EmptyState>
        ) : (
          <div className="flex flex-col gap-5">
            <fieldset className="flex flex-col gap-2" aria-describedby={choiceError || templateError ? `${groupId}-error` : undefined}>
              <legend className="mb-1 font-semibold text-ink-900">Which forms?</legend>
              <p className="text-sm text-ink-700">Choose one or several: they are signed one after another, each its own consent.</p>
              {data.items.map((t, i) => (
                <label
                  key={t.id}
                  className="flex min-h-11 cursor-pointer items-center gap-3 rounded-lg border border-ink-500 px-3 py-2 has-checked:border-2 has-checked:border-clay-700 has-checked:bg-clay-50"
                >
                  <input
                    id={i === 0 ? `${groupId}-first` : undefined}
                    type="checkbox"
                    name={`${groupId}-template`}
                    value={t.id}
                    checked={templateIds.includes(t.id)}
                    onChange={(e) => {
                      const on = e.currentTarget.checked;
                      setTemplateIds((ids) => (on ? [...ids, t.id] : ids.filter((x) => x !== t.id)));
                    }}
                    className="size-5 shrink-0 accent-clay-700"
                  />
                  <span className="font-semibold">
                    {t.title}
                    <span className="block text-sm font-normal text-ink-700">
                      {CONSENT_KIND_LABELS[t.kind]} · version {t.version}
                    </span>
                  </span>
                </label>
              ))}
              {choiceError || templateError ? (
                <p id={`${groupId}-error`} className="text-sm font-semibold text-brick-700">
                  {choiceError ?? templateError?.join(' ')}
                </p>
              ) : null}
            </fieldset>

            <div className="flex flex-col gap-3 rounded-xl bg-sand-100 p-4">
              <p className="text-ink-900">
                <span className="font-semibold">On this tablet:</span> hand it to {displayName(p)}. It shows only this form; afterwards staff sign in again with
                their password.
              </p>
              <Button onClick={() => void ask('tablet')} pending={lending || pendingMode === 'tablet'} pendingLabel="Handing over…" disabled={busy} data-testid="sign-on-tablet">
                Sign here on this tablet
              </Button>
            </div>
            <div className="flex flex-col gap-3 rounded-xl bg-sand-100 p-4">
              <p className="text-ink-900">
                <span className="font-semibold">By e-mail:</span>{' '}
                {email && unconfirmed ? (
                  <>
                    {displayName(p)} has not yet confirmed <span className="break-all">{email}</span> as their address, so no link can go there. Sign on the
                    tablet, or ask them to confirm it first.
                  </>
                ) : email ? (
                  <>
                    a one-time link goes to <span className="break-all">{email}</span>, working for 7 days.
                  </>
                ) : (
                  'there is no e-mail address on record. Add one with “Edit”, or sign on the tablet.'
                )}
              </p>
              <Button
                variant="secondary"
                onClick={() => void ask('link')}
                pending={pendingMode === 'link'}
                pendingLabel="Sending…"
                disabled={busy || (p.contact !== null && (!email || unconfirmed))}
                data-testid="send-link"
              >
                Send a link by e-mail
              </Button>
            </div>
            {error && !templateError ? (
              <ErrorBanner message={fieldErrors.mode?.join(' ') ?? fieldErrors.performerId?.join(' ') ?? errorMessage(error)} />
            ) : null}
          </div>
        )
      }
    </QueryView>
  );
}
