import { useQuery } from '@tanstack/react-query';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { formatDateTime } from '../../../lib/format.ts';
import { healthReadsQueryOptions } from '../api.ts';

/** Every read of the performer's health details, by whom and when: shown to the performer and the lead. */
export function HealthReads({ performerId, isSelf }: { performerId: string; isSelf: boolean }) {
  const reads = useQuery(healthReadsQueryOptions(performerId));
  return (
    <Section title={isSelf ? 'Who has seen your health details' : 'Who has read these health details'} testId="health-reads">
      <p className="max-w-prose text-ink-700">
        {isSelf
          ? 'Plinth records every time someone opens your health answers or your signed forms that hold them. Only the designated lead of your production, and you, can see them.'
          : 'Every opening of this performer’s health details is recorded; the performer sees this same list on their record.'}
      </p>
      <p>
        {/* A plain download: the browser saves the ZIP the server builds. */}
        <a href={`/api/performers/${encodeURIComponent(performerId)}/records.zip`} className="inline-flex min-h-11 items-center font-semibold" download>
          {isSelf ? 'Download everything Plinth holds about you (ZIP)' : 'Download this performer’s records to hand over (ZIP)'}
        </a>
      </p>
      <QueryView query={reads} loadingLabel="Loading the record of reads…">
        {(data) =>
          data.items.length === 0 ? (
            <EmptyState title="No one has read them yet." />
          ) : (
            <Table caption="Reads of health details, newest first" captionHidden testId="health-reads-table">
              <Thead>
                <tr>
                  <Th>When</Th>
                  <Th>Who</Th>
                  <Th>What</Th>
                </tr>
              </Thead>
              <tbody>
                {data.items.map((r, i) => (
                  <Tr key={`${r.at}-${i}`}>
                    <Td className="whitespace-nowrap">
                      <time dateTime={r.at}>{formatDateTime(r.at)}</time>
                    </Td>
                    <Td>{r.who ?? 'A former user'}</Td>
                    <Td>{r.what}</Td>
                  </Tr>
                ))}
              </tbody>
            </Table>
          )
        }
      </QueryView>
    </Section>
  );
}
