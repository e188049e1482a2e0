import { useQueryClient } from '@tanstack/react-query';
import { useId, useRef, useState } from 'react';
import type { PerformerDetail } from '#shared/schemas/performers.ts';
import { Button } from '../../../components/ui/button.tsx';
import { ConfirmDialog } from '../../../components/ui/dialog.tsx';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { ProgressBar } from '../../../components/ui/progress-bar.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { formatBytes } from '../../../lib/format.ts';
import { useUpload } from '../../../lib/upload.ts';
import { performerWritten, portraitUpload, useRemovePortrait } from '../api.ts';
import { Thumbnail, displayName } from './names.tsx';
import { PORTRAIT_MAX_BYTES } from '#shared/limits.ts';

const MAX_BYTES = PORTRAIT_MAX_BYTES;
const ACCEPT = 'image/jpeg,image/png,image/webp,image/avif';

/** The portrait, and (for those who manage the performer) upload, replace and remove with progress. */
export function PortraitPanel({ performer: p }: { performer: PerformerDetail }) {
  const queryClient = useQueryClient();
  const upload = useUpload<PerformerDetail>();
  const remove = useRemovePortrait(p.id);
  const inputRef = useRef<HTMLInputElement>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const [confirmRemove, setConfirmRemove] = useState(false);
  const hintId = useId();
  const name = displayName(p);
  const { state } = upload;

  async function send(file: File) {
    setProblem(null);
    if (file.size > MAX_BYTES) {
      setProblem(`The photo is ${formatBytes(file.size)}; at most ${formatBytes(MAX_BYTES)} can be uploaded.`);
      return;
    }
    try {
      const detail = await upload.start(portraitUpload(p.id, file));
      await performerWritten(queryClient, detail);
    } catch (err) {
      if (isApiError(err) && err.fields.portrait) setProblem(err.fields.portrait.join(' '));
    } finally {
      if (inputRef.current) inputRef.current.value = '';
    }
  }

  return (
    <div className="flex flex-col items-start gap-3" data-testid="portrait-panel">
      {p.portraitUrl ? (
        <img src={p.portraitUrl} alt={`Portrait of ${name}`} width={160} height={160} className="size-40 rounded-xl border border-sand-300 object-cover" data-testid="portrait" />
      ) : (
        <Thumbnail url={null} name={name} size="lg" />
      )}
      {p.canEdit ? (
        <div className="flex flex-col gap-2">
          <input
            ref={inputRef}
            type="file"
            accept={ACCEPT}
            hidden
            onChange={(e) => {
              const file = e.target.files?.[0];
              if (file) void send(file);
            }}
            data-testid="portrait-input"
          />
          <div className="flex flex-wrap gap-2">
            <Button variant="secondary" aria-describedby={hintId} pending={upload.uploading} pendingLabel="Uploading…" onClick={() => inputRef.current?.click()}>
              {p.portraitUrl ? 'Replace photo' : 'Add a photo'}
            </Button>
            {p.portraitUrl ? (
              <Button variant="quiet" onClick={() => setConfirmRemove(true)} disabled={upload.uploading}>
                Remove photo
              </Button>
            ) : null}
          </div>
          <p id={hintId} className="max-w-56 text-sm text-ink-700">
            JPEG, PNG, WebP or AVIF, up to {formatBytes(MAX_BYTES)}. Plinth removes location and other hidden data from the photo.
          </p>
          {state.status === 'uploading' ? <ProgressBar label={`Uploading ${state.fileName}`} value={state.progress} testId="portrait-progress" /> : null}
          {problem ? (
            <p role="alert" className="max-w-56 text-sm font-semibold text-brick-700">
              {problem}
            </p>
          ) : state.status === 'error' && !(state.error instanceof DOMException) ? (
            <ErrorBanner error={state.error} />
          ) : null}
        </div>
      ) : null}
      <ConfirmDialog
        open={confirmRemove}
        title="Remove the photo?"
        confirmLabel="Remove photo"
        pending={remove.isPending}
        error={remove.error}
        onCancel={() => {
          setConfirmRemove(false);
          remove.reset();
        }}
        onConfirm={() => remove.mutate(undefined, { onSuccess: () => setConfirmRemove(false) })}
      >
        <p>The photo of {name} is deleted from Plinth. You can add another at any time.</p>
      </ConfirmDialog>
    </div>
  );
}
