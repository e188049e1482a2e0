import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { MOVEMENT_KIND_LABELS, type MovementKind } from '#shared/domain/archive-movements.ts';
import type { CastDetail } from '#shared/schemas/archive.ts';
import { IdSchema } from '#shared/schemas/common.ts';
import { NotFoundPage } from '../../../components/layout/not-found-page.tsx';
import { Button, buttonClasses, ButtonLink } from '../../../components/ui/button.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { formatDate, formatDateTime } from '../../../lib/format.ts';
import { paths, serverPaths } from '../../../lib/paths.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { Caution } from '../../../components/consent/caution.tsx';
import { castQueryOptions } from '../api.ts';
import { CastStatusBadge, castTitle, RetentionBadge } from '../components/cast-status.tsx';
import { ConditionSection } from '../components/condition-section.tsx';
import { MovementDialog } from '../components/movement-dialog.tsx';
import { PhotoGrid } from '../components/photo-grid.tsx';
import { PhotoUploader } from '../components/photo-uploader.tsx';
import { useRecordProduction } from '../../../lib/session/use-record-production.ts';

export async function castLoader({ params }: LoaderFunctionArgs) {
  const id = IdSchema.safeParse(params.id);
  if (id.success) await prefetchFor('archive.view', castQueryOptions(id.data));
  return null;
}

export function CastPage() {
  const id = IdSchema.safeParse(useParams().id);
  if (!id.success) return <NotFoundPage />;
  return <CastView id={id.data} />;
}

function CastView({ id }: { id: string }) {
  const cast = useQuery(castQueryOptions(id));
  return (
    <>
      <nav aria-label="Breadcrumb">
        <Link to={paths.archive.href()} className="inline-flex min-h-11 items-center font-semibold">
          <span aria-hidden="true">←</span>&nbsp;Find a cast
        </Link>
      </nav>
      {!cast.data && isApiError(cast.error, 404) ? (
        <>
          <PageHeading title="Cast not found">Cast not found</PageHeading>
          <p className="text-ink-700">There is no cast at this address. The link or label may be wrong.</p>
        </>
      ) : (
        <QueryView query={cast} loadingLabel="Loading the cast…">
          {(data) => <CastRecord cast={data} />}
        </QueryView>
      )}
    </>
  );
}

function CastRecord({ cast: c }: { cast: CastDetail }) {
  useRecordProduction(c.productionId);
  const [moving, setMoving] = useState<MovementKind | null>(null);
  const title = castTitle(c);
  return (
    <div className="flex flex-col gap-6">
      <PageHeading
        title={`${title} ${c.labelCode}`}
        testId="cast-heading"
        lead={
          <>
            <span className="block">
              Of {c.performerName} · from {c.productionName} · made {formatDate(c.madeOn)} by {c.madeBy}
            </span>
            <span className="block font-mono">{c.labelCode}</span>
          </>
        }
        actions={
          <>
            <a href={serverPaths.labelSheet({ casts: [c.id] })} target="_blank" rel="noopener" className={buttonClasses('secondary')}>
              Print its label
            </a>
            {c.canManage ? (
              <ButtonLink variant="secondary" to={paths.editCast.href(c.id)}>
                Edit
              </ButtonLink>
            ) : null}
          </>
        }
      >
        {title}
      </PageHeading>

      <Caution kind="life_casting" />

      <Section title="Where it is" testId="where-section">
        <p className="flex flex-wrap items-center gap-3 text-lg">
          <CastStatusBadge status={c.status} overdue={c.overdue} />
          <span data-testid="cast-where">{c.where}</span>
        </p>
        <dl className="grid gap-x-6 gap-y-2 sm:grid-cols-[max-content_1fr]">
          <dt className="font-semibold text-ink-700">Normal place</dt>
          <dd>{c.normalLocation ? <Link to={paths.place.href(c.normalLocation.id)}>{`${c.normalLocation.breadcrumb} (${c.normalLocation.path})`}</Link> : 'None: the archive no longer keeps a place for it'}</dd>
          {c.currentLocation ? (
            <>
              <dt className="font-semibold text-ink-700">Shelf or bin now</dt>
              <dd>
                <Link to={paths.place.href(c.currentLocation.id)}>{c.currentLocation.path}</Link>
              </dd>
            </>
          ) : null}
          <dt className="font-semibold text-ink-700">There since</dt>
          <dd>{formatDateTime(c.since)}</dd>
          {c.dueBackAt ? (
            <>
              <dt className="font-semibold text-ink-700">Due back</dt>
              <dd className={c.overdue ? 'font-semibold text-brick-700' : ''}>
                {formatDateTime(c.dueBackAt)}
                {c.overdue ? ' — overdue' : ''}
              </dd>
            </>
          ) : null}
        </dl>
        {c.allowedMovements.length ? (
          <div className="flex flex-wrap gap-3" data-testid="movement-actions">
            {c.allowedMovements.map((kind) => (
              <Button key={kind} variant={kind === 'destruction' ? 'danger' : kind === 'check_out' || kind === 'check_in' ? 'primary' : 'secondary'} onClick={() => setMoving(kind)}>
                {MOVEMENT_KIND_LABELS[kind]}
              </Button>
            ))}
          </div>
        ) : null}
        {moving ? <MovementDialog cast={c} kind={moving} onClose={() => setMoving(null)} /> : null}
      </Section>

      <Section title="Photos" testId="photos-section">
        {c.photos.length === 0 ? <p className="text-ink-700">No photo yet.</p> : <PhotoGrid castId={c.id} photos={c.photos} canManage={c.canManage} label={`Photos of ${title} ${c.labelCode}`} />}
        {c.canManage ? <PhotoUploader castId={c.id} /> : null}
      </Section>

      <Section title="About this cast">
        <dl className="grid gap-x-6 gap-y-2 sm:grid-cols-[max-content_1fr]">
          <dt className="font-semibold text-ink-700">Performer</dt>
          <dd>
            <Link to={paths.performer.href(c.performerId)}>{c.performerName}</Link>
          </dd>
          <dt className="font-semibold text-ink-700">Material</dt>
          <dd>{c.material}</dd>
          <dt className="font-semibold text-ink-700">Poured from</dt>
          <dd>{c.pouredFrom ? <Link to={paths.cast.href(c.pouredFrom.id)}>{`${castTitle(c.pouredFrom)} ${c.pouredFrom.labelCode}`}</Link> : 'Not poured from another cast'}</dd>
          {c.pouredInto.length ? (
            <>
              <dt className="font-semibold text-ink-700">Poured from it</dt>
              <dd>
                <ul>
                  {c.pouredInto.map((p) => (
                    <li key={p.id}>
                      <Link to={paths.cast.href(p.id)}>{`${castTitle(p)} ${p.labelCode}`}</Link>
                    </li>
                  ))}
                </ul>
              </dd>
            </>
          ) : null}
          <dt className="font-semibold text-ink-700">Notes</dt>
          <dd className="max-w-prose">{c.notes ?? <span className="text-ink-600">None</span>}</dd>
          <dt className="font-semibold text-ink-700">Retention</dt>
          <dd className="flex flex-col items-start gap-1">
            <RetentionBadge state={c.retention.state} />
            <span className="max-w-prose">{c.retention.reason}</span>
          </dd>
        </dl>
      </Section>

      <ConditionSection cast={c} />

      <Section title="Movement history" testId="history-section">
        {c.movements.length === 0 ? (
          <p className="text-ink-700">Not moved since it was recorded at {c.normalLocation?.path ?? 'its first place'}.</p>
        ) : (
          <Table caption={`Every move of ${c.labelCode}, newest first`} testId="movement-history">
            <Thead>
              <tr>
                <Th>When</Th>
                <Th>Move</Th>
                <Th>From → to</Th>
                <Th>Who</Th>
              </tr>
            </Thead>
            <tbody>
              {c.movements.map((m) => (
                <Tr key={m.id}>
                  <Td className="whitespace-nowrap">{formatDateTime(m.at)}</Td>
                  <Td>
                    <span className="font-semibold">{MOVEMENT_KIND_LABELS[m.kind]}</span>
                    {m.reason ? <span className="block text-sm text-ink-700">{m.reason}</span> : null}
                    {m.dueBackAt ? <span className="block text-sm text-ink-700">Due back {formatDateTime(m.dueBackAt)}</span> : null}
                    {m.method ? <span className="block text-sm text-ink-700">{m.method}</span> : null}
                    {m.note ? <span className="block text-sm text-ink-700">{m.note}</span> : null}
                  </Td>
                  <Td className="max-w-72 break-words">
                    {m.from} <span aria-hidden="true">→</span>
                    <span className="sr-only">to</span> {m.to}
                  </Td>
                  <Td className="text-sm">
                    <span className="block">Moved by {m.movedBy}</span>
                    <span className="block">Authorised by {m.authorisedBy}</span>
                    {m.witness ? <span className="block">Witnessed by {m.witness}</span> : null}
                    {m.contact ? <span className="block">Contact: {m.contact}</span> : null}
                  </Td>
                </Tr>
              ))}
            </tbody>
          </Table>
        )}
      </Section>
    </div>
  );
}
