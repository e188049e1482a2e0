import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { SCREENING_NOTE, TEST_KIND_LABELS, isScreeningKind } from '#shared/domain/protocols.ts';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { paths } from '../../../lib/paths.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { protocolsQueryOptions } from '../api.ts';
import { minutesInWords } from '../components/durations.ts';

export async function protocolsLoader() {
  await prefetchFor('catalogue.read', protocolsQueryOptions());
  return null;
}

export function ProtocolsPage() {
  const list = useQuery(protocolsQueryOptions());
  return (
    <>
      <PageHeading title="Test protocols" lead="How each kind of skin test runs: how long it stays covered, and when each reading falls due. A test keeps the version it was booked with.">
        Test protocols
      </PageHeading>
      <p className="max-w-prose text-ink-700">{SCREENING_NOTE} The occluded patch test is the clinician’s.</p>
      <Section title="Protocols">
        <QueryView query={list} loadingLabel="Loading protocols…">
          {(data) => (
            <Table caption="Protocols" captionHidden testId="protocols-table">
              <Thead>
                <tr>
                  <Th>Protocol</Th>
                  <Th>Covered for</Th>
                  <Th>Readings</Th>
                  <Th>Version</Th>
                </tr>
              </Thead>
              <tbody>
                {data.items.map(({ protocol: p, version }) => (
                  <Tr key={p.id}>
                    <Td>
                      <Link to={paths.protocol.href(p.id)} className="inline-flex min-h-11 items-center font-semibold" data-testid="protocol-link">
                        {p.name}
                      </Link>
                      <span className="block text-sm text-ink-700">
                        {TEST_KIND_LABELS[p.kind]}
                        {isScreeningKind(p.kind) ? ' · screening' : ''}
                      </span>
                    </Td>
                    <Td>{p.occlusionMinutes === null ? 'Left uncovered' : minutesInWords(p.occlusionMinutes)}</Td>
                    <Td>{p.readings.map((r) => r.label).join(', ')}</Td>
                    <Td>{version}</Td>
                  </Tr>
                ))}
              </tbody>
            </Table>
          )}
        </QueryView>
      </Section>
    </>
  );
}
