import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import type { Kit } from '#shared/schemas/kits.ts';
import { Button } from '../../../components/ui/button.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { VersionedEditNotice } from '../../../components/ui/versioned-edit-notice.tsx';
import { ApiError, errorMessage } from '../../../lib/api-client.ts';
import { seatProduction } from '../../../lib/session/seat-production.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { useVersionedEdit } from '../../../lib/use-versioned-edit.ts';
import { kitsQueryOptions, useSaveKit } from '../api.ts';
import { ProductPicker } from '../components/product-picker.tsx';

/** The production's kits: named lists of products used together, kept by the head and the artists. */
export function KitsPage() {
  const session = useSession();
  const production = seatProduction(session);
  return (
    <>
      <PageHeading title="Kits" lead="Named lists of products used together, for example “Day 12 — scar appliance”. A check can start from a kit.">
        Kits
      </PageHeading>
      {production ? <Kits productionId={production.id} /> : <p className="text-ink-700">Switch “Acting as” to a production.</p>}
    </>
  );
}

function Kits({ productionId }: { productionId: string }) {
  const kits = useQuery(kitsQueryOptions(productionId));
  const [editing, setEditing] = useState<Kit | 'new' | null>(null);
  return (
    <QueryView query={kits} loadingLabel="Loading kits…">
      {(data) => (
        <>
          {data.canManage && editing === null ? (
            <div>
              <Button onClick={() => setEditing('new')}>Make a kit</Button>
            </div>
          ) : null}
          {editing !== null ? <KitForm key={editing === 'new' ? 'new' : editing.id} productionId={productionId} kit={editing === 'new' ? null : editing} onDone={() => setEditing(null)} refetch={async () => (await kits.refetch()).data!} /> : null}
          <Section title="This production’s kits" testId="kits">
            {data.items.length === 0 ? (
              <EmptyState title="No kits yet." />
            ) : (
              <ul className="flex flex-col gap-3">
                {data.items.map((k) => (
                  <li key={k.id} className="flex flex-wrap items-start justify-between gap-3 border-b border-sand-300 pb-3 last:border-b-0">
                    <div>
                      <p className="text-lg font-semibold text-ink-900">{k.name}</p>
                      <p className="text-ink-700">{k.products.map((p) => p.name).join(', ')}</p>
                    </div>
                    {k.canManage ? (
                      <Button variant="secondary" onClick={() => setEditing(k)}>
                        Change {k.name}
                      </Button>
                    ) : null}
                  </li>
                ))}
              </ul>
            )}
          </Section>
        </>
      )}
    </QueryView>
  );
}

function KitForm({ productionId, kit, onDone, refetch }: { productionId: string; kit: Kit | null; onDone: () => void; refetch: () => Promise<{ items: Kit[] }> }) {
  const save = useSaveKit();
  const [name, setName] = useState(kit?.name ?? '');
  const [productIds, setProductIds] = useState<string[]>(kit?.products.map((p) => p.id) ?? []);
  const [version, setVersion] = useState(kit?.version ?? 1);
  const [errors, setErrors] = useState<string[] | null>(null);
  const [nameError, setNameError] = useState<string | undefined>();
  const edit = useVersionedEdit({
    refetch,
    onFresh: (fresh) => {
      const k = fresh.items.find((x) => x.id === kit?.id);
      if (k) {
        setName(k.name);
        setProductIds(k.products.map((p) => p.id));
        setVersion(k.version);
      }
    },
  });
  async function submit() {
    setErrors(null);
    setNameError(undefined);
    try {
      const done = await edit.save(() => save.mutateAsync(kit ? { id: kit.id, update: { name, productIds, version } } : { create: { productionId, name, productIds } }));
      if (done) onDone();
    } catch (err) {
      if (err instanceof ApiError && err.fields.name) setNameError(err.fields.name.join(' '));
      const rest = err instanceof ApiError ? Object.entries(err.fields).filter(([k]) => k !== 'name').flatMap(([, m]) => m) : [];
      setErrors(rest.length ? rest : err instanceof ApiError && err.fields.name ? null : [errorMessage(err)]);
    }
  }
  return (
    <Section title={kit ? `Change ${kit.name}` : 'Make a kit'} testId="kit-form">
      <form
        noValidate
        className="flex flex-col gap-4"
        aria-label={kit ? 'Change the kit' : 'Make a kit'}
        onSubmit={(e) => {
          e.preventDefault();
          void submit();
        }}
      >
        <TextField label="Kit name" autoComplete="off" value={name} onChange={(e) => setName(e.target.value)} error={nameError} />
        <ProductPicker chosen={productIds} onChange={setProductIds} label="Products in the kit" />
        <VersionedEditNotice edit={edit} />
        <FormError messages={errors} />
        <div className="flex flex-wrap gap-3">
          <Button type="submit" pending={save.isPending} pendingLabel="Saving…">
            Save the kit
          </Button>
          <Button variant="quiet" onClick={onDone}>
            Cancel
          </Button>
        </div>
      </form>
    </Section>
  );
}
