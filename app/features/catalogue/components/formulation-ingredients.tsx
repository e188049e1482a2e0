import type { Formulation } from '#shared/schemas/catalogue.ts';
import { GroupBadge, MarkedBadge } from './badges.tsx';

/** A formulation's ingredients in label order, each with its allergen group; names the vocabulary lacks are marked. */
export function FormulationIngredients({ formulation: f, testId }: { formulation: Formulation; testId?: string }) {
  if (f.ingredients === null) {
    return (
      <p className="flex items-center gap-2 text-ink-700" data-testid={testId}>
        <MarkedBadge icon="missing" tone="neutral">
          Ingredients not recorded
        </MarkedBadge>
        Until they are, this product cannot be cleared for anyone.
      </p>
    );
  }
  return (
    <ol className="flex flex-col divide-y divide-sand-200 rounded-xl border border-sand-300" data-testid={testId}>
      {f.ingredients.map((i) => (
        <li key={i.position} className="flex flex-wrap items-center justify-between gap-2 px-3 py-2" data-testid="ingredient-row">
          <span className="flex flex-wrap items-baseline gap-2">
            <span className="w-6 text-right text-sm text-ink-600" aria-hidden="true">
              {i.position + 1}.
            </span>
            <span className="font-semibold">{i.name}</span>
            {i.mayContain ? <span className="text-sm text-ink-700">(may contain)</span> : null}
            {i.ingredient && i.ingredient.inci !== i.name ? <span className="text-sm text-ink-700">= {i.ingredient.inci}</span> : null}
          </span>
          <span className="flex flex-wrap items-center gap-2">
            {i.ingredient ? (
              <>
                <GroupBadge group={i.ingredient.group} />
                {i.ingredient.trivial ? <span className="text-sm text-ink-700">Carrier</span> : null}
              </>
            ) : (
              <MarkedBadge icon="warning" tone="warning">
                Not in the vocabulary
              </MarkedBadge>
            )}
          </span>
        </li>
      ))}
    </ol>
  );
}
