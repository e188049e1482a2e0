import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { CONSENT_KIND_LABELS } from '#shared/domain/consent.ts';
import { ButtonLink } from '../../../components/ui/button.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { StatusBadge } from '../../../components/ui/status-badge.tsx';
import { Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { formatDate, formatNumber, plural } from '../../../lib/format.ts';
import { paths } from '../../../lib/paths.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { templatesQueryOptions } from '../api.ts';

export async function consentFormsLoader() {
  await prefetchFor('templates.manage', templatesQueryOptions({ archived: true }));
  return null;
}

export function validityText(days: number | null): string {
  if (days === null) return 'Until withdrawn';
  if (days % 365 === 0) return plural(days / 365, 'year', 'years');
  return plural(days, 'day', 'days');
}

/** The studio's consent forms: what performers are asked to read and sign. */
export function ConsentFormsPage() {
  const templates = useQuery(templatesQueryOptions({ archived: true }));
  return (
    <>
      <PageHeading
        title="Consent forms"
        lead="The forms performers sign, shared by every production. Editing one publishes a new version; signed consents keep the version they were signed on."
        actions={<ButtonLink to={paths.newConsentForm.href()}>New consent form</ButtonLink>}
      >
        Consent forms
      </PageHeading>
      <QueryView query={templates} loadingLabel="Loading consent forms…">
        {(data) =>
          data.items.length === 0 ? (
            <EmptyState title="No consent forms yet." action={<ButtonLink to={paths.newConsentForm.href()}>Write the first one</ButtonLink>} />
          ) : (
            <Table caption="Consent forms" captionHidden testId="templates-table">
              <Thead>
                <tr>
                  <Th>Kind</Th>
                  <Th>Title</Th>
                  <Th>Version</Th>
                  <Th>Valid for</Th>
                  <Th className="text-right">Signed</Th>
                  <Th>Status</Th>
                </tr>
              </Thead>
              <tbody>
                {data.items.map((t) => (
                  <Tr key={t.id}>
                    <Td className="whitespace-nowrap">{CONSENT_KIND_LABELS[t.kind]}</Td>
                    <Td>
                      <Link to={paths.consentForm.href(t.id)} className="inline-flex min-h-11 items-center font-semibold">
                        {t.title}
                      </Link>
                    </Td>
                    <Td className="whitespace-nowrap">
                      v{t.version} <span className="block text-sm text-ink-700">{formatDate(t.updatedAt)}</span>
                    </Td>
                    <Td className="whitespace-nowrap">{validityText(t.validityDays)}</Td>
                    <Td className="text-right">{formatNumber(t.signedCount)}</Td>
                    <Td>{t.archived ? <StatusBadge tone="neutral">Archived</StatusBadge> : <StatusBadge tone="good">In use</StatusBadge>}</Td>
                  </Tr>
                ))}
              </tbody>
            </Table>
          )
        }
      </QueryView>
    </>
  );
}
