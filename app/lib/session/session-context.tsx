import { createContext, useContext } from 'react';
import type { Session } from '#shared/schemas/session.ts';

export const SessionContext = createContext<Session | null>(null);

/** The signed-in session; only valid below <RequireSession>. */
export function useSession(): Session {
  const session = useContext(SessionContext);
  if (!session) throw new Error('useSession() is used outside <RequireSession>');
  return session;
}
