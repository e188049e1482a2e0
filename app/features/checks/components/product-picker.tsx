import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { CheckboxField } from '../../../components/ui/checkbox-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { productChoicesQueryOptions } from '../api.ts';

/** Choose catalogue products one by one, with a filter box; the chosen stay listed first. */
export function ProductPicker({ chosen, onChange, label = 'Products' }: { chosen: readonly string[]; onChange: (ids: string[]) => void; label?: string }) {
  const products = useQuery(productChoicesQueryOptions());
  const [filter, setFilter] = useState('');
  const items = products.data?.items ?? [];
  const f = filter.trim().toLowerCase();
  const shown = items.filter((p) => chosen.includes(p.id) || !f || p.name.toLowerCase().includes(f));
  return (
    <fieldset className="flex flex-col gap-2">
      <legend className="text-base font-semibold text-ink-900">{label}</legend>
      <TextField label="Filter products" autoComplete="off" value={filter} onChange={(e) => setFilter(e.target.value)} />
      {products.isPending ? <p className="text-ink-700">Loading the catalogue…</p> : null}
      <div className="grid max-h-96 gap-1 overflow-y-auto md:grid-cols-2">
        {shown.map((p) => (
          <CheckboxField
            key={p.id}
            label={p.name}
            checked={chosen.includes(p.id)}
            onChange={(e) => onChange(e.target.checked ? [...chosen, p.id] : chosen.filter((id) => id !== p.id))}
          />
        ))}
      </div>
    </fieldset>
  );
}
