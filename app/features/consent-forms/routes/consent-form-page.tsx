import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { CONSENT_KIND_LABELS } from '#shared/domain/consent.ts';
import { IdSchema } from '#shared/schemas/common.ts';
import type { Template } from '#shared/schemas/consents.ts';
import { NotFoundPage } from '../../../components/layout/not-found-page.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { ConfirmDialog } from '../../../components/ui/dialog.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { StatusBadge } from '../../../components/ui/status-badge.tsx';
import { Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { formatDateTime, plural } from '../../../lib/format.ts';
import { paths } from '../../../lib/paths.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { templateQueryOptions, templateVersionsQueryOptions, useArchiveTemplate } from '../api.ts';
import { TemplateEditor } from '../components/template-editor.tsx';

export async function consentFormLoader({ params }: LoaderFunctionArgs) {
  const id = IdSchema.safeParse(params.id);
  if (id.success) await prefetchFor('templates.manage', templateQueryOptions(id.data), templateVersionsQueryOptions(id.data));
  return null;
}

function Breadcrumb() {
  return (
    <nav aria-label="Breadcrumb">
      <Link to={paths.consentForms.href()} className="inline-flex min-h-11 items-center font-semibold">
        <span aria-hidden="true">←</span>&nbsp;All consent forms
      </Link>
    </nav>
  );
}

export function NewConsentFormPage() {
  return (
    <>
      <Breadcrumb />
      <PageHeading title="New consent form" lead="Write the text the performer reads, and any questions they answer before signing.">
        New consent form
      </PageHeading>
      <TemplateEditor />
    </>
  );
}

export function ConsentFormPage() {
  const params = useParams();
  const id = IdSchema.safeParse(params.id);
  if (!id.success) return <NotFoundPage />;
  return <ConsentForm id={id.data} />;
}

function ConsentForm({ id }: { id: string }) {
  const template = useQuery(templateQueryOptions(id));
  const t = template.data;
  if (!t && isApiError(template.error, 404)) {
    return (
      <>
        <Breadcrumb />
        <PageHeading title="Consent form not found">Consent form not found</PageHeading>
        <p className="text-ink-700">There is no consent form at this address.</p>
      </>
    );
  }
  return (
    <>
      <Breadcrumb />
      <PageHeading
        title={t?.title ?? 'Consent form'}
        testId="template-heading"
        lead={
          t ? (
            <span className="flex flex-wrap items-center gap-2">
              {CONSENT_KIND_LABELS[t.kind]} · version {t.version} · signed {plural(t.signedCount, 'time', 'times')}
              {t.archived ? <StatusBadge tone="neutral">Archived</StatusBadge> : null}
            </span>
          ) : undefined
        }
      >
        {t?.title ?? 'Consent form'}
      </PageHeading>
      <QueryView query={template} loadingLabel="Loading the form…">
        {(data) => (
          <div className="flex flex-col gap-6">
            {/* Keyed by id: another form starts a fresh editor. Publishing updates it in place. */}
            <TemplateEditor key={data.id} template={data} />
            <Versions id={data.id} />
            <ArchiveSection template={data} />
          </div>
        )}
      </QueryView>
    </>
  );
}

function Versions({ id }: { id: string }) {
  const versions = useQuery(templateVersionsQueryOptions(id));
  return (
    <Section title="Version history">
      <QueryView query={versions} loadingLabel="Loading versions…">
        {(data) => (
          <Table caption="Published versions, newest first" captionHidden testId="template-versions">
            <Thead>
              <tr>
                <Th>Version</Th>
                <Th>Title</Th>
                <Th>Published</Th>
                <Th>By</Th>
              </tr>
            </Thead>
            <tbody>
              {data.items.map((v) => (
                <Tr key={v.versionId}>
                  <Td className="font-semibold">v{v.version}</Td>
                  <Td>{v.title}</Td>
                  <Td className="whitespace-nowrap">
                    <time dateTime={v.createdAt}>{formatDateTime(v.createdAt)}</time>
                  </Td>
                  <Td>{v.createdBy ?? <span className="text-ink-600">Not recorded</span>}</Td>
                </Tr>
              ))}
            </tbody>
          </Table>
        )}
      </QueryView>
    </Section>
  );
}

function ArchiveSection({ template: t }: { template: Template }) {
  const archive = useArchiveTemplate(t.id);
  const [confirm, setConfirm] = useState(false);
  function close() {
    setConfirm(false);
    archive.reset();
  }
  return (
    <Section title={t.archived ? 'Archived' : 'Archive'}>
      <p className="max-w-prose text-ink-700">
        {t.archived
          ? 'This form cannot be sent to anyone. Consents already signed on it stay as they are.'
          : 'An archived form can no longer be sent or signed. Consents already signed on it stay as they are, and you can restore it later.'}
      </p>
      <div>
        <Button variant={t.archived ? 'secondary' : 'danger'} onClick={() => setConfirm(true)}>
          {t.archived ? 'Restore this form' : 'Archive this form'}
        </Button>
      </div>
      <ConfirmDialog
        open={confirm}
        title={t.archived ? 'Restore this form?' : 'Archive this form?'}
        confirmLabel={t.archived ? 'Restore' : 'Archive'}
        tone={t.archived ? 'primary' : 'danger'}
        pending={archive.isPending}
        error={archive.error}
        onCancel={close}
        onConfirm={() => archive.mutate(!t.archived, { onSuccess: close })}
      >
        <p>{t.archived ? `“${t.title}” can be sent to performers again.` : `“${t.title}” can no longer be sent. Requests already sent can still be signed unless you cancel them.`}</p>
      </ConfirmDialog>
    </Section>
  );
}
