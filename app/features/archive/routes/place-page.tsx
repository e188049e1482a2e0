import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, useNavigate, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { LOCATION_LEVEL_LABELS } from '#shared/domain/archive-locations.ts';
import type { LocationDetail } from '#shared/schemas/archive.ts';
import { IdSchema } from '#shared/schemas/common.ts';
import { NotFoundPage } from '../../../components/layout/not-found-page.tsx';
import { Button, buttonClasses } from '../../../components/ui/button.tsx';
import { ConfirmDialog } from '../../../components/ui/dialog.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { paths, serverPaths } from '../../../lib/paths.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { placeQueryOptions, placesQueryOptions, useDeletePlace, useUpdatePlace } from '../api.ts';
import { CastTable } from '../components/cast-table.tsx';
import { PlaceForm } from '../components/place-form.tsx';

export async function placeLoader({ params }: LoaderFunctionArgs) {
  const id = IdSchema.safeParse(params.id);
  if (id.success) await prefetchFor('archive.view', placeQueryOptions(id.data));
  return null;
}

export function PlacePage() {
  const id = IdSchema.safeParse(useParams().id);
  if (!id.success) return <NotFoundPage />;
  return <PlaceView id={id.data} />;
}

function PlaceView({ id }: { id: string }) {
  const place = useQuery(placeQueryOptions(id));
  return (
    <QueryView query={place} loadingLabel="Loading the place…">
      {(data) => <PlaceRecord key={data.id} place={data} />}
    </QueryView>
  );
}

/** One shelf, bin or room: what is on it (and below it), what belongs here but is out, and its label. */
function PlaceRecord({ place: p }: { place: LocationDetail }) {
  const navigate = useNavigate();
  const [editing, setEditing] = useState(false);
  const [confirmDelete, setConfirmDelete] = useState(false);
  const update = useUpdatePlace(p.id);
  const remove = useDeletePlace(p.id);
  const tree = useQuery({ ...placesQueryOptions(), enabled: editing });
  const casts = p.casts;
  return (
    <>
      <nav aria-label="Breadcrumb">
        <ol className="flex flex-wrap items-center gap-x-2">
          <li>
            <Link to={paths.places.href()} className="inline-flex min-h-11 items-center font-semibold">
              Storage places
            </Link>
          </li>
          {p.ancestors.map((a) => (
            <li key={a.id} className="flex items-center gap-2">
              <span aria-hidden="true">›</span>
              <Link to={paths.place.href(a.id)} className="inline-flex min-h-11 items-center">
                {a.name}
              </Link>
            </li>
          ))}
        </ol>
      </nav>
      <PageHeading
        title={`${p.name} (${p.path})`}
        testId="place-heading"
        lead={
          <>
            <span className="block">
              {LOCATION_LEVEL_LABELS[p.level]} · <span className="font-mono">{p.path}</span> · label <span className="font-mono">{p.labelCode}</span>
            </span>
            {p.environment ? <span className="block">Environment: {p.environment}</span> : null}
          </>
        }
        actions={
          <>
            <a href={serverPaths.labelSheet({ locations: [p.id] })} target="_blank" rel="noopener" className={buttonClasses('secondary')}>
              Print its label
            </a>
            {casts.length ? (
              <a href={serverPaths.labelSheet({ casts: casts.map((c) => c.id) })} target="_blank" rel="noopener" className={buttonClasses('secondary')}>
                Print labels for the casts here
              </a>
            ) : null}
            {p.canManage ? (
              <>
                <Button variant="secondary" onClick={() => setEditing((e) => !e)}>
                  {editing ? 'Close editing' : 'Edit'}
                </Button>
                <Button variant="danger" onClick={() => setConfirmDelete(true)}>
                  Remove
                </Button>
              </>
            ) : null}
          </>
        }
      >
        {p.name}
      </PageHeading>
      {editing && tree.data ? (
        <Section title="Edit this place">
          <PlaceForm
            places={tree.data.items}
            editing={p}
            initial={p}
            submitLabel="Save"
            pending={update.isPending}
            onCancel={() => setEditing(false)}
            onSubmit={async (v) => {
              await update.mutateAsync({ parentId: v.parentId, code: v.code, name: v.name, environment: v.environment, version: p.version });
              setEditing(false);
            }}
          />
        </Section>
      ) : null}
      <Section title={p.level === 'shelf' || p.level === 'bin' ? 'On it now' : 'Casts here and below'} testId="place-casts">
        {casts.length === 0 ? <EmptyState title="No cast here now." /> : <CastTable casts={casts} caption={`Casts at ${p.path}`} captionHidden />}
      </Section>
      {p.away.length ? (
        <Section title="Belongs here, out now" testId="place-away">
          <CastTable casts={p.away} caption={`Casts whose normal place is ${p.path}, elsewhere now`} captionHidden testId="away-table" />
        </Section>
      ) : null}
      {p.children.length ? (
        <Section title="Places inside">
          <ul className="flex flex-col divide-y divide-sand-200">
            {p.children.map((c) => (
              <li key={c.id} className="flex flex-wrap items-center justify-between gap-2 py-2">
                <Link to={paths.place.href(c.id)} className="inline-flex min-h-11 items-center font-semibold">
                  {c.name} <span className="ml-2 font-mono font-normal text-ink-700">{c.path}</span>
                </Link>
                <span className="text-ink-700">{c.castsBelow === 1 ? '1 cast' : `${c.castsBelow} casts`}</span>
              </li>
            ))}
          </ul>
        </Section>
      ) : null}
      <ConfirmDialog
        open={confirmDelete}
        title={`Remove ${p.name}?`}
        confirmLabel="Remove the place"
        pending={remove.isPending}
        error={remove.error}
        onCancel={() => {
          setConfirmDelete(false);
          remove.reset();
        }}
        onConfirm={() => remove.mutate(p.version, { onSuccess: () => navigate(paths.places.href(), { replace: true }) })}
      >
        <p>Only an empty place can be removed: nothing inside it, and no cast that calls it home.</p>
      </ConfirmDialog>
    </>
  );
}
