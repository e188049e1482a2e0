import { useState } from 'react';
import { ICDRG_CODES, ICDRG_DESCRIPTIONS, ICDRG_LABELS, type IcdrgCode } from '#shared/domain/icdrg.ts';
import type { PatchTestDetail } from '#shared/schemas/patch-test-log.ts';
import { Button } from '../../../components/ui/button.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { useRecordReadings } from '../api.ts';

/** Now, as the date-and-time box writes it (local time, to the minute). */
export function localNow(): string {
  const d = new Date();
  d.setMinutes(d.getMinutes() - d.getTimezoneOffset());
  return d.toISOString().slice(0, 16);
}

/**
 * One reading point for every site at once (lead): a row per site with the seven ICDRG codes as large
 * buttons for a finger on a tablet, and a note. Sent together; nothing is saved unless all of it is.
 */
export function ReadingGrid({ test }: { test: PatchTestDetail }) {
  const open = test.schedule.filter((s) => s.status !== 'done');
  const [pointId, setPointId] = useState(open.find((s) => s.status === 'open' || s.status === 'overdue')?.pointId ?? open[0]?.pointId ?? '');
  const [readAt, setReadAt] = useState(localNow());
  const [codes, setCodes] = useState<Record<string, IcdrgCode | undefined>>({});
  const [notes, setNotes] = useState<Record<string, string>>({});
  const [problem, setProblem] = useState<string[] | null>(null);
  const record = useRecordReadings(test.id);
  if (open.length === 0) return <p className="text-ink-700">Every reading of this test is recorded.</p>;
  const sites = test.products.filter((p) => !p.readPointIds.includes(pointId));

  async function submit(e: React.FormEvent) {
    e.preventDefault();
    setProblem(null);
    const missing = sites.filter((s) => !codes[s.id]);
    if (missing.length > 0) return setProblem([`Choose a code for ${missing.map((s) => s.site).join(', ')}.`]);
    try {
      await record.mutateAsync({
        pointId,
        readAt: new Date(readAt).toISOString(),
        version: test.version,
        sites: sites.map((s) => ({ testProductId: s.id, code: codes[s.id]!, note: notes[s.id]?.trim() || undefined })),
      });
      setCodes({});
      setNotes({});
    } catch (err) {
      setProblem(isApiError(err) ? [...Object.values(err.fields).flat(), ...(Object.keys(err.fields).length ? [] : [err.message])] : ['The readings were not saved.']);
    }
  }

  return (
    <form onSubmit={(e) => void submit(e)} noValidate className="flex flex-col gap-4" aria-label="Reading grid" data-testid="reading-grid">
      <div className="grid gap-4 md:grid-cols-2">
        <SelectField label="Reading" value={pointId} onChange={(e) => setPointId(e.target.value)}>
          {open.map((s) => (
            <option key={s.pointId} value={s.pointId}>
              {s.label} ({s.dayLabel})
            </option>
          ))}
        </SelectField>
        <TextField label="Read at" type="datetime-local" value={readAt} onChange={(e) => setReadAt(e.target.value)} />
      </div>
      <ul className="flex flex-col gap-4">
        {sites.map((s) => (
          <li key={s.id} className="flex flex-col gap-2 rounded-xl border border-sand-300 p-3">
            <fieldset className="flex flex-col gap-2">
              <legend className="font-semibold">
                {s.site}: {s.productName} <span className="font-normal text-ink-700">(lot {s.lotCode})</span>
              </legend>
              <div className="grid grid-cols-4 gap-2 sm:grid-cols-7">
                {ICDRG_CODES.map((code) => (
                  <label
                    key={code}
                    title={ICDRG_DESCRIPTIONS[code]}
                    className="flex min-h-14 min-w-14 cursor-pointer flex-col items-center justify-center rounded-lg border-2 border-graphite-500 bg-white px-2 text-lg font-bold text-ink-900 not-has-checked:hover:bg-sand-100 has-checked:border-clay-800 has-checked:bg-clay-800 has-checked:text-white has-focus-visible:outline-3 has-focus-visible:outline-offset-2 has-focus-visible:outline-clay-700"
                  >
                    <input type="radio" name={`code-${s.id}`} value={code} checked={codes[s.id] === code} onChange={() => setCodes((c) => ({ ...c, [s.id]: code }))} className="sr-only" />
                    {code}
                    <span className="text-xs font-normal">{ICDRG_LABELS[code]}</span>
                  </label>
                ))}
              </div>
            </fieldset>
            <TextField label={`Note for ${s.site} (optional)`} value={notes[s.id] ?? ''} onChange={(e) => setNotes((n) => ({ ...n, [s.id]: e.target.value }))} maxLength={2000} />
          </li>
        ))}
      </ul>
      <FormError messages={problem} />
      <div>
        <Button type="submit" pending={record.isPending} pendingLabel="Saving…" disabled={sites.length === 0}>
          Save this reading
        </Button>
      </div>
    </form>
  );
}
