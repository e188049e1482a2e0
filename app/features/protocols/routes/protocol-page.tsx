import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { useFieldArray, useForm, useWatch, type FieldErrors } from 'react-hook-form';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import type { z } from 'zod';
import { READING_ANCHORS, SCREENING_NOTE, TEST_KINDS, TEST_KIND_LABELS, isScreeningKind, type ReadingPoint } from '#shared/domain/protocols.ts';
import { ProtocolIdSchema, UpdateProtocolInputSchema, type ProtocolVersion } from '#shared/schemas/protocols.ts';
import { NotFoundPage } from '../../../components/layout/not-found-page.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { CheckboxField } from '../../../components/ui/checkbox-field.tsx';
import { ConflictNotice } from '../../../components/ui/conflict-notice.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { QueryView } from '../../../components/ui/query-view.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { TextareaField } from '../../../components/ui/textarea-field.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { formErrorsFrom } from '../../../lib/form-errors.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { paths } from '../../../lib/paths.ts';
import { prefetchFor } from '../../../lib/prefetch.ts';
import { seatCan } from '../../../lib/session/seat.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { protocolHistoryQueryOptions, protocolQueryOptions, useUpdateProtocol } from '../api.ts';
import { minutesInWords } from '../components/durations.ts';

export async function protocolLoader({ params }: LoaderFunctionArgs) {
  const id = ProtocolIdSchema.safeParse(params.id);
  if (id.success) await prefetchFor('catalogue.read', protocolQueryOptions(id.data));
  return null;
}

export function ProtocolPage() {
  const params = useParams();
  const id = ProtocolIdSchema.safeParse(params.id);
  if (!id.success) return <NotFoundPage />;
  return <ProtocolView id={id.data} />;
}

const ANCHOR_LABELS: Record<(typeof READING_ANCHORS)[number], string> = { application: 'After application', removal: 'After removal' };

function ProtocolView({ id }: { id: string }) {
  const protocol = useQuery(protocolQueryOptions(id));
  const session = useSession();
  const canEdit = seatCan(session, 'protocols.manage');
  const title = protocol.data?.protocol.name ?? 'Protocol';
  return (
    <>
      <nav aria-label="Breadcrumb">
        <Link to={paths.protocols.href()} className="inline-flex min-h-11 items-center font-semibold">
          <span aria-hidden="true">←</span>&nbsp;Test protocols
        </Link>
      </nav>
      <PageHeading title={title} lead={protocol.data ? `${TEST_KIND_LABELS[protocol.data.protocol.kind]} · version ${protocol.data.version}` : undefined} testId="protocol-heading">
        {title}
      </PageHeading>
      <QueryView query={protocol} loadingLabel="Loading the protocol…">
        {(v) => (
          <div className="flex flex-col gap-6">
            {isScreeningKind(v.protocol.kind) ? <p className="max-w-prose text-ink-700">{SCREENING_NOTE}</p> : null}
            {canEdit ? <ProtocolEditor key={v.protocol.id} current={v} /> : <ReadingsTable version={v} />}
            <History id={id} />
          </div>
        )}
      </QueryView>
    </>
  );
}

function ReadingsTable({ version: v }: { version: ProtocolVersion }) {
  const p = v.protocol;
  return (
    <Section title="Readings">
      <p>{p.description}</p>
      <p className="text-ink-700">{p.occlusionMinutes === null ? 'Left uncovered.' : `Covered for ${minutesInWords(p.occlusionMinutes)}.`}</p>
      <Table caption="Readings" captionHidden testId="readings-table">
        <Thead>
          <tr>
            <Th>Reading</Th>
            <Th>Due</Th>
            <Th>Window</Th>
          </tr>
        </Thead>
        <tbody>
          {p.readings.map((r) => (
            <Tr key={r.id}>
              <Td className="font-semibold">
                {r.label}
                {r.optional ? <span className="block text-sm font-normal text-ink-700">Optional</span> : null}
              </Td>
              <Td>
                {minutesInWords(r.offsetMinutes)} {r.from === 'removal' ? 'after removal' : 'after application'}
              </Td>
              <Td>
                from {minutesInWords(r.opensBeforeMinutes)} before to {minutesInWords(r.closesAfterMinutes)} after
              </Td>
            </Tr>
          ))}
        </tbody>
      </Table>
    </Section>
  );
}

type Values = z.input<typeof UpdateProtocolInputSchema>;
type Output = z.output<typeof UpdateProtocolInputSchema>;

const minutes = { setValueAs: (v: unknown) => (v === '' || v === null || v === undefined ? Number.NaN : Number(v)) };
const newReading = (): ReadingPoint => ({ id: '', label: '', from: 'application', offsetMinutes: 1440, opensBeforeMinutes: 60, closesAfterMinutes: 60, optional: false });

function readingError(errors: FieldErrors<Values>, i: number, field: keyof ReadingPoint): string | undefined {
  return errors.protocol?.readings?.[i]?.[field]?.message;
}

/** The head's editor: readings with their offsets and windows; every rule of a sound protocol is shown under its field. */
function ProtocolEditor({ current }: { current: ProtocolVersion }) {
  const queryClient = useQueryClient();
  const update = useUpdateProtocol(current.protocol.id);
  const [formError, setFormError] = useState<string[] | null>(null);
  const [conflict, setConflict] = useState<unknown>(null);
  const [saved, setSaved] = useState<number | null>(null);
  const form = useForm<Values, unknown, Output>({ resolver: zodResolver(UpdateProtocolInputSchema), defaultValues: { protocol: current.protocol, version: current.version } });
  const readings = useFieldArray({ control: form.control, name: 'protocol.readings' });
  const { errors } = form.formState;
  const watched = useWatch({ control: form.control, name: 'protocol.readings' });

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    setSaved(null);
    try {
      const next = await update.mutateAsync(values);
      form.reset({ protocol: next.protocol, version: next.version });
      setSaved(next.version);
    } catch (err) {
      if (isApiError(err, 409)) return setConflict(err);
      const names = ['protocol.name', 'protocol.description', 'protocol.kind', 'protocol.occlusionMinutes', 'protocol.readings', 'protocol.applications'] as const;
      setFormError(formErrorsFrom(err, form.setError, names));
    }
  });

  return (
    <form noValidate onSubmit={onSubmit} className="flex flex-col gap-6" aria-label="Edit protocol" data-testid="protocol-form">
      <Section title="The protocol">
        <div className="grid gap-4 md:grid-cols-2">
          <TextField label="Name" autoComplete="off" error={errors.protocol?.name?.message} {...form.register('protocol.name')} />
          <SelectField label="Kind of test" error={errors.protocol?.kind?.message} {...form.register('protocol.kind')}>
            {TEST_KINDS.map((k) => (
              <option key={k} value={k}>
                {TEST_KIND_LABELS[k]}
              </option>
            ))}
          </SelectField>
          <TextareaField label="Description" className="md:col-span-2" rows={3} error={errors.protocol?.description?.message} {...form.register('protocol.description')} />
          <TextField
            label="Covered for (minutes)"
            inputMode="numeric"
            hint="Leave empty for a test left uncovered. 48 hours is 2880 minutes."
            error={errors.protocol?.occlusionMinutes?.message}
            {...form.register('protocol.occlusionMinutes', { setValueAs: (v: unknown) => (v === '' || v === null || v === undefined ? null : Number(v)) })}
          />
          <div className="grid grid-cols-2 gap-4">
            <TextField label="Applications a day" inputMode="numeric" error={errors.protocol?.applications?.timesPerDay?.message ?? errors.protocol?.applications?.message} {...form.register('protocol.applications.timesPerDay', minutes)} />
            <TextField label="For how many days" inputMode="numeric" error={errors.protocol?.applications?.days?.message} {...form.register('protocol.applications.days', minutes)} />
          </div>
        </div>
      </Section>
      <Section title="Readings" testId="readings-editor">
        <p className="text-sm text-ink-700">Offsets and windows in minutes (1 hour = 60, 1 day = 1440). A reading is due at its offset; its window opens before and closes after.</p>
        {errors.protocol?.readings?.message || errors.protocol?.readings?.root?.message ? (
          <p role="alert" className="font-semibold text-brick-700" data-testid="readings-error">
            {errors.protocol?.readings?.message ?? errors.protocol?.readings?.root?.message}
          </p>
        ) : null}
        <ol className="flex flex-col gap-4">
          {readings.fields.map((f, i) => (
            <li key={f.id} className="flex flex-col gap-3 rounded-xl border border-sand-300 p-4" data-testid="reading-row">
              <fieldset className="grid gap-4 md:grid-cols-3">
                <legend className="mb-2 font-bold">Reading {i + 1}</legend>
                <TextField label="Label" autoComplete="off" error={readingError(errors, i, 'label')} {...form.register(`protocol.readings.${i}.label`)} />
                <TextField label="Id" autoComplete="off" hint="Lower-case letters, digits and _." error={readingError(errors, i, 'id')} {...form.register(`protocol.readings.${i}.id`)} />
                <SelectField label="Counted from" error={readingError(errors, i, 'from')} {...form.register(`protocol.readings.${i}.from`)}>
                  {READING_ANCHORS.map((a) => (
                    <option key={a} value={a}>
                      {ANCHOR_LABELS[a]}
                    </option>
                  ))}
                </SelectField>
                <TextField label="Due after (minutes)" inputMode="numeric" hint={minutesInWords(Number(watched?.[i]?.offsetMinutes))} error={readingError(errors, i, 'offsetMinutes')} {...form.register(`protocol.readings.${i}.offsetMinutes`, minutes)} />
                <TextField label="Opens before (minutes)" inputMode="numeric" hint={minutesInWords(Number(watched?.[i]?.opensBeforeMinutes))} error={readingError(errors, i, 'opensBeforeMinutes')} {...form.register(`protocol.readings.${i}.opensBeforeMinutes`, minutes)} />
                <TextField label="Closes after (minutes)" inputMode="numeric" hint={minutesInWords(Number(watched?.[i]?.closesAfterMinutes))} error={readingError(errors, i, 'closesAfterMinutes')} {...form.register(`protocol.readings.${i}.closesAfterMinutes`, minutes)} />
              </fieldset>
              <div className="flex flex-wrap items-center justify-between gap-3">
                <CheckboxField label="Optional reading" hint="Offered, but never holds a result back." {...form.register(`protocol.readings.${i}.optional`)} />
                <Button variant="quiet" onClick={() => readings.remove(i)} aria-label={`Remove reading ${i + 1}`}>
                  Remove
                </Button>
              </div>
            </li>
          ))}
        </ol>
        <div>
          <Button variant="secondary" onClick={() => readings.append(newReading())}>
            Add a reading
          </Button>
        </div>
      </Section>
      {conflict ? (
        <ConflictNotice
          error={conflict}
          onReload={() =>
            void queryClient.fetchQuery({ ...protocolQueryOptions(current.protocol.id), staleTime: 0 }).then((fresh) => {
              form.reset({ protocol: fresh.protocol, version: fresh.version });
              setConflict(null);
            })
          }
        />
      ) : null}
      <FormError messages={formError} />
      <output className="block font-semibold text-sage-800">{saved !== null ? `Saved as version ${saved}. Tests booked earlier keep the version they were booked with.` : ''}</output>
      <div>
        <Button type="submit" pending={update.isPending} pendingLabel="Saving…" disabled={conflict !== null}>
          Save as a new version
        </Button>
      </div>
    </form>
  );
}

function History({ id }: { id: string }) {
  const history = useQuery(protocolHistoryQueryOptions(id));
  return (
    <Section title="Versions">
      <QueryView query={history} loadingLabel="Loading versions…">
        {(data) => (
          <ul className="flex flex-col gap-1">
            {data.items.map((v) => (
              <li key={v.versionId}>
                Version {v.version} · {formatDateTime(v.createdAt)} · {v.createdBy ?? 'Plinth’s starting protocols'}
              </li>
            ))}
          </ul>
        )}
      </QueryView>
    </Section>
  );
}
