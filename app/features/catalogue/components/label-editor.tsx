import { useState } from 'react';
import { createPortal } from 'react-dom';
import type { UseFormRegisterReturn } from 'react-hook-form';
import type { LabelMatch } from '#shared/schemas/catalogue.ts';
import { Button } from '../../../components/ui/button.tsx';
import { Dialog } from '../../../components/ui/dialog.tsx';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { TextareaField } from '../../../components/ui/textarea-field.tsx';
import { useCreateIngredient, useMatchLabel } from '../api.ts';
import { GroupBadge, MarkedBadge } from './badges.tsx';
import { IngredientForm, ingredientFormValues } from './ingredient-form.tsx';

interface LabelEditorProps {
  field: UseFormRegisterReturn;
  /** The text in the box now. */
  value: string;
  error?: string;
  label?: string;
  /** May this person add names to the vocabulary? */
  canAddIngredients: boolean;
}

/**
 * The ingredient list pasted as printed ("Ingredients: Aqua, …"), matched name by name to the vocabulary.
 * Names the vocabulary lacks are marked and can be added on the spot; they are kept either way.
 */
export function LabelEditor({ field, value, error, label = 'Ingredients, as printed on the label', canAddIngredients }: LabelEditorProps) {
  const match = useMatchLabel();
  const create = useCreateIngredient();
  const [adding, setAdding] = useState<string | null>(null);
  const [matchedText, setMatchedText] = useState<string | null>(null);
  const entries = match.data?.entries ?? null;
  const stale = entries !== null && matchedText !== value.trim();
  const unknown = entries?.filter((e) => !e.ingredient && !e.duplicate).length ?? 0;

  function check(text = value) {
    const trimmed = text.trim();
    if (!trimmed) return;
    setMatchedText(trimmed);
    match.mutate(trimmed);
  }

  return (
    <div className="flex flex-col gap-3">
      <TextareaField
        label={label}
        rows={5}
        hint="Paste the whole list, starting with “Ingredients:”. Leave it empty if it is not known yet."
        error={error}
        {...field}
        onBlur={(e) => {
          void field.onBlur(e);
          if (e.target.value.trim() && e.target.value.trim() !== matchedText) check(e.target.value);
        }}
      />
      <div>
        <Button variant="secondary" onClick={() => check()} pending={match.isPending} pendingLabel="Matching…" disabled={!value.trim()}>
          Match to the vocabulary
        </Button>
      </div>
      {match.error ? <ErrorBanner error={match.error} /> : null}
      {entries && !stale ? (
        <div className="flex flex-col gap-2" data-testid="label-matches">
          <p className="text-sm text-ink-700" aria-live="polite">
            {entries.length} {entries.length === 1 ? 'name' : 'names'} in label order
            {unknown ? `; ${unknown} not in the vocabulary (kept as written, and never counted as a carrier)` : '; all in the vocabulary'}.
          </p>
          <ol className="flex flex-col divide-y divide-sand-200 rounded-xl border border-sand-300">
            {entries.map((e, i) => (
              <MatchRow key={`${i}-${e.name}`} entry={e} canAdd={canAddIngredients} onAdd={() => setAdding(e.name)} />
            ))}
          </ol>
        </div>
      ) : null}
      {/* Outside the product form in the page, so the vocabulary form is never a form inside a form. */}
      {createPortal(
      <Dialog open={adding !== null} onClose={() => setAdding(null)} title="Add to the vocabulary" testId="add-ingredient-dialog">
        {adding !== null ? (
          <IngredientForm
            defaults={ingredientFormValues({ inci: adding })}
            submitLabel="Add ingredient"
            onCancel={() => setAdding(null)}
            onSubmit={async (input) => {
              await create.mutateAsync(input);
              setAdding(null);
              check();
            }}
          />
        ) : null}
      </Dialog>,
        document.body,
      )}
    </div>
  );
}

function MatchRow({ entry: e, canAdd, onAdd }: { entry: LabelMatch; canAdd: boolean; onAdd: () => void }) {
  return (
    <li className={`flex flex-wrap items-center justify-between gap-2 px-3 py-2 ${e.ingredient ? '' : 'bg-amber-100'}`} data-testid="label-match">
      <span className="flex flex-wrap items-center gap-2">
        <span className="font-semibold">{e.name}</span>
        {e.mayContain ? <span className="text-sm text-ink-700">(may contain)</span> : null}
        {e.ingredient && e.ingredient.inci !== e.name ? <span className="text-sm text-ink-700">= {e.ingredient.inci}</span> : null}
      </span>
      <span className="flex flex-wrap items-center gap-2">
        {e.duplicate ? (
          <span className="text-sm text-ink-700">Listed earlier; kept once</span>
        ) : e.ingredient ? (
          <>
            <GroupBadge group={e.ingredient.group} />
            {e.ingredient.trivial ? <span className="text-sm text-ink-700">Carrier</span> : null}
          </>
        ) : (
          <>
            <MarkedBadge icon="warning" tone="warning" testId="unknown-ingredient">
              Not in the vocabulary
            </MarkedBadge>
            {canAdd ? (
              <Button variant="quiet" onClick={onAdd} aria-label={`Add ${e.name} to the vocabulary`}>
                Add
              </Button>
            ) : null}
          </>
        )}
      </span>
    </li>
  );
}
