import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useNavigate, useSearchParams } from 'react-router-dom';
import { BookPatchTestInputSchema } from '#shared/schemas/patch-test-log.ts';
import { Button } from '../../../components/ui/button.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { paths } from '../../../lib/paths.ts';
import { seatProduction } from '../../../lib/session/seat-production.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { performersQueryOptions } from '../../performers/index.ts';
import { protocolsQueryOptions } from '../../protocols/index.ts';
import { useBookTest } from '../api.ts';
import { BookingConsentGate } from '../components/booking-consent-gate.tsx';
import { PatchTestCautions, ScreeningLabel } from '../components/cautions.tsx';
import { TestedProductRow, type RowValue } from '../components/tested-product-row.tsx';

type Errors = Record<string, string>;
const EMPTY_ROW: RowValue = { productId: '', lotId: '', site: '' };

/** Booking a patch test (head): who, on which protocol, when and where, and each product with its lot and site. */
export function BookTestPage() {
  const session = useSession();
  const production = session ? seatProduction(session) : null;
  const [search] = useSearchParams();
  const navigate = useNavigate();
  const [performerId, setPerformerId] = useState(search.get('performerId') ?? '');
  const [protocolId, setProtocolId] = useState('');
  const [startsAt, setStartsAt] = useState('');
  const [location, setLocation] = useState('');
  const [rows, setRows] = useState<RowValue[]>([{ ...EMPTY_ROW }]);
  const [errors, setErrors] = useState<Errors>({});
  const [problem, setProblem] = useState<string[] | null>(null);
  const performers = useQuery({ ...performersQueryOptions({ productionId: production?.id, consent: 'any', sort: 'name', dir: 'asc', page: 1, pageSize: 100 }), enabled: Boolean(production) });
  const protocols = useQuery(protocolsQueryOptions());
  const book = useBookTest();
  const startsAtInstant = startsAt && !Number.isNaN(new Date(startsAt).getTime()) ? new Date(startsAt).toISOString() : null;

  async function submit(e: React.FormEvent) {
    e.preventDefault();
    setProblem(null);
    const input = {
      performerId,
      productionId: production?.id ?? '',
      protocolId,
      startsAt: startsAtInstant ?? '',
      location,
      products: rows,
    };
    const parsed = BookPatchTestInputSchema.safeParse(input);
    if (!parsed.success) {
      setErrors(Object.fromEntries(parsed.error.issues.map((i) => [i.path.join('.'), i.message])));
      return;
    }
    setErrors({});
    try {
      const test = await book.mutateAsync(parsed.data);
      await navigate(paths.patchTest.href(test.id));
    } catch (err) {
      if (isApiError(err) && Object.keys(err.fields).length) setErrors(Object.fromEntries(Object.entries(err.fields).map(([k, v]) => [k, v.join(' ')])));
      else setProblem([isApiError(err) ? err.message : 'The test was not booked.']);
    }
  }

  const chosen = performers.data?.items.find((p) => p.id === performerId);
  const rowErrors = (i: number) => ({ productId: errors[`products.${i}.productId`], lotId: errors[`products.${i}.lotId`], site: errors[`products.${i}.site`] });
  return (
    <div className="flex flex-col gap-6">
      <PageHeading title="Book a patch test" lead={production ? `On ${production.name}.` : undefined}>
        Book a patch test
      </PageHeading>
      <ScreeningLabel />
      <PatchTestCautions solvents />
      <form noValidate onSubmit={(e) => void submit(e)} className="flex flex-col gap-6" aria-label="Book a patch test" data-testid="book-test-form">
        <Section title="Who, when and where">
          <div className="grid gap-4 md:grid-cols-2">
            <SelectField label="Performer" value={performerId} error={errors.performerId} onChange={(e) => setPerformerId(e.target.value)}>
              <option value="">Choose…</option>
              {(performers.data?.items ?? []).map((p) => (
                <option key={p.id} value={p.id}>
                  {p.preferredName ?? p.legalName}
                </option>
              ))}
            </SelectField>
            <SelectField label="Protocol" value={protocolId} error={errors.protocolId} onChange={(e) => setProtocolId(e.target.value)}>
              <option value="">Choose…</option>
              {(protocols.data?.items ?? []).map((p) => (
                <option key={p.protocol.id} value={p.protocol.id}>
                  {p.protocol.name}
                </option>
              ))}
            </SelectField>
            <TextField label="Date and time" type="datetime-local" value={startsAt} error={errors.startsAt} onChange={(e) => setStartsAt(e.target.value)} />
            <TextField label="Place" hint="For example “Make-up trailer 2”." value={location} error={errors.location} onChange={(e) => setLocation(e.target.value)} />
          </div>
          {chosen && production ? <BookingConsentGate performerId={chosen.id} performerName={chosen.preferredName ?? chosen.legalName} production={production} startsAt={startsAtInstant} /> : null}
        </Section>
        <Section title="Products and sites">
          {errors.products ? <FormError messages={[errors.products]} /> : null}
          <ul className="flex flex-col gap-3">
            {rows.map((r, i) => (
              <TestedProductRow
                key={i}
                index={i}
                value={r}
                errors={rowErrors(i)}
                onChange={(v) => setRows((all) => all.map((x, j) => (j === i ? v : x)))}
                onRemove={rows.length > 1 ? () => setRows((all) => all.filter((_, j) => j !== i)) : undefined}
              />
            ))}
          </ul>
          <div>
            <Button variant="secondary" onClick={() => setRows((all) => [...all, { ...EMPTY_ROW }])}>
              Add a product
            </Button>
          </div>
        </Section>
        <FormError messages={problem} />
        <div>
          <Button type="submit" pending={book.isPending} pendingLabel="Booking…">
            Book the test
          </Button>
        </div>
      </form>
    </div>
  );
}
