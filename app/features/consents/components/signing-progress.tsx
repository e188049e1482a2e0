import { ProgressBar } from '../../../components/ui/progress-bar.tsx';

export interface MissingItem {
  name: string;
  label: string;
  message: string;
}

/**
 * What still needs doing, at the top of the form after "Sign and submit", in the form's order.
 * Focus goes to the first item itself; each line here also leads to its place.
 */
export function MissingSummary({ items, onGo }: { items: readonly MissingItem[]; onGo: (name: string) => void }) {
  if (items.length === 0) return null;
  return (
    <div role="alert" className="flex flex-col gap-3 rounded-2xl border-2 border-brick-700 bg-brick-50 p-5" data-testid="missing-summary">
      <p className="text-xl font-bold text-brick-800">{items.length === 1 ? 'One thing needs your attention before you sign:' : `${items.length} things need your attention before you sign:`}</p>
      <ol className="flex flex-col gap-1">
        {items.map((item) => (
          <li key={item.name}>
            <button
              type="button"
              onClick={() => onGo(item.name)}
              className="inline-flex min-h-11 items-center rounded-lg px-1 text-left font-semibold text-brick-800 underline underline-offset-4"
            >
              {item.label}: {item.message}
            </button>
          </li>
        ))}
      </ol>
    </div>
  );
}

/** "3 of 7 answered": a sense of how far along a long questionnaire the performer is. */
export function AnswerProgress({ answered, total }: { answered: number; total: number }) {
  return (
    <div className="sticky top-0 z-10 -mx-2 rounded-xl bg-plaster-50/95 px-2 py-2" data-testid="answer-progress">
      <ProgressBar label={`${answered} of ${total} questions answered`} value={total ? answered / total : 1} />
    </div>
  );
}

/** "Part 2 of 3": each part's heading says where it stands in the whole form. */
export function partLabel(part: number, parts: number): string {
  return `Part ${part} of ${parts}`;
}
