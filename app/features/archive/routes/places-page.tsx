import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { LOCATION_LEVEL_LABELS } from '#shared/domain/archive-locations.ts';
import type { Location } from '#shared/schemas/archive.ts';
import { buttonClasses } from '../../../components/ui/button.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { paths, serverPaths } from '../../../lib/paths.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { placesQueryOptions, useCreatePlace } from '../api.ts';
import { PlaceForm } from '../components/place-form.tsx';

export async function placesLoader() {
  await prefetchFor('archive.view', placesQueryOptions());
  return null;
}

/** The store as a tree: every place with its code path, environment and what it holds; labels for any chosen places. */
export function PlacesPage() {
  const places = useQuery(placesQueryOptions());
  const create = useCreatePlace();
  const [chosen, setChosen] = useState<Set<string>>(new Set());
  const toggle = (id: string) => setChosen((s) => (s.has(id) ? new Set([...s].filter((x) => x !== id)) : new Set([...s, id])));

  return (
    <>
      <PageHeading title="Storage places" lead="Sites, rooms, racks, shelves and bins, each with its short code and label. Casts sit on shelves and in bins.">
        Storage places
      </PageHeading>
      <QueryView query={places} loadingLabel="Loading the store…">
        {(data) => (
          <>
            <Section
              title="The store"
              actions={
                chosen.size > 0 ? (
                  <a href={serverPaths.labelSheet({ locations: [...chosen] })} target="_blank" rel="noopener" className={buttonClasses('secondary')} data-testid="print-place-labels">
                    Print labels for {chosen.size} {chosen.size === 1 ? 'place' : 'places'}
                  </a>
                ) : null
              }
            >
              {data.items.length === 0 ? (
                <EmptyState title="No places yet.">{data.canManage ? 'Start with the site, then its rooms.' : null}</EmptyState>
              ) : (
                <PlaceTable items={data.items} chosen={chosen} onToggle={toggle} />
              )}
            </Section>
            {data.canManage ? (
              <Section title="Add a place">
                <PlaceForm places={data.items} submitLabel="Add the place" pending={create.isPending} onSubmit={(v) => create.mutateAsync(v)} />
              </Section>
            ) : null}
          </>
        )}
      </QueryView>
    </>
  );
}

function PlaceTable({ items, chosen, onToggle }: { items: readonly Location[]; chosen: Set<string>; onToggle: (id: string) => void }) {
  return (
    <Table caption="Every place in the store, by code path" captionHidden testId="places-table">
      <Thead>
        <tr>
          <Th>
            <span className="sr-only">Print a label</span>
          </Th>
          <Th>Place</Th>
          <Th>Level</Th>
          <Th>Casts</Th>
          <Th>Environment</Th>
        </tr>
      </Thead>
      <tbody>
        {items.map((p) => {
          const depth = p.path.split('/').length - 1;
          return (
            <Tr key={p.id}>
              <Td className="w-14">
                <label className="inline-flex size-11 cursor-pointer items-center justify-center">
                  <input type="checkbox" className="size-6 accent-clay-700" checked={chosen.has(p.id)} onChange={() => onToggle(p.id)} aria-label={`Label for ${p.path}`} />
                </label>
              </Td>
              <Td>
                <span className="flex flex-col" style={{ paddingLeft: `${depth * 1.25}rem` }}>
                  <Link to={paths.place.href(p.id)} className="inline-flex min-h-11 items-center font-semibold">
                    {p.name}
                  </Link>
                  <span className="font-mono text-sm text-ink-700">{p.path}</span>
                </span>
              </Td>
              <Td>{LOCATION_LEVEL_LABELS[p.level]}</Td>
              <Td>{p.castsBelow === p.castsHere ? p.castsHere : `${p.castsHere} here, ${p.castsBelow} in all`}</Td>
              <Td className="max-w-64 text-sm">{p.environment ?? <span className="text-ink-600">No notes</span>}</Td>
            </Tr>
          );
        })}
      </tbody>
    </Table>
  );
}
