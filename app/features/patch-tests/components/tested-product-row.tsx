import { useQuery } from '@tanstack/react-query';
import { TEST_SITES } from '#shared/domain/test-sites.ts';
import { Button } from '../../../components/ui/button.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { formatDate } from '../../../lib/format.ts';
import { productQueryOptions, productsQueryOptions } from '../../catalogue/index.ts';

export interface RowValue {
  productId: string;
  lotId: string;
  site: string;
}

const LOT_STATE_WORDS: Record<string, string> = { expired: 'expired', retired: 'retired', expiring: 'expires soon', ok: '' };

/** One product on the test: the product, one of its lots (expired and retired ones shown, not choosable), and its site. */
export function TestedProductRow({ index, value, errors, onChange, onRemove }: { index: number; value: RowValue; errors: Partial<Record<keyof RowValue, string>>; onChange: (v: RowValue) => void; onRemove?: () => void }) {
  const products = useQuery(productsQueryOptions({ sort: 'name', dir: 'asc', page: 1, pageSize: 100 }));
  const product = useQuery({ ...productQueryOptions(value.productId), enabled: value.productId !== '' });
  const n = index + 1;
  return (
    <li className="grid gap-3 rounded-xl border border-sand-300 p-3 md:grid-cols-[1fr_1fr_1fr_auto] md:items-end" data-testid="tested-product">
      <SelectField label={`Product ${n}`} value={value.productId} error={errors.productId} onChange={(e) => onChange({ ...value, productId: e.target.value, lotId: '' })}>
        <option value="">Choose…</option>
        {(products.data?.items ?? []).map((p) => (
          <option key={p.id} value={p.id}>
            {p.name}
          </option>
        ))}
      </SelectField>
      <SelectField label={`Lot of product ${n}`} value={value.lotId} error={errors.lotId} onChange={(e) => onChange({ ...value, lotId: e.target.value })} disabled={!product.data}>
        <option value="">{product.data ? 'Choose…' : 'Choose the product first'}</option>
        {(product.data?.lots ?? []).map((l) => {
          const unusable = l.state === 'expired' || l.state === 'retired';
          return (
            <option key={l.id} value={l.id} disabled={unusable}>
              {l.code}, use by {formatDate(l.expiresOn)}
              {LOT_STATE_WORDS[l.state] ? ` (${LOT_STATE_WORDS[l.state]})` : ''}
            </option>
          );
        })}
      </SelectField>
      <SelectField label={`Site of product ${n}`} value={value.site} error={errors.site} onChange={(e) => onChange({ ...value, site: e.target.value })}>
        <option value="">Choose…</option>
        {TEST_SITES.map((s) => (
          <option key={s} value={s}>
            {s}
          </option>
        ))}
      </SelectField>
      {onRemove ? (
        <Button variant="quiet" onClick={onRemove} aria-label={`Remove product ${n}`}>
          Remove
        </Button>
      ) : (
        <span />
      )}
    </li>
  );
}
