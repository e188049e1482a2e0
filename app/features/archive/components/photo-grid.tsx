import { useState } from 'react';
import type { Photo } from '#shared/schemas/archive.ts';
import { Button } from '../../../components/ui/button.tsx';
import { ConfirmDialog } from '../../../components/ui/dialog.tsx';
import { useRemovePhoto } from '../api.ts';

/** Thumbnails that open the full photo; the archivist may remove one. */
export function PhotoGrid({ castId, photos, canManage, label }: { castId: string; photos: readonly Photo[]; canManage: boolean; label: string }) {
  const remove = useRemovePhoto(castId);
  const [removing, setRemoving] = useState<Photo | null>(null);
  if (photos.length === 0) return null;
  return (
    <>
      <ul aria-label={label} className="flex flex-wrap gap-3">
        {photos.map((p, i) => (
          <li key={p.id} className="flex flex-col items-start gap-1">
            <a href={p.url} target="_blank" rel="noopener" className="inline-flex rounded-lg" aria-label={`Open photo ${i + 1} of ${photos.length} full size`}>
              <img src={p.thumbnailUrl} alt="" width={128} height={128} loading="lazy" className="size-32 rounded-lg border border-sand-300 object-cover" data-testid="cast-photo" />
            </a>
            {canManage ? (
              <Button variant="quiet" onClick={() => setRemoving(p)}>
                Remove<span className="sr-only"> photo {i + 1}</span>
              </Button>
            ) : null}
          </li>
        ))}
      </ul>
      <ConfirmDialog
        open={removing !== null}
        title="Remove this photo?"
        confirmLabel="Remove photo"
        pending={remove.isPending}
        error={remove.error}
        onCancel={() => {
          setRemoving(null);
          remove.reset();
        }}
        onConfirm={() => removing && remove.mutate(removing.id, { onSuccess: () => setRemoving(null) })}
      >
        <p>The photo is deleted from Plinth.</p>
      </ConfirmDialog>
    </>
  );
}
