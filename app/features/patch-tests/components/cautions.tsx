import { Caution } from '../../../components/consent/caution.tsx';
import { Icon } from '../../../components/ui/icons.tsx';

/** The label every department test carries: it screens, it does not diagnose. */
export function ScreeningLabel() {
  return (
    <p className="inline-flex items-center gap-2 rounded-lg bg-slate-100 px-3 py-2 font-semibold text-slate-800" data-testid="screening-label">
      <Icon name="info" className="size-5" />
      Screening, not diagnosis
    </p>
  );
}

/** The cautions where a test is booked, applied and read, in Plinth's words. */
export function PatchTestCautions({ solvents = false }: { solvents?: boolean }) {
  return (
    <div className="flex flex-col gap-3" data-testid="patch-test-cautions">
      <Caution kind="patch_testing" />
      <aside aria-label="Medical advice" className="rounded-xl border-l-4 border-amber-700 bg-amber-100 p-4 text-ink-900">
        <p>
          Follow a dermatologist’s or doctor’s advice over any result in Plinth. Follow local regulations on hazardous substances, health data and workplace safety, and the
          production’s licensed medical staff.
        </p>
      </aside>
      {solvents ? (
        <aside aria-label="Solvents and removers" className="rounded-xl border-l-4 border-amber-700 bg-amber-100 p-4 text-ink-900">
          <p className="font-bold text-amber-800">Solvents and removers</p>
          <p>Good ventilation, no open flames, eye protection, and the product’s safety data sheet.</p>
        </aside>
      ) : null}
    </div>
  );
}
