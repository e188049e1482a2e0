import { useQuery } from '@tanstack/react-query';
import { Button } from '../../../components/ui/button.tsx';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { formatDateTime } from '../../../lib/format.ts';
import { mailFailuresQueryOptions, useRetryMail } from '../api.ts';
import { EmailAddress } from '../../../components/ui/email-address.tsx';

/**
 * Mail that followed a change but could not be sent: the change stood, the message was kept.
 * Shown by recipient and subject only; a retry sends it exactly as it was.
 */
export function UnsentMail() {
  const failures = useQuery(mailFailuresQueryOptions());
  const retry = useRetryMail();
  if (!failures.data || failures.data.items.length === 0) return failures.error ? <ErrorBanner error={failures.error} /> : null;
  const last = retry.data;
  return (
    <Section title="Not sent" testId="unsent-mail">
      <p className="max-w-prose text-ink-700">
        These messages followed a change that was saved, but the mail relay did not take them. Send them again once it is working.
      </p>
      {last && !last.sent ? <ErrorBanner message={`Still not sent: ${last.error ?? 'the relay refused it'}.`} /> : null}
      {retry.error ? <ErrorBanner error={retry.error} /> : null}
      <Table caption="Messages not yet sent, newest first" captionHidden testId="unsent-mail-table">
        <Thead>
          <tr>
            <Th>Failed</Th>
            <Th>To</Th>
            <Th>Subject</Th>
            <Th>Problem</Th>
            <Th>
              <span className="sr-only">Actions</span>
            </Th>
          </tr>
        </Thead>
        <tbody>
          {failures.data.items.map((f) => (
            <Tr key={f.id}>
              <Td className="whitespace-nowrap">
                <time dateTime={f.failedAt}>{formatDateTime(f.failedAt)}</time>
              </Td>
              <Td>
                <EmailAddress value={f.recipients} />
              </Td>
              <Td className="font-semibold">{f.subject}</Td>
              <Td className="text-sm text-ink-700">
                {f.error}
                {f.attempts > 1 ? ` (${f.attempts} tries)` : ''}
              </Td>
              <Td className="text-right">
                <Button
                  variant="secondary"
                  pending={retry.isPending && retry.variables === f.id}
                  pendingLabel="Sending…"
                  aria-label={`Send “${f.subject}” again`}
                  onClick={() => retry.mutate(f.id)}
                >
                  Send again
                </Button>
              </Td>
            </Tr>
          ))}
        </tbody>
      </Table>
    </Section>
  );
}
