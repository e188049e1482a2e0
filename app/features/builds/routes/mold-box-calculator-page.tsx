import { useEffect, useMemo, useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { moldBox, SCULPT_SHAPES, SCULPT_SHAPE_FORMULAS } from '#shared/domain/mold-box.ts';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { BuildCautions } from '../components/build-cautions.tsx';
import { MoldBoxFormSchema, moldBoxFormValues, readLive, type MoldBoxFormValues } from '../components/calc-values.ts';
import { CalculatorTabs, MaterialChoice, useChosenProduct } from '../components/material-choice.tsx';
import { LOCKED } from '../components/mix-fields.tsx';

const decimal = { inputMode: 'decimal' as const, autoComplete: 'off' };
const one = (n: number, unit: string) => `${new Intl.NumberFormat('en-GB', { maximumFractionDigits: 1, minimumFractionDigits: 1 }).format(n)} ${unit}`;

/**
 * The box to build around a sculpt and the silicone to fill it, from the footprint, the highest point
 * and the sculpt's volume (measured, or estimated from a shape), with the rules of thumb editable.
 */
export function MoldBoxCalculatorPage() {
  const [productId, setProductId] = useState('');
  const product = useChosenProduct(productId);
  const form = useForm<MoldBoxFormValues>({ defaultValues: moldBoxFormValues() });
  const values = useWatch({ control: form.control }) as MoldBoxFormValues;

  useEffect(() => {
    if (!product) return;
    if (product.densityGPerCm3 !== null) form.setValue('densityGPerCm3', String(product.densityGPerCm3));
    if (product.mixRatio) {
      form.setValue('ratio.partA', String(product.mixRatio.partA));
      form.setValue('ratio.partB', String(product.mixRatio.partB));
    }
  }, [product, form]);

  const live = useMemo(() => readLive(MoldBoxFormSchema, values), [values]);
  const plan = live.data ? moldBox(live.data) : null;
  const error = (name: string) => live.errors[name]?.join(' ');
  const lockedRatio = Boolean(product?.mixRatio);
  const lockedDensity = product?.densityGPerCm3 != null;

  return (
    <>
      <PageHeading title="Mold box calculator" lead="The inner size and pour height of a mold box, and the silicone to fill it, split into its parts. The figures change as you type.">
        Mold box calculator
      </PageHeading>
      <CalculatorTabs />
      <BuildCautions sheets={product?.safetySheet ? [{ name: product.name, url: product.safetySheet.url }] : []} />
      <form noValidate aria-label="Mold box calculator" onSubmit={(e) => e.preventDefault()} className="flex flex-col gap-6" data-testid="mold-box-calculator">
        <Section title="The sculpt">
          <div className="grid gap-4 sm:grid-cols-3">
            <TextField label="Footprint length (mm)" {...decimal} hint="To the outer edge of the flashing." error={error('footprintLengthMm')} {...form.register('footprintLengthMm')} />
            <TextField label="Footprint width (mm)" {...decimal} error={error('footprintWidthMm')} {...form.register('footprintWidthMm')} />
            <TextField label="Highest point (mm)" {...decimal} hint="Above the board." error={error('highestPointMm')} {...form.register('highestPointMm')} />
          </div>
          <div className="grid gap-4 sm:grid-cols-2">
            <SelectField label="Sculpt volume" error={error('sculpt')} {...form.register('sculpt.kind')}>
              <option value="shape">Estimate it from a shape</option>
              <option value="measured">Measured (for example by water displacement)</option>
            </SelectField>
            {values.sculpt?.kind === 'measured' ? (
              <TextField label="Measured volume (cm³)" {...decimal} error={error('sculpt.volumeCm3')} {...form.register('sculpt.volumeCm3')} />
            ) : (
              <SelectField label="Shape" hint={SCULPT_SHAPE_FORMULAS[values.sculpt?.shape ?? 'half-ellipsoid'].formula} error={error('sculpt.shape')} {...form.register('sculpt.shape')}>
                {SCULPT_SHAPES.map((s) => (
                  <option key={s} value={s}>
                    {SCULPT_SHAPE_FORMULAS[s].label}
                  </option>
                ))}
              </SelectField>
            )}
          </div>
        </Section>
        <Section title="Rules of thumb and material">
          <p className="text-ink-700">Walls at least about 1 cm from the flashing edge and about 1 cm of silicone over the highest point, unless you set your own.</p>
          <div className="grid gap-4 sm:grid-cols-2">
            <TextField label="Wall clearance (mm)" {...decimal} error={error('wallClearanceMm')} {...form.register('wallClearanceMm')} />
            <TextField label="Cover over the highest point (mm)" {...decimal} error={error('coverMm')} {...form.register('coverMm')} />
          </div>
          <MaterialChoice value={productId} onChange={setProductId} />
          <div className="grid gap-4 sm:grid-cols-3">
            <TextField label="Density (g/cm³)" {...decimal} readOnly={lockedDensity} className={lockedDensity ? LOCKED : ''} hint={lockedDensity ? 'From the catalogue' : 'Of the mixed material, from its data sheet.'} error={error('densityGPerCm3')} {...form.register('densityGPerCm3')} />
            <TextField label="Part A (parts)" {...decimal} readOnly={lockedRatio} className={lockedRatio ? LOCKED : ''} hint={lockedRatio ? 'From the catalogue' : undefined} error={error('ratio.partA') ?? error('ratio')} {...form.register('ratio.partA')} />
            <TextField label="Part B (parts)" {...decimal} readOnly={lockedRatio} className={lockedRatio ? LOCKED : ''} hint={lockedRatio ? 'From the catalogue' : undefined} error={error('ratio.partB')} {...form.register('ratio.partB')} />
          </div>
        </Section>
        <Section title="The box and the pour">
          <div aria-live="polite" data-testid="mold-box-result">
            {plan ? (
              <dl className="grid gap-x-6 gap-y-2 sm:grid-cols-2">
                <dt className="font-semibold text-ink-800">Inner size of the box</dt>
                <dd className="tabular-nums">
                  {one(plan.innerLengthMm, 'mm')} × {one(plan.innerWidthMm, 'mm')}
                </dd>
                <dt className="font-semibold text-ink-800">Pour height (walls at least this tall)</dt>
                <dd className="tabular-nums">{one(plan.pourHeightMm, 'mm')}</dd>
                <dt className="font-semibold text-ink-800">Sculpt volume</dt>
                <dd className="tabular-nums">{one(plan.sculptVolumeCm3, 'cm³')}</dd>
                <dt className="font-semibold text-ink-800">Silicone to pour</dt>
                <dd className="tabular-nums">
                  {one(plan.siliconeVolumeCm3, 'ml')}, {one(plan.siliconeMassG, 'g')}
                </dd>
                <dt className="font-semibold text-ink-800">Part A</dt>
                <dd className="tabular-nums">{one(plan.partAG, 'g')}</dd>
                <dt className="font-semibold text-ink-800">Part B</dt>
                <dd className="tabular-nums">{one(plan.partBG, 'g')}</dd>
              </dl>
            ) : (
              <p className="text-ink-800" data-testid="mold-box-empty">
                Enter the sculpt’s measurements and the material’s figures to see the box and the pour.
              </p>
            )}
          </div>
        </Section>
      </form>
    </>
  );
}
