import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { CreateLotInputSchema, type CreateLotInput, type Lot, type ProductDetail } from '#shared/schemas/catalogue.ts';
import { Button } from '../../../components/ui/button.tsx';
import { ConfirmDialog, Dialog } from '../../../components/ui/dialog.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { formErrorsFrom } from '../../../lib/form-errors.ts';
import { formatDate } from '../../../lib/format.ts';
import { useAddLot, useRetireLot, useUpdateLot } from '../api.ts';
import { LotStateBadge } from './badges.tsx';

const LOT_FIELDS = ['code', 'expiresOn', 'formulationId'] as const;

/** The product's lots with their state in words and icon; heads and leads add, correct and retire them. */
export function LotsSection({ product: p, canManage }: { product: ProductDetail; canManage: boolean }) {
  const [editing, setEditing] = useState<Lot | null>(null);
  const [retiring, setRetiring] = useState<Lot | null>(null);
  const retire = useRetireLot(p.id);

  return (
    <div className="flex flex-col gap-4">
      {p.lots.length === 0 ? (
        <EmptyState title="No lots recorded.">{canManage ? 'Add the lot code and last day of use from the container.' : null}</EmptyState>
      ) : (
        <Table caption="Lots" captionHidden testId="lots-table">
          <Thead>
            <tr>
              <Th>Lot</Th>
              <Th>Last day of use</Th>
              <Th>Formulation</Th>
              <Th>State</Th>
              {canManage ? (
                <Th>
                  <span className="sr-only">Actions</span>
                </Th>
              ) : null}
            </tr>
          </Thead>
          <tbody>
            {p.lots.map((l) => (
              <Tr key={l.id}>
                <Td className="font-semibold">{l.code}</Td>
                <Td>{formatDate(l.expiresOn)}</Td>
                <Td>Version {l.formulationVersion}</Td>
                <Td>
                  <LotStateBadge state={l.state} />
                </Td>
                {canManage ? (
                  <Td>
                    <div className="flex flex-wrap gap-2">
                      <Button variant="quiet" onClick={() => setEditing(l)} aria-label={`Correct lot ${l.code}`}>
                        Correct
                      </Button>
                      <Button variant="quiet" onClick={() => setRetiring(l)} aria-label={`${l.state === 'retired' ? 'Bring back' : 'Retire'} lot ${l.code}`}>
                        {l.state === 'retired' ? 'Bring back' : 'Retire'}
                      </Button>
                    </div>
                  </Td>
                ) : null}
              </Tr>
            ))}
          </tbody>
        </Table>
      )}
      {canManage ? <LotForm product={p} /> : null}
      <Dialog open={editing !== null} onClose={() => setEditing(null)} title={editing ? `Correct lot ${editing.code}` : 'Correct lot'}>
        {editing ? <LotForm product={p} lot={editing} onDone={() => setEditing(null)} /> : null}
      </Dialog>
      <ConfirmDialog
        open={retiring !== null}
        tone={retiring?.state === 'retired' ? 'primary' : 'danger'}
        title={retiring?.state === 'retired' ? `Bring back lot ${retiring.code}?` : `Retire lot ${retiring?.code ?? ''}?`}
        confirmLabel={retiring?.state === 'retired' ? 'Bring back' : 'Retire lot'}
        pending={retire.isPending}
        error={retire.error}
        onCancel={() => {
          setRetiring(null);
          retire.reset();
        }}
        onConfirm={() =>
          retiring && retire.mutate({ lotId: retiring.id, retired: retiring.state !== 'retired', version: retiring.version }, { onSuccess: () => setRetiring(null) })
        }
      >
        <p>{retiring?.state === 'retired' ? 'It can be chosen for tests again while it is in date.' : 'It stays on record for the tests that used it, but cannot be chosen for a test.'}</p>
      </ConfirmDialog>
    </div>
  );
}

/** Adds a lot, or corrects one when `lot` is given. */
function LotForm({ product: p, lot, onDone }: { product: ProductDetail; lot?: Lot; onDone?: () => void }) {
  const add = useAddLot(p.id);
  const update = useUpdateLot(p.id);
  const [formError, setFormError] = useState<string[] | null>(null);
  const defaults = { code: lot?.code ?? '', expiresOn: lot?.expiresOn ?? '', formulationId: lot?.formulationId ?? p.currentFormulationId ?? undefined };
  const form = useForm<CreateLotInput>({ resolver: zodResolver(CreateLotInputSchema), defaultValues: defaults });
  const { errors, isSubmitting } = form.formState;

  const submit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      if (lot) await update.mutateAsync({ ...values, lotId: lot.id, version: lot.version });
      else await add.mutateAsync(values);
      form.reset(lot ? values : { code: '', expiresOn: '', formulationId: p.currentFormulationId ?? undefined });
      onDone?.();
    } catch (err) {
      setFormError(formErrorsFrom(err, form.setError, LOT_FIELDS));
    }
  });

  return (
    <form noValidate onSubmit={submit} className="flex flex-col gap-4" aria-label={lot ? `Correct lot ${lot.code}` : 'Add a lot'} data-testid={lot ? 'edit-lot-form' : 'add-lot-form'}>
      {lot ? null : <h3 className="text-lg font-bold">Add a lot</h3>}
      <div className="grid gap-4 md:grid-cols-3">
        <TextField label="Lot code" autoComplete="off" hint="As printed on the container." error={errors.code?.message} {...form.register('code')} />
        <TextField label="Last day of use" type="date" hint="The expiry date on the container." error={errors.expiresOn?.message} {...form.register('expiresOn')} />
        <SelectField label="Formulation" error={errors.formulationId?.message} {...form.register('formulationId')}>
          {p.formulations.map((f) => (
            <option key={f.id} value={f.id}>
              Version {f.version}
              {f.current ? ' (current)' : ''}
            </option>
          ))}
        </SelectField>
      </div>
      <FormError messages={formError} />
      <div className="flex flex-wrap gap-3">
        <Button type="submit" pending={isSubmitting} pendingLabel="Saving…">
          {lot ? 'Save lot' : 'Add lot'}
        </Button>
        {onDone ? (
          <Button variant="secondary" onClick={onDone}>
            Cancel
          </Button>
        ) : null}
      </div>
    </form>
  );
}
