import { BUILD_CAUTIONS } from '#shared/domain/builds.ts';
import { Icon } from '../../../components/ui/icons.tsx';

/**
 * The cautions of the workshop, in Plinth's words, with a link to the safety data sheet of each
 * material chosen that has one on file: the sheet always comes before any figure worked out here.
 */
export function BuildCautions({ sheets = [] }: { sheets?: readonly { name: string; url: string }[] }) {
  const unique = [...new Map(sheets.map((s) => [s.url, s])).values()];
  return (
    <aside aria-label={BUILD_CAUTIONS.title} className="flex gap-3 rounded-xl border-l-4 border-amber-700 bg-amber-100 p-4 text-ink-900" data-testid="build-cautions">
      <Icon name="warning" className="mt-0.5 size-5 text-amber-800" />
      <div className="flex flex-col gap-2">
        <p className="font-bold text-amber-800">{BUILD_CAUTIONS.title}</p>
        <ul className="flex list-disc flex-col gap-1 pl-5">
          {BUILD_CAUTIONS.items.map((item) => (
            <li key={item}>{item}</li>
          ))}
        </ul>
        {unique.length ? (
          <p>
            Safety data sheets:{' '}
            {unique.map((s, i) => (
              <span key={s.url}>
                {i > 0 ? ', ' : null}
                <a href={s.url} className="inline-flex min-h-11 items-center font-semibold text-clay-900 underline" data-testid="sds-link">
                  {s.name}
                </a>
              </span>
            ))}
          </p>
        ) : null}
      </div>
    </aside>
  );
}
