import type { FieldErrors, Path, UseFormRegister } from 'react-hook-form';
import { z } from 'zod';
import { EXPOSURE_TYPES, EXPOSURE_TYPE_LABELS, PRODUCT_CATEGORIES, PRODUCT_CATEGORY_LABELS } from '#shared/domain/catalogue.ts';
import type { ProductDetail } from '#shared/schemas/catalogue.ts';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';

/** The product form as typed: numbers stay text until the shared schema reads them. */
export interface ProductFormValues {
  name: string;
  maker: string;
  category: string;
  exposure: string;
  densityGPerCm3: string;
  mixRatio: { partA: string; partB: string };
  makerMaxSoftenerPercent: string;
  inciLabel?: string;
  formulationNote?: string;
  version?: number;
}

export const PRODUCT_FIELD_NAMES: readonly Path<ProductFormValues>[] = [
  'name',
  'maker',
  'category',
  'exposure',
  'densityGPerCm3',
  'mixRatio',
  'mixRatio.partA',
  'mixRatio.partB',
  'makerMaxSoftenerPercent',
  'inciLabel',
  'formulationNote',
];

const numberOrNull = (v: unknown) => (typeof v === 'string' && v.trim() !== '' ? Number(v.replace(',', '.')) : v === '' ? null : v);

/** Typed values in the shape the API schemas read: blank numbers are null, a blank ratio is no ratio. */
export function productInput(v: unknown): unknown {
  if (!v || typeof v !== 'object') return v;
  const f = v as ProductFormValues;
  const ratioBlank = !f.mixRatio || (String(f.mixRatio.partA ?? '').trim() === '' && String(f.mixRatio.partB ?? '').trim() === '');
  return {
    ...f,
    maker: f.maker?.trim() ? f.maker : null,
    densityGPerCm3: numberOrNull(f.densityGPerCm3),
    makerMaxSoftenerPercent: numberOrNull(f.makerMaxSoftenerPercent),
    mixRatio: ratioBlank ? null : { partA: numberOrNull(f.mixRatio.partA), partB: numberOrNull(f.mixRatio.partB) },
  };
}

/** A shared product schema read from the typed form values, so the form and the API give the same messages. */
export function productFormSchema<S extends z.ZodType>(schema: S) {
  return z.custom<ProductFormValues>().transform(productInput).pipe(schema);
}

export function productFormValues(p?: ProductDetail): ProductFormValues {
  const text = (n: number | null | undefined) => (n === null || n === undefined ? '' : String(n));
  return {
    name: p?.name ?? '',
    maker: p?.maker ?? '',
    category: p?.category ?? '',
    exposure: p?.exposure ?? 'leave_on',
    densityGPerCm3: text(p?.densityGPerCm3),
    mixRatio: { partA: text(p?.mixRatio?.partA), partB: text(p?.mixRatio?.partB) },
    makerMaxSoftenerPercent: text(p?.makerMaxSoftenerPercent),
    ...(p ? { version: p.version } : {}),
  };
}

interface ProductFieldsProps {
  register: UseFormRegister<ProductFormValues>;
  errors: FieldErrors<ProductFormValues>;
  /** The category chosen now: the material figures are offered for silicones (and shown wherever they are set). */
  category: string;
  hasFigures: boolean;
}

export function ProductFields({ register, errors, category, hasFigures }: ProductFieldsProps) {
  return (
    <div className="flex flex-col gap-6">
      <div className="grid gap-4 md:grid-cols-2">
        <TextField label="Product name" autoComplete="off" error={errors.name?.message} {...register('name')} />
        <TextField label="Maker" autoComplete="off" hint="Optional." error={errors.maker?.message} {...register('maker')} />
        <SelectField label="Category" error={errors.category?.message} {...register('category')}>
          <option value="">Choose a category</option>
          {PRODUCT_CATEGORIES.map((c) => (
            <option key={c} value={c}>
              {PRODUCT_CATEGORY_LABELS[c]}
            </option>
          ))}
        </SelectField>
        <SelectField label="Stays on the skin?" hint="Leave-on stays on; rinse-off is washed or wiped away." error={errors.exposure?.message} {...register('exposure')}>
          {EXPOSURE_TYPES.map((e) => (
            <option key={e} value={e}>
              {EXPOSURE_TYPE_LABELS[e]}
            </option>
          ))}
        </SelectField>
      </div>
      {category === 'silicone' || hasFigures ? (
        <fieldset className="flex flex-col gap-4" data-testid="material-figures">
          <legend className="mb-2 text-lg font-bold text-ink-900">Material figures</legend>
          <p className="text-sm text-ink-700">Optional, from the maker’s data sheet; the appliance calculators use them.</p>
          <div className="grid gap-4 md:grid-cols-2">
            <TextField label="Density (g/cm³)" inputMode="decimal" autoComplete="off" error={errors.densityGPerCm3?.message} {...register('densityGPerCm3')} />
            <TextField label="Maker’s maximum softener (%)" inputMode="decimal" autoComplete="off" error={errors.makerMaxSoftenerPercent?.message} {...register('makerMaxSoftenerPercent')} />
            <TextField label="Mix ratio, part A (by weight)" inputMode="decimal" autoComplete="off" error={errors.mixRatio?.partA?.message ?? errors.mixRatio?.message} {...register('mixRatio.partA')} />
            <TextField label="Mix ratio, part B (by weight)" inputMode="decimal" autoComplete="off" error={errors.mixRatio?.partB?.message} {...register('mixRatio.partB')} />
          </div>
        </fieldset>
      ) : null}
    </div>
  );
}
