import { useQuery } from '@tanstack/react-query';
import { useNavigate, useParams, useSearchParams } from 'react-router-dom';
import { IdSchema } from '#shared/schemas/common.ts';
import { NotFoundPage } from '../../../components/layout/not-found-page.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { paths } from '../../../lib/paths.ts';
import { Caution } from '../../../components/consent/caution.tsx';
import { performersQueryOptions } from '../../performers/index.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { castQueryOptions, useCreateCast, useUpdateCast } from '../api.ts';
import { CastForm } from '../components/cast-form.tsx';
import { castTitle } from '../components/cast-status.tsx';

function today(): string {
  const d = new Date();
  return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}-${String(d.getDate()).padStart(2, '0')}`;
}

/** Records a new cast: its performer (from the performers of this production), where it goes, and what it is. */
export function NewCastPage() {
  const session = useSession();
  const navigate = useNavigate();
  const [search] = useSearchParams();
  const create = useCreateCast();
  const productionId = session.current?.productionId ?? undefined;
  const performers = useQuery(performersQueryOptions({ productionId, consent: 'any', sort: 'name', dir: 'asc', page: 1, pageSize: 100 }));
  const seatProductions: [string, string][] = session.seats.filter((s) => s.role === 'archivist' && s.productionId).map((s) => [s.productionId!, s.productionName ?? 'Untitled production']);
  const wanted = IdSchema.safeParse(search.get('performerId'));
  return (
    <>
      <PageHeading title="Record a cast" lead="A new mold, positive or core goes onto a shelf or into a bin, which becomes its normal place. It gets a label code of its own.">
        Record a cast
      </PageHeading>
      <Caution kind="life_casting" />
      <Section title="The cast">
        <QueryView query={performers} loadingLabel="Loading performers…">
          {(data) => {
            // The archivist's productions, and any other one a listed performer is engaged on.
            const productions = new Map([...seatProductions, ...data.items.flatMap((p) => p.engagements.map((e): [string, string] => [e.productionId, e.productionName]))]);
            return (
              <CastForm
                initial={{ performerId: wanted.success ? wanted.data : '', productionId: productionId ?? '', region: 'face', kind: 'mold', material: '', madeOn: today(), madeBy: '', pouredFromId: '', locationId: '', notes: '' }}
                performers={data.items.map((p) => ({ id: p.id, name: p.preferredName ?? p.legalName }))}
                productions={[...productions].map(([id, name]) => ({ id, name }))}
                submitLabel="Record the cast"
                pending={create.isPending}
                onSubmit={async (v) => {
                  const cast = await create.mutateAsync({ ...v, pouredFromId: v.pouredFromId || null, notes: v.notes || null });
                  navigate(paths.cast.href(cast.id));
                }}
              />
            );
          }}
        </QueryView>
      </Section>
    </>
  );
}

/** Corrects what a cast is; where it is changes only by recording a movement. */
export function EditCastPage() {
  const id = IdSchema.safeParse(useParams().id);
  const navigate = useNavigate();
  const cast = useQuery({ ...castQueryOptions(id.success ? id.data : ''), enabled: id.success });
  const update = useUpdateCast(id.success ? id.data : '');
  if (!id.success) return <NotFoundPage />;
  return (
    <QueryView query={cast} loadingLabel="Loading the cast…">
      {(c) => (
        <>
          <PageHeading title={`Edit ${c.labelCode}`}>
            Edit {castTitle(c)} <span className="font-mono">{c.labelCode}</span>
          </PageHeading>
          <Section title="The cast">
            <CastForm
              editingId={c.id}
              initial={{ performerId: c.performerId, productionId: c.productionId, region: c.region, kind: c.kind, material: c.material, madeOn: c.madeOn, madeBy: c.madeBy, pouredFromId: c.pouredFrom?.id ?? '', locationId: '', notes: c.notes ?? '' }}
              performers={[{ id: c.performerId, name: c.performerName }]}
              productions={[{ id: c.productionId, name: c.productionName }]}
              submitLabel="Save"
              pending={update.isPending}
              onSubmit={async (v) => {
                await update.mutateAsync({ region: v.region, kind: v.kind, material: v.material, madeOn: v.madeOn, madeBy: v.madeBy, pouredFromId: v.pouredFromId || null, notes: v.notes || null, version: c.version });
                navigate(paths.cast.href(c.id));
              }}
            />
          </Section>
        </>
      )}
    </QueryView>
  );
}
