import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { PerformerDetailSchema } from '#shared/schemas/performers.ts';
import { Button } from '../../../components/ui/button.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { api, errorMessage, ApiError } from '../../../lib/api-client.ts';
import { seatProduction } from '../../../lib/session/seat-production.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { kitsQueryOptions, pieceChoicesQueryOptions, useRunCheck } from '../api.ts';
import { CheckboxField } from '../../../components/ui/checkbox-field.tsx';
import { ApplicationCautions } from '../components/application-cautions.tsx';
import { CheckResult } from '../components/check-result.tsx';
import { PerformerPicker, type PickedPerformer } from '../components/performer-picker.tsx';
import { ProductPicker } from '../components/product-picker.tsx';

/** The artist's check before an application: performer, products (a kit and one by one), then the answer. */
export function CheckPage() {
  const session = useSession();
  const production = seatProduction(session);
  const [search, setSearch] = useSearchParams();
  const performerId = search.get('performerId');
  const checkId = search.get('checkId');
  return (
    <>
      <PageHeading title="Check before an application" lead="Choose the performer and the products planned for today; Plinth answers for each, and says go or stop.">
        Check before an application
      </PageHeading>
      <ApplicationCautions />
      {!production ? (
        <p className="text-ink-700">Switch “Acting as” to a production.</p>
      ) : checkId ? (
        <>
          <CheckResult checkId={checkId} />
          <div>
            <Button variant="secondary" onClick={() => setSearch({})}>
              Start another check
            </Button>
          </div>
        </>
      ) : (
        <CheckForm productionId={production.id} performerId={performerId} onPerformer={(id) => setSearch(id ? { performerId: id } : {})} onChecked={(id) => setSearch({ checkId: id })} />
      )}
    </>
  );
}

function CheckForm({ productionId, performerId, onPerformer, onChecked }: { productionId: string; performerId: string | null; onPerformer: (id: string | null) => void; onChecked: (id: string) => void }) {
  const [picked, setPicked] = useState<PickedPerformer | null>(null);
  const [kitId, setKitId] = useState<string>('');
  const [productIds, setProductIds] = useState<string[]>([]);
  const [pieceIds, setPieceIds] = useState<string[]>([]);
  const [formError, setFormError] = useState<string[] | null>(null);
  const kits = useQuery(kitsQueryOptions(productionId));
  const run = useRunCheck();
  // A performer opened by id (a scanned card or a link) is named from their record.
  const byId = useQuery({
    queryKey: ['check-performer', performerId],
    queryFn: ({ signal }) => api.get(`/api/performers/${encodeURIComponent(performerId!)}`, PerformerDetailSchema, signal),
    enabled: Boolean(performerId) && picked?.id !== performerId,
  });
  const performer = performerId ? (picked?.id === performerId ? picked : byId.data ? { id: byId.data.id, name: byId.data.preferredName ?? byId.data.legalName } : null) : null;
  const kit = kits.data?.items.find((k) => k.id === kitId);

  async function submit() {
    setFormError(null);
    if (!performer) return setFormError(['Choose the performer first.']);
    try {
      const c = await run.mutateAsync({ productionId, performerId: performer.id, kitId: kitId || null, productIds, pieceIds });
      onChecked(c.id);
    } catch (err) {
      setFormError(err instanceof ApiError && Object.keys(err.fields).length ? Object.values(err.fields).flat() : [errorMessage(err)]);
    }
  }

  return (
    <>
      <Section title="Performer" testId="check-performer">
        {performer ? (
          <div className="flex flex-wrap items-center justify-between gap-3">
            <p className="text-xl font-bold text-ink-900" data-testid="checked-performer">
              {performer.name}
            </p>
            <Button variant="secondary" onClick={() => { setPicked(null); onPerformer(null); }}>
              Choose another performer
            </Button>
          </div>
        ) : byId.isError ? (
          <FormError messages={[errorMessage(byId.error)]} />
        ) : performerId ? (
          <p className="text-ink-700">Opening the performer…</p>
        ) : (
          <PerformerPicker
            productionId={productionId}
            onPick={(p) => {
              if (p.name) setPicked({ id: p.id, name: p.name });
              onPerformer(p.id);
            }}
          />
        )}
      </Section>
      <Section title="Products planned" testId="check-products">
        <fieldset className="flex flex-col gap-2">
          <legend className="text-base font-semibold text-ink-900">From a kit</legend>
          <div className="flex flex-wrap gap-2">
            <label className={`flex min-h-11 cursor-pointer items-center gap-2 rounded-lg border px-3 ${kitId === '' ? 'border-ink-900 bg-sand-100' : 'border-sand-300'}`}>
              <input type="radio" name="kit" value="" checked={kitId === ''} onChange={() => setKitId('')} className="size-5" />
              No kit
            </label>
            {kits.data?.items.map((k) => (
              <label key={k.id} className={`flex min-h-11 cursor-pointer items-center gap-2 rounded-lg border px-3 ${kitId === k.id ? 'border-ink-900 bg-sand-100' : 'border-sand-300'}`}>
                <input type="radio" name="kit" value={k.id} checked={kitId === k.id} onChange={() => setKitId(k.id)} className="size-5" />
                {k.name} ({k.products.length})
              </label>
            ))}
          </div>
          {kit ? <p className="text-ink-700">In the kit: {kit.products.map((p) => p.name).join(', ')}.</p> : null}
        </fieldset>
        <ProductPicker chosen={productIds} onChange={setProductIds} label="And one by one" />
        {performer ? <PiecePicker productionId={productionId} performerId={performer.id} chosen={pieceIds} onChange={setPieceIds} /> : null}
        <FormError messages={formError} />
        <div>
          <Button pending={run.isPending} pendingLabel="Checking…" onClick={() => void submit()} disabled={!performer}>
            Run the check
          </Button>
        </div>
      </Section>
    </>
  );
}

/** The performer's appliance pieces on the shelf: a piece chosen adds the materials it was made with to the check. */
function PiecePicker({ productionId, performerId, chosen, onChange }: { productionId: string; performerId: string; chosen: string[]; onChange: (ids: string[]) => void }) {
  const pieces = useQuery(pieceChoicesQueryOptions(productionId, performerId));
  if (!pieces.data?.items.length) return null;
  return (
    <fieldset className="flex flex-col gap-1">
      <legend className="text-base font-semibold text-ink-900">Appliance pieces to wear</legend>
      <div className="grid gap-1 md:grid-cols-2">
        {pieces.data.items.map((p) => (
          <CheckboxField
            key={p.id}
            label={`Piece no. ${p.number} from the ${p.moldLabel}, made ${p.madeOn}`}
            checked={chosen.includes(p.id)}
            onChange={(e) => onChange(e.target.checked ? [...chosen, p.id] : chosen.filter((id) => id !== p.id))}
          />
        ))}
      </div>
    </fieldset>
  );
}
