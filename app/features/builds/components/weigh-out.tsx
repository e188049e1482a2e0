import { MIX_INGREDIENT_LABELS, type MixPlan } from '#shared/domain/mix.ts';
import { Icon } from '../../../components/ui/icons.tsx';

/** Decimal places a scale of this resolution shows (0.1 → 1, 0.05 → 2, 1 → 0). */
function decimalsOf(resolution: number): number {
  const [, fraction = ''] = String(resolution).split('.');
  return Math.min(fraction.length, 6);
}

/** A mass as the scale shows it. */
export function gramsText(grams: number, resolution: number): string {
  const d = decimalsOf(resolution);
  return `${new Intl.NumberFormat('en-GB', { minimumFractionDigits: d, maximumFractionDigits: d }).format(grams)} g`;
}

interface WeighOutProps {
  plan: MixPlan | null;
  resolution: number;
  /** What the scale actually showed, beside what was worked out (a build's record). */
  weighed?: Partial<Record<keyof typeof MIX_INGREDIENT_LABELS, number | null>>;
  /** Said instead of the amounts while the inputs do not add up. */
  emptyText?: string;
}

/**
 * The grams to weigh, in the order to add them. It sits in a polite live region, so the new amounts
 * are read out as the inputs change.
 */
export function WeighOut({ plan, resolution, weighed, emptyText = 'Fix the fields marked above to see the amounts.' }: WeighOutProps) {
  return (
    <div aria-live="polite" className="flex flex-col gap-3" data-testid="weigh-out">
      {plan ? (
        <>
          <ol aria-label="Weigh in this order" className="flex flex-col divide-y divide-sand-200 rounded-xl border border-sand-300 bg-white">
            {plan.steps.map((s, i) => (
              <li key={s.ingredient} className="flex flex-wrap items-baseline justify-between gap-2 px-4 py-3" data-testid="weigh-step">
                <span className="font-semibold text-ink-900">
                  {i + 1}. {MIX_INGREDIENT_LABELS[s.ingredient]}
                </span>{' '}
                <span className="text-xl font-bold tabular-nums text-ink-900">
                  {gramsText(s.grams, resolution)}
                  {s.drops !== null ? <span className="ml-2 text-base font-semibold text-ink-700"> ({s.drops} drops)</span> : null}
                </span>
                {weighed && weighed[s.ingredient] != null ? (
                  <span className="w-full text-sm text-ink-700">Weighed: {gramsText(weighed[s.ingredient]!, resolution)}</span>
                ) : null}
              </li>
            ))}
          </ol>
          <p className="text-ink-800">
            In all <strong className="tabular-nums">{gramsText(plan.totalG, resolution)}</strong>. Part B follows part A as weighed
            {Math.abs(plan.partBDriftPercent) >= 0.05 ? ` (${plan.partBDriftPercent > 0 ? '+' : ''}${plan.partBDriftPercent.toFixed(1)} % against the ratio, from rounding to the scale)` : ''}.
          </p>
          {plan.belowResolution.length ? (
            <p className="flex gap-2 font-semibold text-amber-800">
              <Icon name="warning" className="mt-1 size-4" />
              {plan.belowResolution.map((i) => MIX_INGREDIENT_LABELS[i]).join(' and ')} {plan.belowResolution.length === 1 ? 'comes' : 'come'} to 0 g on this scale: use a finer scale or a bigger batch.
            </p>
          ) : null}
        </>
      ) : (
        <p className="flex gap-2 text-ink-800" data-testid="weigh-out-empty">
          <Icon name="info" className="mt-1 size-4" />
          {emptyText}
        </p>
      )}
    </div>
  );
}
