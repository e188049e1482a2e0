import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { QrScanner } from '../../../components/qr-scanner.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { plinthPathFromCode } from '../../../lib/scanned-code.ts';
import { performerSearchQueryOptions } from '../api.ts';

export interface PickedPerformer {
  id: string;
  name: string;
}

/** The performer id a scanned card opens (`/check?performerId=…` on this Plinth), or null. */
export function performerIdFromCode(text: string, origin: string): string | null {
  const path = plinthPathFromCode(text, origin);
  if (!path) return null;
  const url = new URL(path, origin);
  const id = url.pathname === '/check' ? url.searchParams.get('performerId') : null;
  return id && /^[0-9a-f-]{36}$/i.test(id) ? id : null;
}

/** Choose the performer: search by name on the acting production, or scan the QR code on their card. */
export function PerformerPicker({ productionId, onPick }: { productionId: string; onPick: (p: PickedPerformer | { id: string; name: null }) => void }) {
  const [q, setQ] = useState('');
  const [scanning, setScanning] = useState(false);
  const [attempt, setAttempt] = useState(0);
  const [problem, setProblem] = useState<string | null>(null);
  const results = useQuery({ ...performerSearchQueryOptions(productionId, q.trim()), enabled: q.trim().length >= 2 });

  function onScan(text: string) {
    const id = performerIdFromCode(text, window.location.origin);
    if (id) {
      setScanning(false);
      onPick({ id, name: null });
      return;
    }
    setProblem('This code is not a Plinth performer card. Scan the code on the performer’s card, or search by name.');
    setAttempt((n) => n + 1);
  }

  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-end gap-3">
        <TextField label="Search by name" className="min-w-64 flex-1" autoComplete="off" value={q} onChange={(e) => setQ(e.target.value)} hint="At least two letters." />
        <Button variant={scanning ? 'secondary' : 'primary'} aria-expanded={scanning} onClick={() => { setScanning((s) => !s); setProblem(null); }}>
          {scanning ? 'Close the scanner' : 'Scan the performer’s card'}
        </Button>
      </div>
      {problem ? <ErrorBanner title="That code did not open a performer" message={problem} /> : null}
      {scanning ? <QrScanner key={attempt} onResult={onScan} label="Scan the performer’s card" manualLabel="Or type the card’s address" /> : null}
      {results.data ? (
        results.data.items.length ? (
          <ul className="flex flex-col gap-2" aria-label="Performers found">
            {results.data.items.map((p) => {
              const name = p.preferredName ?? p.legalName;
              return (
                <li key={p.id}>
                  <Button variant="secondary" className="w-full justify-start" onClick={() => onPick({ id: p.id, name })}>
                    {name}
                    {p.preferredName ? <span className="font-normal text-ink-600">({p.legalName})</span> : null}
                  </Button>
                </li>
              );
            })}
          </ul>
        ) : (
          <p className="text-ink-700">No performer on this production matches “{q.trim()}”.</p>
        )
      ) : null}
    </div>
  );
}
