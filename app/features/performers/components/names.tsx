import type { PerformerListItem } from '#shared/schemas/performers.ts';

type Named = Pick<PerformerListItem, 'legalName' | 'preferredName'>;

/** The name a performer goes by: the preferred one when they gave one. */
export function displayName(p: Named): string {
  return p.preferredName ?? p.legalName;
}

/** "Oz Parfitt (legal name Oswin Parfitt-Reyes)", or just the legal name. */
export function FullName({ performer: p }: { performer: Named }) {
  if (!p.preferredName || p.preferredName === p.legalName) return <>{p.legalName}</>;
  return (
    <>
      {p.preferredName} <span className="font-normal text-ink-700">(legal name {p.legalName})</span>
    </>
  );
}

/** The portrait thumbnail, or initials when there is none. Decorative: the name is always beside it. */
export function Thumbnail({ url, name, size = 'sm' }: { url: string | null; name: string; size?: 'sm' | 'lg' }) {
  const box = size === 'lg' ? 'size-32 text-4xl' : 'size-11 text-base';
  if (url) return <img src={url} alt="" width={size === 'lg' ? 128 : 44} height={size === 'lg' ? 128 : 44} className={`${box} shrink-0 rounded-lg object-cover`} loading="lazy" />;
  const initials = name
    .split(/\s+/)
    .filter(Boolean)
    .slice(0, 2)
    .map((w) => w[0]!.toUpperCase())
    .join('');
  return (
    <span aria-hidden="true" className={`${box} inline-flex shrink-0 items-center justify-center rounded-lg bg-sand-200 font-bold text-ink-700`}>
      {initials}
    </span>
  );
}
