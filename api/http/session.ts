import connectPgSimple from 'connect-pg-simple';
import session from 'express-session';
import type pg from 'pg';
import type { Config } from '../config.ts';

declare module 'express-session' {
  interface SessionData {
    userId?: string;
    idToken?: string;
    oidc?: { codeVerifier: string; state: string; nonce: string; returnTo: string; forceLogin?: boolean; startedAt: number };
    current?: { productionId: string | null; role: string };
    /** Set while the department's tablet is handed to a performer: the session can do nothing else. */
    tablet?: { requestId: string; staffUserId: string; phase: 'signing' | 'handback'; idempotencyKey: string };
  }
}

export const SESSION_COOKIE = 'plinth.sid';

/** Server-side sessions in PostgreSQL; the cookie holds only a signed id. */
export function sessionMiddleware(config: Config, pool: pg.Pool) {
  const PgStore = connectPgSimple(session);
  return session({
    name: SESSION_COOKIE,
    secret: config.sessionSecret,
    store: new PgStore({ pool, tableName: 'sessions', createTableIfMissing: false, pruneSessionInterval: config.isTest ? false : 900 }),
    resave: false,
    saveUninitialized: false,
    rolling: true,
    cookie: {
      httpOnly: true,
      sameSite: 'lax',
      secure: config.appOrigin.startsWith('https://'),
      maxAge: config.sessionTtlMs,
      path: '/',
    },
  });
}
