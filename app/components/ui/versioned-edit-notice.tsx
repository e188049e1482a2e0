import type { VersionedEdit } from '../../lib/use-versioned-edit.ts';
import { ConflictNotice } from './conflict-notice.tsx';
import { ErrorBanner } from './error-banner.tsx';

/** What a stale save shows: who saved first and a way to reload, or why reloading failed. */
export function VersionedEditNotice({ edit }: { edit: VersionedEdit }) {
  return (
    <>
      {edit.conflict ? <ConflictNotice error={edit.conflict} onReload={() => void edit.reload()} reloading={edit.reloading} /> : null}
      {edit.reloadError ? <ErrorBanner error={edit.reloadError} /> : null}
    </>
  );
}
