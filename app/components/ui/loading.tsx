/** "Loading…" for a region whose data is on its way; <output> announces it politely. */
export function Loading({ label = 'Loading…', rows = 3 }: { label?: string; rows?: number }) {
  return (
    <div aria-busy="true" className="flex flex-col gap-3" data-testid="loading">
      <output className="block text-graphite-700">{label}</output>
      {Array.from({ length: rows }, (_, i) => (
        <div key={i} aria-hidden="true" className="h-11 animate-pulse rounded-lg bg-plaster-200" />
      ))}
    </div>
  );
}
