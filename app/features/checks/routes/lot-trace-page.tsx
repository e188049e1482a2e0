import { useQuery } from '@tanstack/react-query';
import { Link, useParams } from 'react-router-dom';
import { SKIN_CHECK_OUTCOME_LABELS } from '#shared/domain/applications.ts';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { Table, Td, Th } from '../../../components/ui/table.tsx';
import { formatDate } from '../../../lib/format.ts';
import { paths } from '../../../lib/paths.ts';
import { lotTraceQueryOptions } from '../api.ts';

const USE_WORDS = { applied: 'Application', removal: 'Removal', in_appliance: 'Worn in an appliance piece' } as const;

/** A lot's trace for a recall or a cluster of reactions: every performer and application it touched. */
export function LotTracePage() {
  const { id = '' } = useParams();
  const trace = useQuery(lotTraceQueryOptions(id));
  return (
    <QueryView query={trace} loadingLabel="Tracing the lot…">
      {(t) => (
        <>
          <PageHeading title={`Lot ${t.lot.code}`} lead={`${t.lot.productName}, use by ${formatDate(t.lot.expiresOn)}: every performer and application it touched.`}>
            Lot {t.lot.code} of {t.lot.productName}
          </PageHeading>
          <Section title="Performers" testId="trace-performers">
            {t.performers.length === 0 ? (
              <EmptyState title="No logged application used this lot." />
            ) : (
              <ul className="flex flex-col gap-1">
                {t.performers.map((p) => (
                  <li key={p.id}>
                    <Link className="font-semibold underline" to={paths.performer.href(p.id)}>{p.name}</Link>: {p.applications === 1 ? 'one application' : `${p.applications} applications`}
                  </li>
                ))}
              </ul>
            )}
          </Section>
          {t.applications.length ? (
            <Section title="Applications" testId="trace-applications">
              <Table caption="Applications that used this lot" captionHidden>
                <thead>
                  <tr>
                    <Th>Date</Th>
                    <Th>Performer</Th>
                    <Th>Used for</Th>
                    <Th>Artist</Th>
                    <Th>Skin check</Th>
                  </tr>
                </thead>
                <tbody>
                  {t.applications.map((a) => (
                    <tr key={`${a.applicationId}-${a.use}`}>
                      <Td>
                        <Link className="font-semibold underline" to={paths.application.href(a.applicationId)}>{formatDate(a.appliedOn)}</Link>
                      </Td>
                      <Td>{a.performerName}</Td>
                      <Td>{USE_WORDS[a.use]}</Td>
                      <Td>{a.artistName ?? '—'}</Td>
                      <Td>{a.outcome ? `${SKIN_CHECK_OUTCOME_LABELS[a.outcome]}${a.observation ? `: ${a.observation}` : ''}` : a.reportSent ? 'Reported to the lead' : '—'}</Td>
                    </tr>
                  ))}
                </tbody>
              </Table>
            </Section>
          ) : null}
        </>
      )}
    </QueryView>
  );
}
