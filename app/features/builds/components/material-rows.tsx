import { useQuery } from '@tanstack/react-query';
import { useFieldArray, useWatch, type UseFormReturn } from 'react-hook-form';
import { BUILD_MATERIAL_ROLES, BUILD_MATERIAL_ROLE_LABELS } from '#shared/domain/builds.ts';
import { LOT_STATE_LABELS } from '#shared/domain/catalogue.ts';
import type { ProductListItem } from '#shared/schemas/catalogue.ts';
import { Button } from '../../../components/ui/button.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { formatDate } from '../../../lib/format.ts';
import { productQueryOptions } from '../../catalogue/index.ts';
import type { BuildFormValues } from './build-values.ts';

/** The parts of the build form the rows use; what the form reads out on submit does not matter here. */
type MaterialsForm = Pick<UseFormReturn<BuildFormValues, unknown, unknown>, 'control' | 'register' | 'setValue' | 'getValues'>;

interface MaterialRowsProps {
  form: MaterialsForm;
  products: readonly ProductListItem[];
  error: (name: string) => string | undefined;
  /** Lots the build already lists: still offered once retired, as the API still accepts them. */
  listedLotIds: ReadonlySet<string>;
}

/** What went into the run, one row per material: what it is for, the catalogue product and the lot. */
export function MaterialRows({ form, products, error, listedLotIds }: MaterialRowsProps) {
  const { fields, append, remove } = useFieldArray({ control: form.control, name: 'materials' });
  return (
    <div className="flex flex-col gap-3" data-testid="material-rows">
      {error('materials') ? (
        <p className="flex items-start gap-1 text-sm font-semibold text-brick-700" role="alert">
          <span aria-hidden="true">!</span>
          {error('materials')}
        </p>
      ) : null}
      <ol className="flex flex-col gap-3">
        {fields.map((f, i) => (
          <li key={f.id} className="rounded-xl border border-sand-300 p-3" data-testid="material-row">
            <MaterialRow form={form} index={i} products={products} error={error} listedLotIds={listedLotIds} onRemove={() => remove(i)} />
          </li>
        ))}
      </ol>
      <div>
        <Button variant="secondary" onClick={() => append({ role: 'pigment', productId: '', lotId: '' })}>
          Add a material
        </Button>
      </div>
    </div>
  );
}

function MaterialRow({ form, index, products, error, listedLotIds, onRemove }: MaterialRowsProps & { index: number; onRemove: () => void }) {
  const [role, productId] = useWatch({ control: form.control, name: [`materials.${index}.role`, `materials.${index}.productId`] });
  const product = useQuery({ ...productQueryOptions(productId), enabled: productId !== '' });
  const lots = (product.data?.lots ?? []).filter((l) => l.state === 'in_date' || l.state === 'expiring' || listedLotIds.has(l.id));
  const n = index + 1;
  const productField = form.register(`materials.${index}.productId`, {
    onChange: (e: { target: { value: string } }) => {
      form.setValue(`materials.${index}.lotId`, '');
      // Part B is of part A's material: choosing part A's product chooses part B's too, where none is chosen yet.
      if (role !== 'part_a') return;
      form.getValues('materials').forEach((m, j) => {
        if (m.role === 'part_b' && m.productId === '') {
          form.setValue(`materials.${j}.productId`, e.target.value);
          form.setValue(`materials.${j}.lotId`, '');
        }
      });
    },
  });
  return (
    <div className="grid gap-3 sm:grid-cols-[minmax(0,10rem)_minmax(0,1fr)_minmax(0,12rem)_auto] sm:items-start">
      <SelectField label={`Material ${n}: used as`} error={error(`materials.${index}.role`)} {...form.register(`materials.${index}.role`)}>
        {BUILD_MATERIAL_ROLES.map((r) => (
          <option key={r} value={r}>
            {BUILD_MATERIAL_ROLE_LABELS[r]}
          </option>
        ))}
      </SelectField>
      <SelectField label={`Material ${n}: product`} error={error(`materials.${index}.productId`)} {...productField}>
        <option value="">Choose…</option>
        {products.map((p) => (
          <option key={p.id} value={p.id}>
            {p.name}
          </option>
        ))}
      </SelectField>
      <SelectField label={`Material ${n}: lot`} disabled={productId === ''} error={error(`materials.${index}.lotId`)} {...form.register(`materials.${index}.lotId`)}>
        <option value="">{productId === '' ? 'Choose the product first' : lots.length ? 'Choose…' : 'No lot in date'}</option>
        {lots.map((l) => (
          <option key={l.id} value={l.id}>
            {l.code} (until {formatDate(l.expiresOn)}){l.state === 'in_date' ? '' : `, ${LOT_STATE_LABELS[l.state].toLowerCase()}`}
          </option>
        ))}
      </SelectField>
      <div className="sm:pt-6">
        <Button variant="quiet" onClick={onRemove} aria-label={`Remove material ${n}`}>
          Remove
        </Button>
      </div>
    </div>
  );
}
