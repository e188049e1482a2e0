import { Icon } from '../../../components/ui/icons.tsx';

/** The cautions beside every check and application, in Plinth's words. */
export function ApplicationCautions() {
  return (
    <aside aria-label="Before you apply" className="flex gap-3 rounded-xl border-l-4 border-amber-700 bg-amber-100 p-4 text-ink-900" data-testid="caution">
      <Icon name="warning" className="mt-0.5 size-5 text-amber-800" />
      <div className="flex flex-col gap-1">
        <p className="font-bold">Before you apply</p>
        <p>
          Patch testing screens for reactions; it is not a medical diagnosis. Stop and remove a product at any burning, itching or swelling. A severe or spreading reaction, or any breathing
          difficulty, needs medical help at once.
        </p>
        <p>Use removers and solvents with good ventilation, away from flames, with eyes protected, and keep each product’s safety data sheet to hand.</p>
        <p>Follow local regulations and the production’s licensed medical staff over anything Plinth shows.</p>
      </div>
    </aside>
  );
}
