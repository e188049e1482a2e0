import type { ReactNode } from 'react';
import { errorMessage } from '../../lib/api-client.ts';
import { Button } from './button.tsx';

interface ErrorBannerProps {
  /** The thrown error; its API message is what the person reads. */
  error?: unknown;
  message?: ReactNode;
  title?: ReactNode;
  onRetry?: () => void;
  children?: ReactNode;
}

export function ErrorBanner({ error, message, title, onRetry, children }: ErrorBannerProps) {
  return (
    <div role="alert" className="flex flex-col gap-2 rounded-xl border-l-4 border-brick-700 bg-brick-50 p-4 text-graphite-900" data-testid="error-banner">
      {title ? <p className="font-bold text-brick-800">{title}</p> : null}
      <p>{message ?? errorMessage(error)}</p>
      {children}
      {onRetry ? (
        <div>
          <Button variant="secondary" onClick={onRetry}>
            Try again
          </Button>
        </div>
      ) : null}
    </div>
  );
}
