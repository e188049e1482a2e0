/** Plinth's mark: a stepped base, the thing a cast stands on. Decorative; the word carries the name. */
export function Wordmark({ size = 'md' }: { size?: 'md' | 'lg' }) {
  const big = size === 'lg';
  return (
    <span className={`inline-flex items-center gap-2 font-bold tracking-tight text-graphite-900 ${big ? 'text-4xl' : 'text-2xl'}`}>
      <svg aria-hidden="true" viewBox="0 0 32 32" className={big ? 'size-11' : 'size-8'}>
        <rect x="11" y="5" width="10" height="9" rx="2" className="fill-verdigris-600" />
        <rect x="7" y="15" width="18" height="6" rx="1.5" className="fill-verdigris-800" />
        <rect x="3" y="22" width="26" height="6" rx="1.5" className="fill-graphite-900" />
      </svg>
      Plinth
    </span>
  );
}
