import { useQueryClient } from '@tanstack/react-query';
import { useId, useRef, useState } from 'react';
import { CAST_PHOTO_MAX_BYTES } from '#shared/limits.ts';
import type { BuildDetail } from '#shared/schemas/builds.ts';
import { Button } from '../../../components/ui/button.tsx';
import { ProgressBar } from '../../../components/ui/progress-bar.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { formatBytes } from '../../../lib/format.ts';
import { useUpload } from '../../../lib/upload.ts';
import { buildPhotoUpload, buildWritten } from '../api.ts';

const ACCEPT = 'image/jpeg,image/png,image/webp,image/avif';

/** The run's photo, and (for those who record builds) setting or replacing it, with progress. */
export function BuildPhoto({ build }: { build: BuildDetail }) {
  const queryClient = useQueryClient();
  const upload = useUpload<BuildDetail>();
  const input = useRef<HTMLInputElement>(null);
  const hintId = useId();
  const [problem, setProblem] = useState<string | null>(null);

  async function send(file: File) {
    setProblem(null);
    if (file.size > CAST_PHOTO_MAX_BYTES) return setProblem(`${file.name}: ${formatBytes(file.size)} is over the ${formatBytes(CAST_PHOTO_MAX_BYTES)} limit.`);
    try {
      await buildWritten(queryClient, await upload.start(buildPhotoUpload(build.id, file)));
    } catch (err) {
      if (err instanceof DOMException) return;
      setProblem(isApiError(err) ? (err.fields.photo?.join(' ') ?? err.message) : 'The photo was not sent.');
    } finally {
      if (input.current) input.current.value = '';
    }
  }

  return (
    <Section title="Photo" testId="build-photo">
      {build.photo ? (
        <a href={build.photo.url} className="inline-block w-fit">
          <img src={build.photo.thumbnailUrl} alt={`The pieces of this run from ${build.performer.name}’s mold ${build.mold.labelCode}`} width={256} height={256} className="rounded-xl border border-sand-300" />
        </a>
      ) : (
        <p className="text-ink-700">No photo of this run yet.</p>
      )}
      {build.canManage ? (
        <div className="flex flex-col gap-2">
          <input ref={input} type="file" accept={ACCEPT} hidden onChange={(e) => e.target.files?.[0] && void send(e.target.files[0])} data-testid="build-photo-input" />
          <div>
            <Button variant="secondary" aria-describedby={hintId} pending={upload.uploading} pendingLabel="Uploading…" onClick={() => input.current?.click()}>
              {build.photo ? 'Replace the photo' : 'Add a photo'}
            </Button>
          </div>
          <p id={hintId} className="text-sm text-ink-700">
            JPEG, PNG, WebP or AVIF, up to {formatBytes(CAST_PHOTO_MAX_BYTES)}. Location and other hidden data are removed.
          </p>
          {upload.state.status === 'uploading' ? <ProgressBar label={`Uploading ${upload.state.fileName}`} value={upload.state.progress} /> : null}
          {problem ? (
            <p role="alert" className="text-sm font-semibold text-brick-700">
              {problem}
            </p>
          ) : null}
        </div>
      ) : null}
    </Section>
  );
}
