import { useState } from 'react';
import type { PatchTestDetail } from '#shared/schemas/patch-test-log.ts';
import { Button } from '../../../components/ui/button.tsx';
import { FormError } from '../../../components/ui/form-error.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { seatCan } from '../../../lib/session/seat.ts';
import { useSession } from '../../../lib/session/session-context.tsx';
import { useTestStep } from '../api.ts';
import { localNow } from './reading-grid.tsx';

function messagesOf(err: unknown): string[] {
  if (!isApiError(err)) return ['That did not work. Try again.'];
  const fields = Object.values(err.fields).flat();
  return fields.length ? fields : [err.message];
}

/** One recorded moment (application or removal) with its date-and-time box. */
function MomentStep({ test, step, field, label, action }: { test: PatchTestDetail; step: 'apply' | 'removal'; field: 'appliedAt' | 'removedAt'; label: string; action: string }) {
  const [at, setAt] = useState(localNow());
  const [problem, setProblem] = useState<string[] | null>(null);
  const run = useTestStep(test.id, step);
  return (
    <form
      noValidate
      className="flex flex-wrap items-end gap-3"
      aria-label={action}
      onSubmit={(e) => {
        e.preventDefault();
        setProblem(null);
        run.mutateAsync({ [field]: new Date(at).toISOString(), version: test.version }).catch((err: unknown) => setProblem(messagesOf(err)));
      }}
    >
      <TextField label={label} type="datetime-local" value={at} onChange={(e) => setAt(e.target.value)} />
      <Button type="submit" pending={run.isPending} pendingLabel="Saving…">
        {action}
      </Button>
      <FormError messages={problem} />
    </form>
  );
}

function SimpleStep({ test, step, label, variant = 'secondary' }: { test: PatchTestDetail; step: 'close' | 'cancel'; label: string; variant?: 'secondary' | 'danger' }) {
  const [problem, setProblem] = useState<string[] | null>(null);
  const run = useTestStep(test.id, step);
  return (
    <div className="flex flex-col gap-2">
      <Button variant={variant} pending={run.isPending} pendingLabel="Saving…" onClick={() => run.mutateAsync({ version: test.version }).catch((err: unknown) => setProblem(messagesOf(err)))}>
        {label}
      </Button>
      <FormError messages={problem} />
    </div>
  );
}

function Reschedule({ test }: { test: PatchTestDetail }) {
  const [at, setAt] = useState('');
  const [place, setPlace] = useState(test.location ?? '');
  const [problem, setProblem] = useState<string[] | null>(null);
  const run = useTestStep(test.id, 'reschedule');
  return (
    <form
      noValidate
      className="flex flex-wrap items-end gap-3"
      aria-label="Move the test"
      onSubmit={(e) => {
        e.preventDefault();
        setProblem(null);
        if (!at) return setProblem(['Choose the new date and time.']);
        run.mutateAsync({ startsAt: new Date(at).toISOString(), location: place, version: test.version }).catch((err: unknown) => setProblem(messagesOf(err)));
      }}
    >
      <TextField label="New date and time" type="datetime-local" value={at} onChange={(e) => setAt(e.target.value)} />
      <TextField label="Place" value={place} onChange={(e) => setPlace(e.target.value)} />
      <Button type="submit" variant="secondary" pending={run.isPending} pendingLabel="Moving…">
        Move the test
      </Button>
      <FormError messages={problem} />
    </form>
  );
}

/** What can be done with the test now: the head moves or cancels a booked one; the lead records application, removal, and closes. */
export function TestActions({ test }: { test: PatchTestDetail }) {
  const session = useSession();
  const lead = seatCan(session, 'patchtests.record');
  const head = seatCan(session, 'patchtests.book');
  const occluded = test.schedule.some((s) => s.estimated) || test.testKind === 'occluded_patch';
  return (
    <div className="flex flex-col gap-4">
      {lead && test.status === 'booked' ? <MomentStep test={test} step="apply" field="appliedAt" label="Applied at" action="Record the application" /> : null}
      {lead && test.status === 'applied' && occluded && !test.removedAt ? <MomentStep test={test} step="removal" field="removedAt" label="Patches off at" action="Record the removal" /> : null}
      {head && test.status === 'booked' ? <Reschedule test={test} /> : null}
      <div className="flex flex-wrap gap-3">
        {lead && test.status === 'applied' ? <SimpleStep test={test} step="close" label="Close the test" /> : null}
        {head && (test.status === 'booked' || test.status === 'applied') ? <SimpleStep test={test} step="cancel" label="Cancel the test" variant="danger" /> : null}
      </div>
    </div>
  );
}
