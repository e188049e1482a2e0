import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import type { z } from 'zod';
import { CONSENT_KIND_LABELS } from '#shared/domain/consent.ts';
import type { WithdrawalLinkViewSchema } from '#shared/schemas/consents.ts';
import { Button } from '../../../components/ui/button.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { Loading } from '../../../components/ui/loading.tsx';
import { Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { formatDate, formatDateTime } from '../../../lib/format.ts';
import { paths } from '../../../lib/paths.ts';
import { useWithdrawByLink, withdrawalLinkQueryOptions } from '../api.ts';
import { ConsentStateBadge } from '../../../components/consent/consent-state.tsx';
import { PublicFrame } from '../../../components/layout/public-frame.tsx';
import { WithdrawDialog } from '../components/withdraw-dialog.tsx';

type LinkConsent = z.infer<typeof WithdrawalLinkViewSchema>['consents'][number];

/** A withdrawal link: the performer's consents, each active one withdrawable in two taps. */
export function WithdrawLinkPage() {
  const { token = '' } = useParams();
  const view = useQuery(withdrawalLinkQueryOptions(token));
  const withdraw = useWithdrawByLink(token);
  const [chosen, setChosen] = useState<LinkConsent | null>(null);
  const [done, setDone] = useState<string | null>(null);

  function close() {
    setChosen(null);
    withdraw.reset();
  }

  if (view.isPending) {
    return (
      <PublicFrame title="Your consents" narrow>
        <Loading label="Loading your consents…" />
      </PublicFrame>
    );
  }
  if (view.isError) {
    const expired = isApiError(view.error, 409);
    return (
      <PublicFrame title="This link does not work" narrow>
        <h1 className="text-3xl font-bold text-ink-900">{expired ? 'This link has expired' : 'This link does not work'}</h1>
        <ErrorBanner error={view.error} onRetry={isApiError(view.error) && view.error.isClientError ? undefined : () => void view.refetch()} />
        <p className="text-lg text-ink-700">
          Withdrawal links work for 24 hours. <Link to={paths.withdrawRequest.href()} className="font-semibold">Ask for a new link</Link>, or ask the
          make-up department.
        </p>
      </PublicFrame>
    );
  }

  const data = view.data;
  return (
    <PublicFrame title="Your consents">
      <h1 className="text-3xl font-bold text-ink-900">Your consents, {data.performerName}</h1>
      <p className="text-lg text-ink-700">
        Withdraw any consent you no longer want to give. This link works until <time dateTime={data.expiresAt}>{formatDateTime(data.expiresAt)}</time>.
      </p>
      {done ? (
        <output className="block rounded-xl border-l-4 border-sage-700 bg-sage-100 p-4 text-lg text-sage-800">{done}</output>
      ) : null}
      {data.consents.length === 0 ? (
        <EmptyState title="The department holds no consents from you." />
      ) : (
        <Table caption="Your consents, newest first" captionHidden busy={view.isFetching} testId="link-consents-table">
          <Thead>
            <tr>
              <Th>Consent</Th>
              <Th>Signed</Th>
              <Th>Expires</Th>
              <Th>State</Th>
              <Th>
                <span className="sr-only">Actions</span>
              </Th>
            </tr>
          </Thead>
          <tbody>
            {data.consents.map((c) => (
              <Tr key={c.id}>
                <Td>
                  <span className="font-semibold">{c.title}</span>
                  <span className="block text-sm text-ink-700">{CONSENT_KIND_LABELS[c.kind]}</span>
                </Td>
                <Td className="whitespace-nowrap">
                  <time dateTime={c.signedAt}>{formatDate(c.signedAt)}</time>
                </Td>
                <Td className="whitespace-nowrap">{c.expiresAt ? <time dateTime={c.expiresAt}>{formatDate(c.expiresAt)}</time> : 'Until withdrawn'}</Td>
                <Td>
                  <ConsentStateBadge state={c.state} />
                </Td>
                <Td className="text-right">
                  {c.state === 'active' ? (
                    <Button variant="danger" aria-label={`Withdraw ${c.title}`} onClick={() => setChosen(c)}>
                      Withdraw
                    </Button>
                  ) : null}
                </Td>
              </Tr>
            ))}
          </tbody>
        </Table>
      )}
      <WithdrawDialog
        open={chosen !== null}
        consent={chosen}
        consequences={chosen?.consequences ?? []}
        pending={withdraw.isPending}
        error={withdraw.error}
        onCancel={close}
        onConfirm={(reason) => {
          if (!chosen) return;
          const title = chosen.title;
          withdraw.mutate(
            { consentId: chosen.id, reason },
            {
              onSuccess: () => {
                close();
                setDone(`“${title}” is withdrawn. A confirmation is on its way to you by e-mail.`);
              },
            },
          );
        }}
      />
    </PublicFrame>
  );
}
