import { useQueryClient } from '@tanstack/react-query';
import { useRef, useState } from 'react';
import { Link } from 'react-router-dom';
import { CSV_COLUMNS, type CsvImportResult } from '#shared/schemas/performers.ts';
import { Button } from '../../../components/ui/button.tsx';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { FileField } from '../../../components/ui/file-field.tsx';
import { Icon } from '../../../components/ui/icons.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { ProgressBar } from '../../../components/ui/progress-bar.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { StatusBadge } from '../../../components/ui/status-badge.tsx';
import { Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { formatBytes, plural } from '../../../lib/format.ts';
import { paths } from '../../../lib/paths.ts';
import { useUpload } from '../../../lib/upload.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { importReportOf, importUpload, invalidateAfterImport } from '../api.ts';
import { seatProduction } from '../../../lib/session/seat-production.ts';
import { IMPORT_MAX_BYTES } from '#shared/limits.ts';

const MAX_BYTES = IMPORT_MAX_BYTES;

const COLUMN_NOTES: Record<(typeof CSV_COLUMNS)[number], string> = {
  legal_name: 'Required. As on their contract.',
  preferred_name: 'The name they go by, if different.',
  pronouns: 'In their words, for example “she/her”.',
  email: 'Where signing links and signed copies go. A performer already on file with this address is engaged, not added twice.',
  phone: '',
  emergency_contact_name: '',
  emergency_contact_phone: '',
  agent_name: '',
  agent_contact: 'Phone or e-mail.',
  character_name: 'Their part on this production.',
  notes: 'Practical notes only; never health details.',
};

const EXAMPLE = [
  'legal_name,preferred_name,pronouns,email,character_name',
  'Ada Quintrell,,she/her,ada.q@example.test,The Lighthouse Cook',
  'Bertram Okafor-Lisle,Bert Okafor,he/him,,Ferryman',
].join('\r\n');

const ACTION_LABELS: Record<CsvImportResult['rows'][number]['action'], string> = {
  create: 'New performer',
  engage_existing: 'On file: engaged here',
  already_engaged: 'Already engaged',
};

export function ImportPage() {
  const session = useSession();
  const production = seatProduction(session);
  const queryClient = useQueryClient();
  const upload = useUpload<CsvImportResult>();
  const inputRef = useRef<HTMLInputElement>(null);
  const [file, setFile] = useState<File | null>(null);
  const [fileError, setFileError] = useState<string | undefined>();
  const [report, setReport] = useState<CsvImportResult | null>(null);
  const [failure, setFailure] = useState<unknown>(null);
  const [step, setStep] = useState<'checking' | 'importing' | null>(null);

  if (!production) {
    return (
      <>
        <PageHeading title="Import performers">Import performers</PageHeading>
        <p className="text-ink-700">Switch “Acting as” to a production you manage performers on.</p>
      </>
    );
  }
  const productionId = production.id;

  async function run(commit: boolean) {
    if (!file) {
      setFileError('Choose a CSV file to import.');
      inputRef.current?.focus();
      return;
    }
    if (file.size > MAX_BYTES) {
      setFileError(`At most ${formatBytes(MAX_BYTES)}; this file is ${formatBytes(file.size)}.`);
      return;
    }
    setFileError(undefined);
    setFailure(null);
    setStep(commit ? 'importing' : 'checking');
    try {
      const result = await upload.start(importUpload(productionId, commit, file));
      setReport(result);
      if (result.committed) await invalidateAfterImport(queryClient);
    } catch (err) {
      if (err instanceof DOMException) return;
      const refused = importReportOf(err);
      if (refused) setReport(refused);
      else if (isApiError(err) && err.fields.file && !commit) setFileError(err.fields.file.join(' '));
      else setFailure(err);
    } finally {
      setStep(null);
    }
  }

  const toImport = report && !report.committed ? report.created + report.engaged : 0;
  const ready = report !== null && !report.committed && report.errorCount === 0 && toImport > 0;
  const state = upload.state;

  return (
    <>
      <nav aria-label="Breadcrumb">
        <Link to={paths.performers.href()} className="inline-flex min-h-11 items-center font-semibold">
          <span aria-hidden="true">←</span>&nbsp;All performers
        </Link>
      </nav>
      <PageHeading title="Import performers" lead={`Add many performers at once from a spreadsheet, engaged on ${production.name}. Plinth checks every row first; the import then adds all of them or none.`}>
        Import performers
      </PageHeading>

      <Section title="The file">
        <p className="max-w-prose text-ink-700">
          A CSV file in UTF-8 (in a spreadsheet: “Save as… CSV UTF-8”), at most {formatBytes(MAX_BYTES)} and 2,000 rows. The first row names the columns; any of these, in
          any order. Only <code className="rounded bg-sand-100 px-1 font-mono">legal_name</code> is required.
        </p>
        <Table caption="Columns Plinth reads" captionHidden testId="csv-columns">
          <Thead>
            <tr>
              <Th>Column</Th>
              <Th>What goes in it</Th>
            </tr>
          </Thead>
          <tbody>
            {CSV_COLUMNS.map((c) => (
              <Tr key={c}>
                <Td className="font-mono text-sm whitespace-nowrap">{c}</Td>
                <Td>{COLUMN_NOTES[c] || <span className="text-ink-600">Optional.</span>}</Td>
              </Tr>
            ))}
          </tbody>
        </Table>
        <div className="flex flex-col gap-2">
          <p className="font-semibold text-ink-900">A small example</p>
          <pre className="overflow-x-auto rounded-lg bg-sand-100 p-3 font-mono text-sm text-ink-900" data-testid="csv-example">
            {EXAMPLE}
          </pre>
          <div>
            <Button variant="secondary" onClick={() => downloadExample()}>
              Download the example
            </Button>
          </div>
        </div>
      </Section>

      <Section title="Check and import">
        <form
          noValidate
          className="flex flex-col gap-4"
          aria-label="Check the file"
          onSubmit={(e) => {
            e.preventDefault();
            void run(false);
          }}
        >
          <FileField
            ref={inputRef}
            label="CSV file"
            accept=".csv,text/csv"
            error={fileError}
            disabled={upload.uploading}
            onChange={(e) => {
              setFile(e.target.files?.[0] ?? null);
              setReport(null);
              setFailure(null);
              setFileError(undefined);
              upload.reset();
            }}
            data-testid="import-file"
          />
          {state.status === 'uploading' ? (
            <ProgressBar label={step === 'importing' ? `Importing ${state.fileName}` : `Sending ${state.fileName} to be checked`} value={state.progress} testId="import-progress" />
          ) : null}
          {failure ? <ErrorBanner error={failure} /> : null}
          <div>
            <Button type="submit" variant={ready ? 'secondary' : 'primary'} pending={step === 'checking'} pendingLabel="Checking…" disabled={upload.uploading}>
              Check the file
            </Button>
          </div>
        </form>

        {report ? <ImportReport report={report} productionName={production.name} /> : null}

        {report && !report.committed ? (
          <div className="flex flex-col gap-2 border-t border-sand-200 pt-4">
            <div>
              <Button onClick={() => void run(true)} disabled={!ready || upload.uploading} pending={step === 'importing'} pendingLabel="Importing…" data-testid="import-commit">
                Import {plural(toImport, 'performer', 'performers')}
              </Button>
            </div>
            {!ready ? (
              <p className="text-sm text-ink-700">
                {report.errorCount > 0 ? 'Fix the problems listed in the file, choose it again and check it again.' : 'There is nothing in this file to import.'}
              </p>
            ) : null}
          </div>
        ) : null}
      </Section>
    </>
  );
}

function downloadExample() {
  const url = URL.createObjectURL(new Blob(['\uFEFF', EXAMPLE, '\r\n'], { type: 'text/csv;charset=utf-8' }));
  const a = document.createElement('a');
  a.href = url;
  a.download = 'plinth-performers-example.csv';
  document.body.append(a);
  a.click();
  a.remove();
  window.setTimeout(() => URL.revokeObjectURL(url), 1000);
}

function ImportReport({ report, productionName }: { report: CsvImportResult; productionName: string }) {
  const bad = report.rows.filter((r) => Object.keys(r.errors).length > 0);
  const good = report.rows.filter((r) => Object.keys(r.errors).length === 0);

  if (report.committed) {
    return (
      <output className="flex items-start gap-2 rounded-xl border-l-4 border-sage-700 bg-sage-100 p-4 text-lg text-sage-800" data-testid="import-result">
        <Icon name="check" className="mt-1 size-5" />
        <span>
          Imported: {plural(report.created, 'new performer', 'new performers')} added and {plural(report.engaged, 'performer', 'performers')} already on file engaged on{' '}
          {productionName}.{' '}
          <Link to={paths.performers.href()} className="font-semibold">
            See the performers
          </Link>
        </span>
      </output>
    );
  }

  return (
    <div className="flex flex-col gap-4" data-testid="import-preview">
      <output className={`block rounded-xl border-l-4 p-4 ${report.errorCount > 0 ? 'border-brick-700 bg-brick-50' : 'border-sage-700 bg-sage-100'}`}>
        {report.errorCount > 0 ? (
          <>
            <span className="font-bold">Nothing can be imported yet:</span> {plural(report.errorCount, 'problem', 'problems')} to fix. {plural(good.length, 'row is', 'rows are')} fine.
          </>
        ) : (
          <>
            <span className="font-bold">Every row is fine.</span> {plural(report.created, 'new performer', 'new performers')} to add,{' '}
            {plural(report.engaged, 'performer', 'performers')} already on file to engage
            {good.length - report.created - report.engaged > 0 ? `, ${plural(good.length - report.created - report.engaged, 'row', 'rows')} already engaged` : ''}.
          </>
        )}
      </output>
      {report.fileErrors.length ? (
        <ul className="flex list-disc flex-col gap-1 pl-6 font-semibold text-brick-700" data-testid="import-file-errors">
          {report.fileErrors.map((e) => (
            <li key={e}>{e}</li>
          ))}
        </ul>
      ) : null}
      {bad.length ? (
        <Table caption="Rows to fix" testId="import-errors">
          <Thead>
            <tr>
              <Th>Line</Th>
              <Th>Legal name</Th>
              <Th>Problems</Th>
            </tr>
          </Thead>
          <tbody>
            {bad.map((r) => (
              <Tr key={r.line}>
                <Td className="font-semibold whitespace-nowrap">Line {r.line}</Td>
                <Td>{r.legalName || <span className="text-ink-600">(empty)</span>}</Td>
                <Td>
                  <ul className="flex flex-col gap-1">
                    {Object.entries(r.errors).map(([column, messages]) => (
                      <li key={column} className="text-brick-700">
                        <span className="font-mono text-sm font-semibold">{column}</span>: {messages.join(' ')}
                      </li>
                    ))}
                  </ul>
                </Td>
              </Tr>
            ))}
          </tbody>
        </Table>
      ) : null}
      {good.length ? (
        <Table caption="Rows ready" testId="import-ready">
          <Thead>
            <tr>
              <Th>Line</Th>
              <Th>Legal name</Th>
              <Th>E-mail</Th>
              <Th>What happens</Th>
            </tr>
          </Thead>
          <tbody>
            {good.map((r) => (
              <Tr key={r.line}>
                <Td className="whitespace-nowrap">Line {r.line}</Td>
                <Td className="font-semibold">{r.legalName}</Td>
                <Td className="break-all">{r.email ?? <span className="text-ink-600">None</span>}</Td>
                <Td>
                  <StatusBadge tone={r.action === 'already_engaged' ? 'neutral' : 'good'}>{ACTION_LABELS[r.action]}</StatusBadge>
                </Td>
              </Tr>
            ))}
          </tbody>
        </Table>
      ) : null}
    </div>
  );
}

