import { zodResolver } from '@hookform/resolvers/zod';
import { useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import type { ProductionDetail } from '#shared/schemas/admin.ts';
import { Button } from '../../../components/ui/button.tsx';
import { ConfirmDialog } from '../../../components/ui/dialog.tsx';
import { Section } from '../../../components/ui/section.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { StatusBadge } from '../../../components/ui/status-badge.tsx';
import { Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { ApiError, errorMessage, isApiError } from '../../../lib/api-client.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { applyServerErrors } from '../../../lib/form-errors.ts';
import { productionQueryOptions, useAppointLead, useEndLead } from '../api.ts';
import { VersionedEditNotice } from '../../../components/ui/versioned-edit-notice.tsx';
import { useVersionedEdit } from '../../../lib/use-versioned-edit.ts';
import { FormError } from '../../../components/ui/form-error.tsx';
import { useSession } from '../../../lib/session/session-context.tsx';

const AppointFormSchema = z.object({ userId: z.string().min(1, 'Choose a team member') });

function NotRecorded() {
  return <span className="text-ink-600">Not recorded</span>;
}

export function LeadSection({ production }: { production: ProductionDetail }) {
  const session = useSession();
  const queryClient = useQueryClient();
  const appoint = useAppointLead(production.id);
  const end = useEndLead(production.id);
  const [confirmEnd, setConfirmEnd] = useState(false);
  const [formError, setFormError] = useState<string[] | null>(null);
  const form = useForm({ resolver: zodResolver(AppointFormSchema), defaultValues: { userId: '' } });
  const { errors } = form.formState;

  const lead = production.lead;
  const current = production.leadHistory.find((a) => a.endsAt === null) ?? null;
  // The lead must be on the staff of the team, not a performer on it, and never the administrator
  // appointing (another administrator does that). One entry per person, however many roles they hold.
  const performerIds = new Set(production.memberships.filter((m) => m.role === 'performer').map((m) => m.userId));
  const candidates = [...new Map(production.memberships.filter((m) => m.role !== 'performer').map((m) => [m.userId, m])).values()].filter(
    (m) => m.userId !== lead?.userId && m.userId !== session.user.id && !performerIds.has(m.userId),
  );
  const [pendingAppoint, setPendingAppoint] = useState<string | null>(null);
  const pendingName = candidates.find((m) => m.userId === pendingAppoint)?.displayName ?? 'This person';

  const edit = useVersionedEdit({
    refetch: () => queryClient.fetchQuery({ ...productionQueryOptions(production.id), staleTime: 0 }),
    onFresh: () => form.reset(),
  });

  const onAppoint = form.handleSubmit(({ userId }) => {
    setFormError(null);
    edit.clear();
    // Who gains health access, and whose ends, is said aloud before anything changes.
    setPendingAppoint(userId);
  });

  async function confirmAppoint() {
    const userId = pendingAppoint;
    if (!userId) return;
    setPendingAppoint(null);
    try {
      // The version on screen: if another administrator appointed someone meanwhile, this is refused.
      if (await edit.save(() => appoint.mutateAsync({ userId, version: production.version }))) form.reset();
    } catch (err) {
      const leftover = applyServerErrors(err, form.setError, ['userId']);
      const hadFields = err instanceof ApiError && Object.keys(err.fields).length > leftover.length;
      setFormError(leftover.length ? leftover : hadFields ? null : [errorMessage(err)]);
    }
  }

  function closeEnd() {
    setConfirmEnd(false);
    end.reset();
  }

  async function onEnd() {
    try {
      await edit.save(() => end.mutateAsync(production.version));
      // Done, or refused as stale (then the notice below says so): either way the dialog closes.
      closeEnd();
    } catch {
      // Any other failure is shown inside the dialog, which stays open.
    }
  }

  return (
    <Section title="Designated lead" testId="lead-section">
      <p className="max-w-prose text-ink-700">
        The designated lead is the only member of staff who may read and record health details on this production. There
        is at most one at a time.
      </p>

      <div className="flex flex-wrap items-center justify-between gap-4 rounded-xl bg-sand-100 p-4" data-testid="current-lead">
        {lead ? (
          <p>
            <span className="block text-sm font-semibold text-ink-700">Current lead</span>
            <span className="text-lg font-bold text-ink-900">{lead.displayName}</span>
            {current ? (
              <span className="text-ink-700">
                {' '}
                since <time dateTime={current.startsAt}>{formatDateTime(current.startsAt)}</time>
              </span>
            ) : null}
          </p>
        ) : (
          <p className="flex flex-wrap items-center gap-2">
            <StatusBadge tone="warning">No designated lead</StatusBadge>
            <span className="text-ink-700">Health details cannot be read or recorded until one is appointed.</span>
          </p>
        )}
        {lead ? (
          <Button variant="danger" onClick={() => setConfirmEnd(true)}>
            End appointment
          </Button>
        ) : null}
      </div>

      <VersionedEditNotice edit={edit} />

      <h3 className="text-lg font-bold text-ink-900">{lead ? 'Appoint someone else' : 'Appoint a lead'}</h3>
      {candidates.length === 0 ? (
        <p className="text-ink-700">
          {production.memberships.length === 0
            ? 'Add people to the team first: the designated lead must be on the team.'
            : 'No one else on the team can be appointed: the lead must hold a staff role, must not be a performer here, and cannot be you. Add someone to the team first.'}
        </p>
      ) : (
        <form noValidate onSubmit={onAppoint} className="flex flex-col gap-4" aria-label="Appoint designated lead" data-testid="appoint-lead-form">
          <SelectField
            label="Team member"
            className="max-w-md"
            hint={lead ? `${lead.displayName}’s appointment ends when the new one starts.` : undefined}
            error={errors.userId?.message}
            {...form.register('userId')}
          >
            <option value="">Choose a team member…</option>
            {candidates.map((m) => (
              <option key={m.userId} value={m.userId}>
                {m.displayName}
              </option>
            ))}
          </SelectField>
          <FormError messages={formError} />
          <div>
            <Button type="submit" pending={appoint.isPending} pendingLabel="Appointing…" disabled={edit.conflict !== null}>
              Appoint
            </Button>
          </div>
        </form>
      )}

      <h3 className="text-lg font-bold text-ink-900">Appointment history</h3>
      {production.leadHistory.length === 0 ? (
        <p className="text-ink-700">No one has been appointed on this production yet.</p>
      ) : (
        <Table caption="Designated lead appointments, newest first" captionHidden testId="lead-history-table">
          <Thead>
            <tr>
              <Th>Who</Th>
              <Th>From</Th>
              <Th>To</Th>
              <Th>Appointed by</Th>
              <Th>Ended by</Th>
            </tr>
          </Thead>
          <tbody>
            {production.leadHistory.map((a) => (
              <Tr key={a.id}>
                <Td className="font-semibold">{a.displayName}</Td>
                <Td className="whitespace-nowrap">
                  <time dateTime={a.startsAt}>{formatDateTime(a.startsAt)}</time>
                </Td>
                <Td className="whitespace-nowrap">
                  {a.endsAt ? <time dateTime={a.endsAt}>{formatDateTime(a.endsAt)}</time> : <StatusBadge tone="good">Current</StatusBadge>}
                </Td>
                <Td>{a.appointedBy ?? <NotRecorded />}</Td>
                <Td>{a.endsAt ? (a.endedBy ?? <NotRecorded />) : <span className="text-ink-600">Still in post</span>}</Td>
              </Tr>
            ))}
          </tbody>
        </Table>
      )}

      <ConfirmDialog
        open={pendingAppoint !== null}
        title={`Appoint ${pendingName} as designated lead?`}
        confirmLabel="Appoint"
        tone="primary"
        pending={appoint.isPending}
        onCancel={() => setPendingAppoint(null)}
        onConfirm={() => void confirmAppoint()}
      >
        <p>
          {pendingName} will be able to read and record the health details of every performer on {production.name}:
          questionnaire answers, reaction grades, notes and photos. Every read is written to the audit log.
        </p>
        <p className="mt-2">
          {lead ? `${lead.displayName}’s access to health details on ${production.name} ends at once.` : 'No one holds this access now.'} The production’s
          department heads are told of the change by e-mail.
        </p>
      </ConfirmDialog>

      <ConfirmDialog
        open={confirmEnd}
        title="End the appointment?"
        confirmLabel="End appointment"
        pending={end.isPending}
        error={end.error && !isApiError(end.error, 409) ? end.error : null}
        onCancel={closeEnd}
        onConfirm={() => void onEnd()}
      >
        <p>
          {lead?.displayName ?? 'The lead'} will stop being the designated lead of {production.name} now. Until someone else
          is appointed, no one can read or record health details on it.
        </p>
      </ConfirmDialog>
    </Section>
  );
}
