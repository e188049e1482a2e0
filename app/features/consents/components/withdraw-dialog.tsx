import { useState } from 'react';
import { CONSENT_KIND_LABELS, type ConsentKind } from '#shared/domain/consent.ts';
import { Button } from '../../../components/ui/button.tsx';
import { Dialog } from '../../../components/ui/dialog.tsx';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { TextareaField } from '../../../components/ui/textarea-field.tsx';

interface WithdrawDialogProps {
  open: boolean;
  consent: { kind: ConsentKind; title: string } | null;
  consequences: readonly string[];
  pending: boolean;
  error: unknown;
  onCancel: () => void;
  onConfirm: (reason: string | undefined) => void;
}

/**
 * Withdrawing takes no more than signing did: this dialog, then one button. It first says what
 * withdrawing sets in motion; the reason is optional and never needed.
 */
export function WithdrawDialog({ open, consent, consequences, pending, error, onCancel, onConfirm }: WithdrawDialogProps) {
  return (
    <Dialog open={open} onClose={onCancel} title="Withdraw this consent?" testId="withdraw-dialog">
      {consent ? <WithdrawForm key={consent.title} consent={consent} consequences={consequences} pending={pending} error={error} onCancel={onCancel} onConfirm={onConfirm} /> : null}
    </Dialog>
  );
}

function WithdrawForm({ consent, consequences, pending, error, onCancel, onConfirm }: Omit<WithdrawDialogProps, 'open' | 'consent'> & { consent: { kind: ConsentKind; title: string } }) {
  const [reason, setReason] = useState('');
  const tooLong = reason.trim().length > 1000;
  return (
    <form
      noValidate
      className="flex flex-col gap-4"
      onSubmit={(e) => {
        e.preventDefault();
        if (!tooLong) onConfirm(reason.trim() || undefined);
      }}
    >
      <p className="text-ink-900">
        <span className="font-semibold">{consent.title}</span> ({CONSENT_KIND_LABELS[consent.kind]})
      </p>
      <div className="flex flex-col gap-2">
        <p className="font-semibold text-ink-900">What withdrawing means</p>
        <ul className="flex list-disc flex-col gap-1 pl-6 text-ink-700" data-testid="withdraw-consequences">
          {consequences.map((c) => (
            <li key={c}>{c}</li>
          ))}
        </ul>
      </div>
      <TextareaField
        label="Reason (optional)"
        hint="You do not have to give one. Only the designated lead and you will see it."
        rows={3}
        maxLength={1000}
        value={reason}
        error={tooLong ? 'At most 1,000 characters' : undefined}
        onChange={(e) => setReason(e.target.value)}
      />
      {error ? <ErrorBanner error={error} /> : null}
      <div className="flex flex-wrap justify-end gap-3">
        <Button variant="secondary" onClick={onCancel}>
          Keep the consent
        </Button>
        <Button type="submit" variant="danger" pending={pending} pendingLabel="Withdrawing…" data-testid="withdraw-confirm">
          Withdraw consent
        </Button>
      </div>
    </form>
  );
}
