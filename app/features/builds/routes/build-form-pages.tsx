import { useQuery } from '@tanstack/react-query';
import { useMemo, useState } from 'react';
import { useNavigate, useParams, useSearchParams } from 'react-router-dom';
import { IdSchema } from '#shared/schemas/common.ts';
import type { BuildDetail } from '#shared/schemas/builds.ts';
import { NotFoundPage } from '../../../components/layout/not-found-page.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { VersionedEditNotice } from '../../../components/ui/versioned-edit-notice.tsx';
import { paths } from '../../../lib/paths.ts';
import { formatDate } from '../../../lib/format.ts';
import { seatProduction } from '../../../lib/session/seat-production.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { useVersionedEdit } from '../../../lib/use-versioned-edit.ts';
import { productsQueryOptions } from '../../catalogue/index.ts';
import { buildQueryOptions, moldOptionsQueryOptions, useCreateBuild, useUpdateBuild } from '../api.ts';
import { BuildForm } from '../components/build-form.tsx';
import { buildFormValues, createBuildFormSchema, updateBuildFormSchema } from '../components/build-values.ts';

const ALL_PRODUCTS = { sort: 'name', dir: 'asc', page: 1, pageSize: 100 } as const;

/** Records a run of pieces from a mold of a performer engaged on the acting production. */
export function NewBuildPage() {
  const session = useSession();
  const production = seatProduction(session);
  const navigate = useNavigate();
  const [search] = useSearchParams();
  const create = useCreateBuild();
  const molds = useQuery({ ...moldOptionsQueryOptions(production?.id ?? ''), enabled: Boolean(production) });
  const products = useQuery(productsQueryOptions(ALL_PRODUCTS));
  const schema = useMemo(() => createBuildFormSchema(production?.id ?? ''), [production?.id]);
  const wanted = IdSchema.safeParse(search.get('moldId'));
  return (
    <>
      <PageHeading title="Record a build" lead="A run of appliance pieces poured from a performer’s mold: what went into it, lot by lot, and how many pieces came out.">
        Record a build
      </PageHeading>
      {production ? (
        <QueryView query={molds} loadingLabel="Loading the molds…">
          {(m) => (
            <QueryView query={products} loadingLabel="Loading the catalogue…">
              {(p) => (
                <BuildForm
                  initial={buildFormValues(undefined, { moldId: wanted.success ? wanted.data : '', madeBy: session.user.displayName })}
                  schema={schema}
                  molds={m.items}
                  products={p.items}
                  submitLabel="Record the build"
                  pending={create.isPending}
                  onSubmit={async (input) => {
                    const b = await create.mutateAsync(input);
                    navigate(paths.build.href(b.id));
                  }}
                />
              )}
            </QueryView>
          )}
        </QueryView>
      ) : (
        <p className="text-ink-700">Switch “Acting as” to a production.</p>
      )}
    </>
  );
}

/** Corrects a build; its mold and production stay. */
export function EditBuildPage() {
  const id = IdSchema.safeParse(useParams().id);
  if (!id.success) return <NotFoundPage />;
  return <EditBuild id={id.data} />;
}

function EditBuild({ id }: { id: string }) {
  const build = useQuery(buildQueryOptions(id));
  return (
    <QueryView query={build} loadingLabel="Loading the build…">
      {(b) => <EditForm key={b.version} build={b} refetch={async () => (await build.refetch()).data!} />}
    </QueryView>
  );
}

function EditForm({ build: b, refetch }: { build: BuildDetail; refetch: () => Promise<BuildDetail> }) {
  const navigate = useNavigate();
  const update = useUpdateBuild(b.id);
  const products = useQuery(productsQueryOptions(ALL_PRODUCTS));
  const [current, setCurrent] = useState(b);
  const edit = useVersionedEdit({ refetch, onFresh: setCurrent });
  const schema = useMemo(() => updateBuildFormSchema(current.version), [current.version]);
  const listedLotIds = useMemo(() => new Set(current.materials.map((m) => m.lot.id)), [current]);
  const molds = [{ ...current.mold, performerId: current.performer.id, performerName: current.performer.name, madeOn: current.madeOn, status: 'in_store' as const }];
  return (
    <>
      <PageHeading title="Correct the build">Correct the build of {formatDate(current.madeOn)}</PageHeading>
      <QueryView query={products} loadingLabel="Loading the catalogue…">
        {(p) => (
          <BuildForm
            key={current.version}
            initial={buildFormValues(current)}
            schema={schema}
            molds={molds}
            products={p.items}
            editing={{ listedLotIds }}
            submitLabel="Save the corrections"
            pending={update.isPending}
            notice={<VersionedEditNotice edit={edit} />}
            onSubmit={async (input) => {
              const saved = await edit.save(() => update.mutateAsync(input));
              if (saved) navigate(paths.build.href(saved.id));
            }}
          />
        )}
      </QueryView>
    </>
  );
}
