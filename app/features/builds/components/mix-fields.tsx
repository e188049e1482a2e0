import type { UseFormRegisterReturn } from 'react-hook-form';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import type { MixFormValues } from './calc-values.ts';

/** The names of the mix's fields, as dotted paths inside MixFormValues. */
export type MixFieldName =
  | 'ratio.partA'
  | 'ratio.partB'
  | 'softener.percent'
  | 'softener.makerMaxPercent'
  | 'pigment.kind'
  | 'pigment.percent'
  | 'pigment.drops'
  | 'pigment.dropMassG'
  | 'target.kind'
  | 'target.totalG'
  | 'target.partAG'
  | 'scaleResolutionG';

interface MixFieldsProps {
  field: (name: MixFieldName) => UseFormRegisterReturn;
  /** The message under a field, by its name. */
  error: (name: MixFieldName | 'ratio' | 'softener' | 'pigment' | 'target') => string | undefined;
  values: MixFormValues;
  /** Figures the chosen catalogue product gives, which are shown but not typed over. */
  locked: { ratio: boolean; makerMax: boolean };
}

const decimal = { inputMode: 'decimal' as const, autoComplete: 'off' };
/** A figure taken from the catalogue looks fixed as well as saying so. */
export const LOCKED = '[&_input]:bg-sand-100';

/** The ratio, softener, pigment, batch size and scale of an appliance run. */
export function MixFields({ field, error, values, locked }: MixFieldsProps) {
  const fromCatalogue = 'From the catalogue';
  return (
    <div className="flex flex-col gap-6">
      <fieldset className="flex flex-col gap-3">
        <legend className="mb-1 text-lg font-bold text-ink-900">Mix ratio, by weight</legend>
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField label="Part A (parts)" {...decimal} readOnly={locked.ratio} className={locked.ratio ? LOCKED : ''} hint={locked.ratio ? fromCatalogue : undefined} error={error('ratio.partA') ?? error('ratio')} {...field('ratio.partA')} />
          <TextField label="Part B (parts)" {...decimal} readOnly={locked.ratio} className={locked.ratio ? LOCKED : ''} hint={locked.ratio ? fromCatalogue : undefined} error={error('ratio.partB')} {...field('ratio.partB')} />
        </div>
      </fieldset>
      <fieldset className="flex flex-col gap-3">
        <legend className="mb-1 text-lg font-bold text-ink-900">Softener</legend>
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField label="Softener (% of A + B)" {...decimal} hint="Leave empty for none." error={error('softener.percent') ?? error('softener')} {...field('softener.percent')} />
          <TextField
            label="Maker’s maximum softener (%)"
            {...decimal}
            readOnly={locked.makerMax}
            className={locked.makerMax ? LOCKED : ''}
            hint={locked.makerMax ? fromCatalogue : 'From the material’s data sheet.'}
            error={error('softener.makerMaxPercent')}
            {...field('softener.makerMaxPercent')}
          />
        </div>
      </fieldset>
      <fieldset className="flex flex-col gap-3">
        <legend className="mb-1 text-lg font-bold text-ink-900">Pigment</legend>
        <div className="grid gap-4 sm:grid-cols-2">
          <SelectField label="Pigment dosed" error={error('pigment.kind') ?? error('pigment')} {...field('pigment.kind')}>
            <option value="none">No pigment</option>
            <option value="percent">As a percentage of A + B</option>
            <option value="drops">In drops</option>
          </SelectField>
          {values.pigment.kind === 'percent' ? <TextField label="Pigment (% of A + B)" {...decimal} error={error('pigment.percent')} {...field('pigment.percent')} /> : null}
          {values.pigment.kind === 'drops' ? (
            <>
              <TextField label="Drops of pigment" inputMode="numeric" autoComplete="off" error={error('pigment.drops')} {...field('pigment.drops')} />
              <TextField label="Mass of one drop (g)" {...decimal} hint="About 0.03 g; weigh ten drops to know yours." error={error('pigment.dropMassG')} {...field('pigment.dropMassG')} />
            </>
          ) : null}
        </div>
      </fieldset>
      <fieldset className="flex flex-col gap-3">
        <legend className="mb-1 text-lg font-bold text-ink-900">Batch size</legend>
        <div className="grid gap-4 sm:grid-cols-2">
          <SelectField label="Size the batch by" error={error('target.kind') ?? error('target')} {...field('target.kind')}>
            <option value="total">Everything in the cup</option>
            <option value="partA">The part A weighed</option>
          </SelectField>
          {values.target.kind === 'total' ? (
            <TextField label="Total mass (g)" {...decimal} error={error('target.totalG')} {...field('target.totalG')} />
          ) : (
            <TextField label="Part A mass (g)" {...decimal} error={error('target.partAG')} {...field('target.partAG')} />
          )}
          <TextField label="Scale resolution (g)" {...decimal} hint="The smallest step the scale shows." error={error('scaleResolutionG')} {...field('scaleResolutionG')} />
        </div>
      </fieldset>
    </div>
  );
}
