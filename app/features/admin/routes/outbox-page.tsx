import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { OutboxQuerySchema } from '#shared/schemas/admin.ts';
import { Button } from '../../../components/ui/button.tsx';
import { Dialog } from '../../../components/ui/dialog.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { Pager } from '../../../components/ui/pager.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { formatBytes, formatDateTime } from '../../../lib/format.ts';
import { parseListParams, useListParams } from '../../../lib/list-params.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { outboxMessageQueryOptions, outboxQueryOptions } from '../api.ts';
import { UnsentMail } from '../components/unsent-mail.tsx';
import { EmailAddress } from '../../../components/ui/email-address.tsx';

/** The text of one caught message; attachments are listed by name only (a consent copy carries health answers). */
function MessageDialog({ id, subject, onClose }: { id: string; subject: string; onClose: () => void }) {
  const message = useQuery(outboxMessageQueryOptions(id));
  return (
    <Dialog open onClose={onClose} title={subject} testId="outbox-message">
      <QueryView query={message} loadingLabel="Loading the message…">
        {(m) => (
          <div className="flex flex-col gap-3">
            <p className="text-sm text-ink-700">
              To {m.to.join(', ')}
              {m.date ? ` · ${formatDateTime(m.date)}` : ''}
            </p>
            <pre className="max-h-[50vh] overflow-auto rounded-lg bg-sand-100 p-3 font-sans text-sm whitespace-pre-wrap text-ink-900">{m.text}</pre>
            {m.attachments.length > 0 ? (
              <p className="text-sm text-ink-700">
                Attachments are not shown here: a signed consent carries health answers that only the performer and the designated lead may read.
              </p>
            ) : null}
          </div>
        )}
      </QueryView>
    </Dialog>
  );
}

export async function outboxLoader({ request }: LoaderFunctionArgs) {
  const query = parseListParams(OutboxQuerySchema, new URL(request.url).searchParams);
  await prefetchFor('outbox.read', outboxQueryOptions(query));
  return null;
}

export function OutboxPage() {
  const [query, setQuery] = useListParams(OutboxQuerySchema);
  const outbox = useQuery(outboxQueryOptions(query));
  const [reading, setReading] = useState<{ id: string; subject: string } | null>(null);

  return (
    <>
      <PageHeading
        title="Outbox"
        lead="Every e-mail Plinth has sent, as caught by the local mail catcher. Nothing here has reached a real inbox."
      >
        Outbox
      </PageHeading>
      <UnsentMail />
      <QueryView query={outbox} loadingLabel="Loading caught e-mails…">
        {(data) =>
          data.total === 0 ? (
            <EmptyState title="No e-mails yet.">
              When Plinth sends mail (for example, telling someone they have been given a role), it goes to the local mail
              catcher instead of a real inbox, and each message appears here.
            </EmptyState>
          ) : (
            <div className="flex flex-col">
              <Table caption="Caught e-mails, newest first" busy={outbox.isPlaceholderData} testId="outbox-table">
                <Thead>
                  <tr>
                    <Th>Date</Th>
                    <Th>To</Th>
                    <Th>Subject</Th>
                    <Th>Attachments</Th>
                    <Th>
                      <span className="sr-only">Download</span>
                    </Th>
                  </tr>
                </Thead>
                <tbody>
                  {data.items.map((m) => (
                    <Tr key={m.id}>
                      <Td className="whitespace-nowrap">
                        {m.date ? <time dateTime={m.date}>{formatDateTime(m.date)}</time> : <span className="text-ink-600">No date</span>}
                      </Td>
                      <Td>
                        <ul className="flex flex-col">
                          {m.to.map((to) => (
                            <li key={to}>
                              <EmailAddress value={to} />
                            </li>
                          ))}
                        </ul>
                      </Td>
                      <Td className="font-semibold">{m.subject}</Td>
                      <Td>
                        {m.attachments.length === 0 ? (
                          <span className="text-ink-600">None</span>
                        ) : (
                          <ul className="flex flex-col gap-1">
                            {m.attachments.map((a, i) => (
                              <li key={`${a.filename}-${i}`}>
                                <span className="break-all">{a.filename}</span>{' '}
                                <span className="text-sm whitespace-nowrap text-ink-600">({formatBytes(a.size)})</span>
                              </li>
                            ))}
                          </ul>
                        )}
                      </Td>
                      <Td className="text-right">
                        <Button variant="secondary" onClick={() => setReading({ id: m.id, subject: m.subject })} aria-label={`Read “${m.subject}”`}>
                          Read
                        </Button>
                      </Td>
                    </Tr>
                  ))}
                </tbody>
              </Table>
              <Pager page={data.page} pageSize={data.pageSize} total={data.total} noun="e-mails" onPage={(page) => setQuery({ page }, { push: true })} />
            </div>
          )
        }
      </QueryView>
      {reading ? <MessageDialog id={reading.id} subject={reading.subject} onClose={() => setReading(null)} /> : null}
    </>
  );
}
