/** A short "On this page" list of a long page's sections, each a finger-sized link to its anchor. */
export function PageIndex({ items, testId = 'page-index' }: { items: readonly { id: string; label: string }[]; testId?: string }) {
  return (
    <nav aria-label="On this page" data-testid={testId}>
      <ul className="flex flex-wrap gap-2">
        {items.map((item) => (
          <li key={item.id}>
            <a
              href={`#${item.id}`}
              className="inline-flex min-h-11 items-center rounded-full border border-plaster-300 bg-white px-4 font-semibold no-underline hover:border-verdigris-700 hover:bg-verdigris-50"
            >
              {item.label}
            </a>
          </li>
        ))}
      </ul>
    </nav>
  );
}

/** The target of a PageIndex link: a wrapper that leaves a little room above the section it holds. */
export function PageAnchor({ id, children }: { id: string; children: React.ReactNode }) {
  return (
    <div id={id} className="scroll-mt-4" tabIndex={-1}>
      {children}
    </div>
  );
}
