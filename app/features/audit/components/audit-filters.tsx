import { useQuery } from '@tanstack/react-query';
import { AUDIT_ACTION_LABELS } from '#shared/domain/audit.ts';
import type { AuditQuery } from '#shared/schemas/audit.ts';
import { Button } from '../../../components/ui/button.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { useDebouncedSearch } from '../../../lib/list-params.ts';
import { performersQueryOptions } from '../../performers/index.ts';
import { auditProductionChoicesQueryOptions } from '../api.ts';
import { auditActionChoices } from './audit-words.ts';

const ACTION_CHOICES = auditActionChoices(AUDIT_ACTION_LABELS);

export type AuditFilterPatch = Partial<Pick<AuditQuery, 'q' | 'action' | 'performer' | 'production' | 'from' | 'to'>>;

interface AuditFiltersProps {
  query: AuditQuery;
  onChange: (patch: AuditFilterPatch) => void;
  /** The lead's production: its performers are offered by name. */
  leadProductionId: string | null;
  /** The administrator chooses a production (or reads every one). */
  productionPicker: boolean;
  /** The name of the performer filtered on, when it is not among the choices (picked from a row). */
  performerName: string | null;
}

/** The audit log's filters: who (text), which performer, which production, what happened, and which days. */
export function AuditFilters({ query, onChange, leadProductionId, productionPicker, performerName }: AuditFiltersProps) {
  const [search, setSearch] = useDebouncedSearch(query.q ?? '', (q) => onChange({ q }));
  const performers = useQuery({
    ...performersQueryOptions({ productionId: leadProductionId ?? undefined, consent: 'any', sort: 'name', dir: 'asc', page: 1, pageSize: 100 }),
    enabled: leadProductionId !== null,
  });
  const productions = useQuery({ ...auditProductionChoicesQueryOptions(), enabled: productionPicker });
  const performerChoices = (performers.data?.items ?? []).map((p) => ({ id: p.id, name: p.preferredName ?? p.legalName }));
  const chosenIsListed = !query.performer || performerChoices.some((p) => p.id === query.performer);
  const filtered = Boolean(query.q || query.action || query.performer || (productionPicker && query.production) || query.from || query.to);

  return (
    <search aria-label="Filter the audit log">
      <form className="grid gap-4 md:grid-cols-2" onSubmit={(e) => e.preventDefault()}>
        <TextField
          label="Person"
          type="search"
          value={search}
          onChange={(e) => setSearch(e.target.value)}
          hint="Who acted (name or e-mail address) or whose record it is; or the exact id of a record."
          data-testid="audit-search"
        />
        <SelectField label="Performer" value={query.performer ?? ''} onChange={(e) => onChange({ performer: e.target.value || undefined })} data-testid="audit-performer">
          <option value="">Any performer</option>
          {!chosenIsListed ? <option value={query.performer}>{performerName ?? 'The chosen performer'}</option> : null}
          {performerChoices.map((p) => (
            <option key={p.id} value={p.id}>
              {p.name}
            </option>
          ))}
        </SelectField>
        {productionPicker ? (
          <SelectField label="Production" value={query.production ?? ''} onChange={(e) => onChange({ production: e.target.value || undefined })} data-testid="audit-production">
            <option value="">Every production</option>
            {(productions.data?.items ?? []).map((p) => (
              <option key={p.id} value={p.id}>
                {p.name}
              </option>
            ))}
          </SelectField>
        ) : null}
        <SelectField label="What happened" value={query.action ?? ''} onChange={(e) => onChange({ action: e.target.value || undefined })} data-testid="audit-action">
          <option value="">Anything</option>
          <optgroup label="Kinds of event">
            {ACTION_CHOICES.groups.map((c) => (
              <option key={c.value} value={c.value}>
                {c.words}
              </option>
            ))}
          </optgroup>
          <optgroup label="One event">
            {ACTION_CHOICES.events.map((c) => (
              <option key={c.value} value={c.value}>
                {c.words}
              </option>
            ))}
          </optgroup>
        </SelectField>
        <div className="grid grid-cols-2 gap-4 md:col-span-2">
          <TextField label="From" type="date" hint="On the studio's clock." value={query.from ?? ''} max={query.to} onChange={(e) => onChange({ from: e.target.value || undefined })} data-testid="audit-from" />
          <TextField label="To" type="date" hint="That whole day included." value={query.to ?? ''} min={query.from} onChange={(e) => onChange({ to: e.target.value || undefined })} data-testid="audit-to" />
        </div>
        {filtered ? (
          <div className="md:col-span-2">
            <Button
              variant="quiet"
              onClick={() => {
                setSearch('');
                onChange({ q: undefined, action: undefined, performer: undefined, production: undefined, from: undefined, to: undefined });
              }}
            >
              Clear the filters
            </Button>
          </div>
        ) : null}
      </form>
    </search>
  );
}
