import type { ConsentKind } from '#shared/domain/consent.ts';
import { Icon } from '../ui/icons.tsx';

/** Plinth's safety cautions, in its own words, for the kinds of work that carry one. */
export const CAUTIONS: Partial<Record<ConsentKind, { title: string; text: string }>> = {
  life_casting: {
    title: 'Life casting safety',
    text: 'Never cover the nostrils or airway. Agree a stop signal before starting. A second person stays throughout. Protect hair with a release agent. Setting gypsum plaster heats up: never enclose fingers, hands or limbs in it.',
  },
  patch_testing: {
    title: 'Patch testing',
    text: 'Patch testing screens for reactions; it is not a medical diagnosis. Remove the test at any burning, itching or swelling; get medical help at once for a severe or spreading reaction or any difficulty breathing.',
  },
  application: {
    title: 'Removers and solvents',
    text: 'Removers and solvents are used with good ventilation, away from flames, with your eyes protected.',
  },
};

/** The caution for a kind of work, shown at the step it concerns; nothing for kinds without one. */
export function Caution({ kind, large = false }: { kind: ConsentKind; large?: boolean }) {
  const caution = CAUTIONS[kind];
  if (!caution) return null;
  return (
    <aside
      aria-label={caution.title}
      className={`flex gap-3 rounded-xl border-l-4 border-amber-700 bg-amber-100 p-4 text-graphite-900 ${large ? 'text-lg' : ''}`}
      data-testid="caution"
    >
      <Icon name="warning" className={`${large ? 'size-7' : 'size-5'} mt-0.5 text-amber-800`} />
      <div className="flex flex-col gap-1">
        <p className="font-bold text-amber-800">{caution.title}</p>
        <p>{caution.text}</p>
      </div>
    </aside>
  );
}
