import { useEffect, useMemo, useState } from 'react';
import { useForm, useWatch, type Path } from 'react-hook-form';
import { coatingVolumes } from '#shared/domain/coating.ts';
import { DEMOLD_DEFAULT_NOTE } from '#shared/domain/cure.ts';
import { mixForRun } from '#shared/domain/mix.ts';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { productsQueryOptions } from '../../catalogue/index.ts';
import { BuildCautions } from '../components/build-cautions.tsx';
import { CoatingFields, CoatingResult, type CoatingFieldName } from '../components/coating-fields.tsx';
import { CoatingFormSchema, coatingFormValues, MixFormSchema, mixFormValues, readLive, type CoatingFormValues, type MixFormValues } from '../components/calc-values.ts';
import { CalculatorTabs, MaterialChoice, useChosenProduct } from '../components/material-choice.tsx';
import { MixFields, type MixFieldName } from '../components/mix-fields.tsx';
import { WeighOut } from '../components/weigh-out.tsx';

export async function mixCalculatorLoader() {
  await prefetchFor('builds.read', productsQueryOptions({ category: 'silicone', sort: 'name', dir: 'asc', page: 1, pageSize: 100 }));
  return null;
}

interface CalcValues {
  mix: MixFormValues;
  coating: CoatingFormValues;
}

/**
 * Grams of each part for an appliance run, in the order to add them, rounded to the scale, and the
 * coating's volumes: worked out as the inputs change, with the shared schemas' messages under the fields.
 */
export function MixCalculatorPage() {
  const [productId, setProductId] = useState('');
  const product = useChosenProduct(productId);
  const form = useForm<CalcValues>({ defaultValues: { mix: mixFormValues(), coating: coatingFormValues() } });
  const values = useWatch({ control: form.control }) as CalcValues;

  // A chosen material's recorded figures replace what was typed; the fields then show them read-only.
  useEffect(() => {
    if (!product) return;
    if (product.mixRatio) {
      form.setValue('mix.ratio.partA', String(product.mixRatio.partA));
      form.setValue('mix.ratio.partB', String(product.mixRatio.partB));
    }
    if (product.makerMaxSoftenerPercent !== null) form.setValue('mix.softener.makerMaxPercent', String(product.makerMaxSoftenerPercent));
  }, [product, form]);

  const mix = useMemo(() => readLive(MixFormSchema, values.mix), [values.mix]);
  const plan = useMemo(() => (mix.data ? mixForRun(mix.data) : null), [mix.data]);
  const coating = useMemo(() => readLive(CoatingFormSchema, values.coating), [values.coating]);
  const locked = { ratio: Boolean(product?.mixRatio), makerMax: product?.makerMaxSoftenerPercent != null };
  const mixError = (name: MixFieldName | 'ratio' | 'softener' | 'pigment' | 'target') => mix.errors[name]?.join(' ');

  return (
    <>
      <PageHeading title="Mix calculator" lead="Grams of each part for an appliance run, in the order to add them and rounded to your scale. The amounts change as you type.">
        Mix calculator
      </PageHeading>
      <CalculatorTabs />
      <BuildCautions sheets={product?.safetySheet ? [{ name: product.name, url: product.safetySheet.url }] : []} />
      <form noValidate aria-label="Mix calculator" onSubmit={(e) => e.preventDefault()} className="flex flex-col gap-6" data-testid="mix-calculator">
        <Section title="Material and batch">
          <MaterialChoice value={productId} onChange={setProductId} />
          {product && !product.mixRatio ? <p className="text-ink-700">The catalogue has no mix ratio for {product.name}: type it from the data sheet.</p> : null}
          <MixFields field={(name) => form.register(`mix.${name}` as Path<CalcValues>)} error={mixError} values={values.mix} locked={locked} />
        </Section>
        <Section title="Weigh-out">
          <WeighOut plan={plan} resolution={mix.data?.scaleResolutionG ?? 0.1} />
          <p className="text-sm text-ink-700">{DEMOLD_DEFAULT_NOTE}</p>
        </Section>
        <Section title="Encapsulation coating">
          <p className="text-ink-700">Cap material thinned with solvent, by volume: the parts of each and how much to mix.</p>
          <CoatingFields field={(name) => form.register(`coating.${name}` as Path<CalcValues>)} error={(name: CoatingFieldName) => coating.errors[name]?.join(' ')} />
          <CoatingResult volumes={coating.data ? coatingVolumes(coating.data, coating.data.targetMl) : null} />
        </Section>
      </form>
    </>
  );
}
