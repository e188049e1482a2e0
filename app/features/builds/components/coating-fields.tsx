import type { UseFormRegisterReturn } from 'react-hook-form';
import type { CoatingVolumes } from '#shared/domain/coating.ts';
import { TextField } from '../../../components/ui/text-field.tsx';

export type CoatingFieldName = 'capParts' | 'solventParts' | 'targetMl';

const ml = (n: number) => `${new Intl.NumberFormat('en-GB', { minimumFractionDigits: 1, maximumFractionDigits: 1 }).format(n)} ml`;

/** Parts of cap material to parts of solvent, and how much to mix. */
export function CoatingFields({ field, error }: { field: (name: CoatingFieldName) => UseFormRegisterReturn; error: (name: CoatingFieldName) => string | undefined }) {
  const decimal = { inputMode: 'decimal' as const, autoComplete: 'off' };
  return (
    <div className="grid gap-4 sm:grid-cols-3">
      <TextField label="Cap material (parts)" {...decimal} error={error('capParts')} {...field('capParts')} />
      <TextField label="Solvent (parts)" {...decimal} error={error('solventParts')} {...field('solventParts')} />
      <TextField label="Coating to mix (ml)" {...decimal} error={error('targetMl')} {...field('targetMl')} />
    </div>
  );
}

/** The volumes to measure, updated as the parts change. */
export function CoatingResult({ volumes }: { volumes: CoatingVolumes | null }) {
  return (
    <div aria-live="polite" data-testid="coating-result">
      {volumes ? (
        <ul aria-label="Coating volumes" className="flex flex-wrap gap-x-8 gap-y-2 text-lg">
          <li>
            Cap material: <strong className="tabular-nums">{ml(volumes.capMl)}</strong>
          </li>
          <li>
            Solvent: <strong className="tabular-nums">{ml(volumes.solventMl)}</strong>
          </li>
          <li>
            In all: <strong className="tabular-nums">{ml(volumes.totalMl)}</strong>
          </li>
        </ul>
      ) : (
        <p className="text-ink-800">Fix the coating fields to see the volumes.</p>
      )}
    </div>
  );
}
