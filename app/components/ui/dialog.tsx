import { useEffect, useId, useRef, type ReactNode } from 'react';
import { Button } from './button.tsx';
import { ErrorBanner } from './error-banner.tsx';

interface DialogProps {
  open: boolean;
  onClose: () => void;
  title: ReactNode;
  children: ReactNode;
  testId?: string;
}

/**
 * A modal built on the native <dialog>: the browser traps focus, closes on Escape and returns
 * focus to the opener, which hand-rolled overlays tend to get wrong.
 */
export function Dialog({ open, onClose, title, children, testId }: DialogProps) {
  const ref = useRef<HTMLDialogElement>(null);
  const titleId = useId();

  useEffect(() => {
    const dialog = ref.current;
    if (!dialog) return;
    if (open && !dialog.open) dialog.showModal();
    if (!open && dialog.open) dialog.close();
  }, [open]);

  return (
    <dialog
      ref={ref}
      aria-labelledby={titleId}
      onClose={onClose}
      data-testid={testId}
      className="m-auto w-[min(36rem,calc(100vw-2rem))] rounded-2xl border border-plaster-300 bg-white p-0 text-graphite-900 shadow-xl backdrop:bg-graphite-900/50"
    >
      {open ? (
        <div className="flex flex-col gap-4 p-6">
          <div className="flex items-start justify-between gap-4">
            <h2 id={titleId} className="text-xl font-bold">
              {title}
            </h2>
            <button
              type="button"
              aria-label="Close"
              onClick={onClose}
              className="-mt-2 -mr-2 inline-flex min-h-11 min-w-11 items-center justify-center rounded-lg text-xl text-graphite-700 hover:bg-plaster-100 hover:text-graphite-900"
            >
              <span aria-hidden="true">✕</span>
            </button>
          </div>
          {children}
        </div>
      ) : null}
    </dialog>
  );
}

interface ConfirmDialogProps {
  open: boolean;
  title: ReactNode;
  children: ReactNode;
  confirmLabel: string;
  onConfirm: () => void;
  onCancel: () => void;
  pending?: boolean;
  error?: unknown;
  tone?: 'danger' | 'primary';
}

export function ConfirmDialog({ open, title, children, confirmLabel, onConfirm, onCancel, pending = false, error, tone = 'danger' }: ConfirmDialogProps) {
  return (
    <Dialog open={open} onClose={onCancel} title={title} testId="confirm-dialog">
      <div className="text-graphite-700">{children}</div>
      {error ? <ErrorBanner error={error} /> : null}
      <div className="flex flex-wrap justify-end gap-3">
        <Button variant="secondary" onClick={onCancel}>
          Cancel
        </Button>
        <Button variant={tone} pending={pending} onClick={onConfirm}>
          {confirmLabel}
        </Button>
      </div>
    </Dialog>
  );
}
