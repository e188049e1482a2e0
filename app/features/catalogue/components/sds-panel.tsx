import { useQueryClient } from '@tanstack/react-query';
import { useId, useRef, useState } from 'react';
import { SDS_MAX_BYTES, type ProductDetail } from '#shared/schemas/catalogue.ts';
import { Button, buttonClasses } from '../../../components/ui/button.tsx';
import { ConflictNotice } from '../../../components/ui/conflict-notice.tsx';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { ProgressBar } from '../../../components/ui/progress-bar.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { formatBytes, formatDateTime } from '../../../lib/format.ts';
import { invalidate } from '../../../lib/query-keys.ts';
import { useUpload } from '../../../lib/upload.ts';
import { productQueryOptions, productWritten, safetySheetUpload } from '../api.ts';
import { SolventCaution } from './solvent-caution.tsx';

/** The safety data sheet: download for everyone on the staff; upload or replace, with progress, for those who keep the catalogue. */
export function SafetySheetPanel({ product: p, canManage }: { product: ProductDetail; canManage: boolean }) {
  const queryClient = useQueryClient();
  const upload = useUpload<ProductDetail>();
  const inputRef = useRef<HTMLInputElement>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const hintId = useId();
  const sheet = p.safetySheet;
  const { state } = upload;

  async function send(file: File) {
    setProblem(null);
    if (file.size > SDS_MAX_BYTES) {
      setProblem(`The file is ${formatBytes(file.size)}; at most ${formatBytes(SDS_MAX_BYTES)} can be uploaded.`);
      return;
    }
    try {
      await productWritten(queryClient, await upload.start(safetySheetUpload(p, file)));
    } catch (err) {
      if (isApiError(err) && err.fields.sds) setProblem(err.fields.sds.join(' '));
    } finally {
      if (inputRef.current) inputRef.current.value = '';
    }
  }

  return (
    <div className="flex flex-col gap-3" data-testid="sds-panel">
      {p.solventCaution ? <SolventCaution landmark={false} /> : null}
      {sheet ? (
        <div className="flex flex-wrap items-center justify-between gap-3">
          <p>
            <span className="font-semibold">{sheet.fileName}</span>
            <span className="block text-sm text-ink-700">
              {formatBytes(sheet.byteSize)} · added {formatDateTime(sheet.uploadedAt)}
              {sheet.uploadedBy ? ` by ${sheet.uploadedBy}` : ''}
            </span>
          </p>
          <a href={sheet.url} download={sheet.fileName} className={buttonClasses('secondary')} data-testid="sds-download">
            Download the safety data sheet
          </a>
        </div>
      ) : (
        <p className="text-ink-700">No safety data sheet yet.</p>
      )}
      {canManage ? (
        <div className="flex flex-col gap-2">
          <input
            ref={inputRef}
            type="file"
            accept="application/pdf,.pdf"
            hidden
            onChange={(e) => {
              const file = e.target.files?.[0];
              if (file) void send(file);
            }}
            data-testid="sds-input"
          />
          <div>
            <Button variant="secondary" aria-describedby={hintId} pending={upload.uploading} pendingLabel="Uploading…" onClick={() => inputRef.current?.click()}>
              {sheet ? 'Replace the safety data sheet' : 'Upload the safety data sheet'}
            </Button>
          </div>
          <p id={hintId} className="text-sm text-ink-700">
            The maker’s PDF, up to {formatBytes(SDS_MAX_BYTES)}.
          </p>
          {state.status === 'uploading' ? <ProgressBar label={`Uploading ${state.fileName}`} value={state.progress} testId="sds-progress" /> : null}
          {problem ? (
            <p role="alert" className="text-sm font-semibold text-brick-700">
              {problem}
            </p>
          ) : state.status === 'error' && isApiError(state.error, 409) ? (
            <ConflictNotice error={state.error} onReload={() => void invalidate(queryClient, [productQueryOptions(p.id).queryKey]).then(() => upload.reset())} />
          ) : state.status === 'error' && !(state.error instanceof DOMException) ? (
            <ErrorBanner error={state.error} />
          ) : null}
        </div>
      ) : null}
    </div>
  );
}
