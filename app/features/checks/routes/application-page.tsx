import { useQuery } from '@tanstack/react-query';
import { useParams } from 'react-router-dom';
import type { Application } from '#shared/schemas/applications.ts';
import { SKIN_CHECK_OUTCOME_LABELS } from '#shared/domain/applications.ts';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { Icon } from '../../../components/ui/icons.tsx';
import { formatDate, formatDateTime } from '../../../lib/format.ts';
import { applicationQueryOptions } from '../api.ts';
import { ApplicationCautions } from '../components/application-cautions.tsx';
import { ClearanceBadge } from '../components/clearance-badge.tsx';
import { FinishForm, SkinCheckForm } from '../components/after-application-forms.tsx';

function ProductList({ items, empty }: { items: Application['products']; empty: string }) {
  if (items.length === 0) return <p className="text-ink-700">{empty}</p>;
  return (
    <ul className="flex flex-col gap-1">
      {items.map((p) => (
        <li key={`${p.productId}-${p.lotId}`}>
          <span className="font-semibold">{p.productName}</span>, lot {p.lotCode}
        </li>
      ))}
    </ul>
  );
}

/** One logged application: what went on, with which lots, the check it came from, removal and the skin check. */
export function ApplicationPage() {
  const { id = '' } = useParams();
  const application = useQuery(applicationQueryOptions(id));
  return (
    <QueryView query={application} loadingLabel="Loading the application…">
      {(a) => (
        <>
          <PageHeading title={`Application: ${a.performerName}`} lead={`${formatDate(a.appliedOn)}${a.description ? ` · ${a.description}` : ''}`}>
            Application for {a.performerName}
          </PageHeading>
          <Section title="What went on" testId="application-products">
            <dl className="grid gap-2 md:grid-cols-2">
              <div>
                <dt className="text-sm font-semibold text-ink-600">Artist</dt>
                <dd>{a.artistName ?? '—'}</dd>
              </div>
              <div>
                <dt className="text-sm font-semibold text-ink-600">Started / ended</dt>
                <dd>
                  {formatDateTime(a.startedAt)} – {a.endedAt ? formatDateTime(a.endedAt) : 'still on'}
                </dd>
              </div>
            </dl>
            <ProductList items={a.products} empty="No products listed." />
            {a.pieces.length ? <p>Appliance pieces: {a.pieces.map((p) => `no. ${p.number}`).join(', ')}</p> : null}
            {a.notes ? <p className="text-ink-700">{a.notes}</p> : null}
          </Section>
          <Section title="The check it was logged from" testId="application-check">
            <p className="font-semibold">
              {a.check.message} (checked {formatDateTime(a.check.runAt)})
            </p>
            <ul className="flex flex-col gap-1">
              {a.check.items.map((i) => (
                <li key={i.formulationId} className="flex flex-wrap items-center gap-2">
                  <ClearanceBadge state={i.state} /> {i.productName}
                  {i.approved ? <span className="text-sage-800">(approved by the lead)</span> : null}
                </li>
              ))}
            </ul>
          </Section>
          <Section title="Removal" testId="application-removal">
            <ProductList items={a.removalProducts} empty={a.endedAt ? 'No removal products listed.' : 'Not removed yet.'} />
            {a.canFinish ? <FinishForm application={a} /> : null}
          </Section>
          <Section title="Skin check after removal" testId="application-skin-check">
            {a.skinCheck ? (
              <output className="flex flex-col gap-2">
                <p className="flex items-center gap-2 font-semibold">
                  <Icon name={a.skinCheck.reportSent ? 'info' : 'check'} />
                  {a.skinCheck.reportSent ? 'Report sent to the designated lead.' : 'Recorded.'} {a.skinCheck.checkedByName ? `By ${a.skinCheck.checkedByName}, ` : ''}
                  {formatDateTime(a.skinCheck.checkedAt)}.
                </p>
                {a.skinCheck.outcome ? (
                  <p>
                    {SKIN_CHECK_OUTCOME_LABELS[a.skinCheck.outcome]}
                    {a.skinCheck.observation ? `: ${a.skinCheck.observation}` : ''}
                  </p>
                ) : a.skinCheck.reportSent ? (
                  <p className="text-ink-700">What the report says is kept with the designated lead.</p>
                ) : null}
              </output>
            ) : a.canSkinCheck ? (
              <>
                <ApplicationCautions />
                <SkinCheckForm application={a} />
              </>
            ) : (
              <p className="text-ink-700">{a.endedAt ? 'Not recorded yet.' : 'Record the removal first.'}</p>
            )}
          </Section>
        </>
      )}
    </QueryView>
  );
}
