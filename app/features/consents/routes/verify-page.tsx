import { useRef, useState } from 'react';
import { Link } from 'react-router-dom';
import { CONSENT_KIND_LABELS, CONSENT_STATE_LABELS } from '#shared/domain/consent.ts';
import type { VerifyResult } from '#shared/schemas/consents.ts';
import { Button } from '../../../components/ui/button.tsx';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { FileField } from '../../../components/ui/file-field.tsx';
import { Icon } from '../../../components/ui/icons.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { ProgressBar } from '../../../components/ui/progress-bar.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { formatBytes, formatDateTime } from '../../../lib/format.ts';
import { paths } from '../../../lib/paths.ts';
import { useUpload } from '../../../lib/upload.ts';
import { verifyUpload } from '../api.ts';
import { VERIFY_MAX_BYTES } from '#shared/limits.ts';

const MAX_BYTES = VERIFY_MAX_BYTES;

/** Is this PDF, byte for byte, one Plinth issued? Checked by its SHA-256 against every signed consent. */
export function VerifyPage() {
  const upload = useUpload<VerifyResult>();
  const [file, setFile] = useState<File | null>(null);
  const [fileError, setFileError] = useState<string | undefined>();
  const inputRef = useRef<HTMLInputElement>(null);
  const { state } = upload;

  async function check() {
    if (!file) {
      setFileError('Choose a PDF to check');
      inputRef.current?.focus();
      return;
    }
    if (file.size > MAX_BYTES) {
      setFileError(`At most ${formatBytes(MAX_BYTES)}; this file is ${formatBytes(file.size)}.`);
      return;
    }
    setFileError(undefined);
    await upload.start(verifyUpload(file)).catch((err: unknown) => {
      if (isApiError(err) && err.fields.file) setFileError(err.fields.file.join(' '));
    });
  }

  return (
    <>
      <PageHeading title="Check a PDF" lead="Find out whether a consent PDF is one Plinth issued, unaltered. The file is compared by its fingerprint (SHA-256) and is not kept.">
        Check a PDF
      </PageHeading>
      <Section title="Choose the file">
        <form
          noValidate
          className="flex flex-col gap-4"
          aria-label="Check a PDF"
          onSubmit={(e) => {
            e.preventDefault();
            void check();
          }}
        >
          <FileField
            ref={inputRef}
            label="Consent PDF"
            accept="application/pdf,.pdf"
            hint={`A PDF of at most ${formatBytes(MAX_BYTES)}, as Plinth e-mailed or downloaded it.`}
            error={fileError}
            disabled={upload.uploading}
            onChange={(e) => {
              setFile(e.target.files?.[0] ?? null);
              setFileError(undefined);
              upload.reset();
            }}
            data-testid="verify-file"
          />
          {state.status === 'uploading' ? <ProgressBar label={`Sending ${state.fileName}`} value={state.progress} testId="verify-progress" /> : null}
          {state.status === 'error' && !(isApiError(state.error) && state.error.fields.file) ? <ErrorBanner error={state.error} /> : null}
          <div>
            <Button type="submit" pending={upload.uploading} pendingLabel="Checking…">
              Check this PDF
            </Button>
          </div>
        </form>
      </Section>
      {state.status === 'done' ? <VerifyOutcome result={state.data} /> : null}
    </>
  );
}

function VerifyOutcome({ result }: { result: VerifyResult }) {
  const c = result.consent;
  return (
    <section
      aria-live="polite"
      aria-label="Result"
      className={`flex flex-col gap-3 rounded-2xl border-l-4 p-6 ${result.match ? 'border-sage-700 bg-sage-100' : 'border-brick-700 bg-brick-50'}`}
      data-testid="verify-result"
    >
      {result.match && c ? (
        <p className="flex items-start gap-2 text-lg text-ink-900">
          <Icon name="check" className="mt-1 size-6 text-sage-800" />
          <span>
            <span className="font-bold">This is an unaltered consent Plinth issued:</span> {c.performerName}, {c.title} v{c.templateVersion} (
            {CONSENT_KIND_LABELS[c.kind]}), signed <time dateTime={c.signedAt}>{formatDateTime(c.signedAt)}</time>, now{' '}
            {CONSENT_STATE_LABELS[c.state].toLowerCase()}.{' '}
            <span data-testid="verify-copy">
              {result.copy === 'staff' ? 'This file is the staff copy: health answers are withheld from it.' : 'This file is the full signed copy.'}
            </span>{' '}
            <Link to={paths.consent.href(c.id)} className="font-semibold">
              Open the consent
            </Link>
          </span>
        </p>
      ) : result.match ? (
        <p className="flex items-start gap-2 text-lg text-ink-900">
          <Icon name="check" className="mt-1 size-6 text-sage-800" />
          <span>
            <span className="font-bold">This is an unaltered consent Plinth issued</span>, for a production you do not work on. Ask that production’s department
            head for its details.
          </span>
        </p>
      ) : (
        <p className="flex items-start gap-2 text-lg text-ink-900">
          <Icon name="blocked" className="mt-1 size-6 text-brick-800" />
          <span>
            <span className="font-bold">Plinth did not issue this exact file</span> (it may have been altered).
          </span>
        </p>
      )}
      <p className="text-sm text-ink-700">
        SHA-256 of the file: <span className="font-mono break-all text-ink-900" data-testid="verify-sha256">{result.sha256}</span>
      </p>
    </section>
  );
}
