import { useQuery } from '@tanstack/react-query';
import { NavLink } from 'react-router-dom';
import type { ProductDetail } from '#shared/schemas/catalogue.ts';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { paths } from '../../../lib/paths.ts';
import { productQueryOptions, productsQueryOptions } from '../../catalogue/index.ts';

/** The silicones of the catalogue, by name: the materials the calculators take figures from. */
export function useSilicones() {
  return useQuery(productsQueryOptions({ category: 'silicone', sort: 'name', dir: 'asc', page: 1, pageSize: 100 }));
}

/** The catalogue record of the material chosen: null for none chosen, undefined while it loads. */
export function useChosenProduct(productId: string): ProductDetail | null | undefined {
  const product = useQuery({ ...productQueryOptions(productId), enabled: productId !== '' });
  return productId === '' ? null : product.data;
}

/** Chooses a catalogue silicone, or none: the figures are then typed in. */
export function MaterialChoice({ value, onChange }: { value: string; onChange: (id: string) => void }) {
  const silicones = useSilicones();
  return (
    <SelectField
      label="Material"
      hint="The ratio, maximum softener and density come from its catalogue record; type them in when it has none."
      value={value}
      onChange={(e) => onChange(e.target.value)}
      data-testid="material-choice"
    >
      <option value="">Not in the catalogue: type the figures in</option>
      {(silicones.data?.items ?? []).map((p) => (
        <option key={p.id} value={p.id}>
          {p.name}
        </option>
      ))}
    </SelectField>
  );
}

/** Moves between the two calculators. */
export function CalculatorTabs() {
  const link = ({ isActive }: { isActive: boolean }) =>
    `flex min-h-11 items-center rounded-lg px-4 font-semibold no-underline ${isActive ? 'bg-clay-100 text-clay-900' : 'text-ink-700 hover:bg-sand-100'}`;
  return (
    <nav aria-label="Calculators">
      <ul className="flex flex-wrap gap-2">
        <li>
          <NavLink to={paths.mixCalculator.href()} className={link}>
            Mix for a run
          </NavLink>
        </li>
        <li>
          <NavLink to={paths.moldBoxCalculator.href()} className={link}>
            Mold box
          </NavLink>
        </li>
      </ul>
    </nav>
  );
}
