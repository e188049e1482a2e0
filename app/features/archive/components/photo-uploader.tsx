import { useQueryClient } from '@tanstack/react-query';
import { useId, useRef, useState } from 'react';
import { CAST_PHOTO_MAX_BYTES } from '#shared/limits.ts';
import type { Photo } from '#shared/schemas/archive.ts';
import { Button } from '../../../components/ui/button.tsx';
import { ProgressBar } from '../../../components/ui/progress-bar.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { formatBytes } from '../../../lib/format.ts';
import { useUpload } from '../../../lib/upload.ts';
import { photosAdded, photoUpload } from '../api.ts';

const ACCEPT = 'image/jpeg,image/png,image/webp,image/avif';

/**
 * Adds several photos at once: they go one by one (one file per request), with a bar for the
 * whole batch and the name of the file on its way; a file that is refused is named and the rest go on.
 */
export function PhotoUploader({ castId, conditionCheckId, label = 'Add photos' }: { castId: string; conditionCheckId?: string; label?: string }) {
  const queryClient = useQueryClient();
  const upload = useUpload<Photo>();
  const input = useRef<HTMLInputElement>(null);
  const hintId = useId();
  const [batch, setBatch] = useState<{ done: number; total: number } | null>(null);
  const [problems, setProblems] = useState<string[]>([]);
  const [sent, setSent] = useState<number | null>(null);

  async function send(files: File[]) {
    setProblems([]);
    setSent(null);
    const found: string[] = [];
    let ok = 0;
    setBatch({ done: 0, total: files.length });
    for (const [i, file] of files.entries()) {
      if (file.size > CAST_PHOTO_MAX_BYTES) found.push(`${file.name}: ${formatBytes(file.size)} is over the ${formatBytes(CAST_PHOTO_MAX_BYTES)} limit.`);
      else {
        try {
          await upload.start(photoUpload(castId, file, conditionCheckId));
          ok++;
        } catch (err) {
          if (err instanceof DOMException) break;
          found.push(`${file.name}: ${isApiError(err) ? (err.fields.photo?.join(' ') ?? err.message) : 'not sent.'}`);
        }
      }
      setBatch({ done: i + 1, total: files.length });
    }
    setBatch(null);
    setProblems(found);
    setSent(ok);
    if (input.current) input.current.value = '';
    if (ok > 0) await photosAdded(queryClient, castId);
  }

  const state = upload.state;
  const fraction = batch ? (batch.done + (state.status === 'uploading' ? state.progress : 0)) / batch.total : 0;
  return (
    <div className="flex flex-col gap-2">
      <input
        ref={input}
        type="file"
        accept={ACCEPT}
        multiple
        hidden
        onChange={(e) => {
          const files = [...(e.target.files ?? [])];
          if (files.length) void send(files);
        }}
        data-testid={conditionCheckId ? 'check-photo-input' : 'photo-input'}
      />
      <div>
        <Button variant="secondary" aria-describedby={hintId} pending={batch !== null} pendingLabel="Uploading…" onClick={() => input.current?.click()}>
          {label}
        </Button>
      </div>
      <p id={hintId} className="text-sm text-ink-700">
        JPEG, PNG, WebP or AVIF, up to {formatBytes(CAST_PHOTO_MAX_BYTES)} each; choose several at once. Location and other hidden data are removed.
      </p>
      {batch ? (
        <ProgressBar label={`Uploading photo ${Math.min(batch.done + 1, batch.total)} of ${batch.total}${state.status === 'uploading' ? `: ${state.fileName}` : ''}`} value={fraction} testId="photo-progress" />
      ) : null}
      {sent !== null && sent > 0 ? <output className="font-semibold text-sage-800">{sent === 1 ? 'One photo added.' : `${sent} photos added.`}</output> : null}
      {problems.length ? (
        <div role="alert" className="text-sm font-semibold text-brick-700">
          <p>Not added:</p>
          <ul className="list-disc pl-5">
            {problems.map((p) => (
              <li key={p}>{p}</li>
            ))}
          </ul>
        </div>
      ) : null}
    </div>
  );
}
