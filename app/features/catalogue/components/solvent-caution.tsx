import { SOLVENT_CAUTION } from '#shared/domain/catalogue.ts';
import { Icon } from '../../../components/ui/icons.tsx';

/** The caution shown beside removers and solvent-led products, and beside their safety data sheet. */
export function SolventCaution({ landmark = true }: { landmark?: boolean }) {
  const content = (
    <>
      <Icon name="warning" className="mt-0.5 size-5 text-amber-800" />
      <div className="flex flex-col gap-1">
        <p className="font-bold text-amber-800">{SOLVENT_CAUTION.title}</p>
        <p>{SOLVENT_CAUTION.text}</p>
      </div>
    </>
  );
  const classes = 'flex gap-3 rounded-xl border-l-4 border-amber-700 bg-amber-100 p-4 text-ink-900';
  // One page has one such landmark; a repeat beside the safety data sheet is plain text.
  return landmark ? (
    <aside aria-label={SOLVENT_CAUTION.title} className={classes} data-testid="solvent-caution">
      {content}
    </aside>
  ) : (
    <div className={classes} data-testid="solvent-caution">
      {content}
    </div>
  );
}
