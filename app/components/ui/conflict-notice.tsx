import { Button } from './button.tsx';
import { errorMessage } from '../../lib/api-client.ts';

/** A 409 on a versioned record: someone saved first. Reloading shows their change before trying again. */
export function ConflictNotice({ error, onReload, reloading = false }: { error: unknown; onReload: () => void; reloading?: boolean }) {
  return (
    <div role="alert" className="flex flex-col gap-3 rounded-xl border-l-4 border-amber-700 bg-amber-100 p-4 text-amber-800" data-testid="conflict-notice">
      <p className="font-semibold">{errorMessage(error) || 'Someone else changed this since you opened it. Reload to see their change.'}</p>
      <p className="text-sm">Reloading replaces what you typed here with the saved version.</p>
      <div>
        <Button variant="secondary" pending={reloading} pendingLabel="Reloading…" onClick={onReload}>
          Reload
        </Button>
      </div>
    </div>
  );
}
