import { ErrorBanner } from './error-banner.tsx';

/** Messages from the server that belong to no single field. */
export function FormError({ messages }: { messages: string[] | null }) {
  if (!messages || messages.length === 0) return null;
  return <ErrorBanner message={messages.join(' ')} />;
}
