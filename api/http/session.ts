import connectPgSimple from 'connect-pg-simple';
import type { Request } from 'express';
import session, { type SessionData } from 'express-session';
import { sql } from 'kysely';
import type pg from 'pg';
import type { Actor } from '#shared/policy.ts';
import type { Config } from '../config.ts';
import type { Db } from '../db/index.ts';
import { loadActor, type SessionProfile, type StampedActor } from './actor.ts';

declare module 'express-session' {
  interface SessionData {
    userId?: string;
    /** When this sign-in was made (ms since the epoch): it lasts at most SESSION_MAX_HOURS, however busy. */
    signedInAt?: number;
    idToken?: string;
    oidc?: { codeVerifier: string; state: string; nonce: string; returnTo: string; forceLogin?: boolean; startedAt: number };
    /** The seat acted in; set at sign-in to where the person last worked (then the role may be open). */
    current?: { productionId: string | null; role?: string };
    /** Set while the department's tablet is handed to a performer: the session can do nothing else. */
    tablet?: {
      requestId: string;
      staffUserId: string;
      phase: 'signing' | 'handback';
      idempotencyKey: string;
      /** A bundle handed over at once: its requests in order, and which one is on screen. */
      bundle?: { requestIds: string[]; index: number };
    };
  }
}

export const SESSION_COOKIE = 'plinth.sid';

/**
 * The stored expiry is rewritten at most this often. An active session's row therefore lags its
 * last request by less than this, and an idle one is gone SESSION_IDLE_MINUTES after its last refresh.
 */
export const SESSION_REFRESH_MS = 60_000;

/** What the store read beside the session data; kept off the data so express-session never saves it back by itself. */
interface Kept {
  /** The actor kept with the session, only when its stamp still matches the user's and no lead boundary has passed. */
  access: StampedActor | null;
  /** The row's expiry when it was read, in ms since the epoch. */
  storedExpireMs: number | null;
}

const KEPT = Symbol('plinth.session.kept');

function keptOf(sess: object): Kept | undefined {
  return (sess as { [KEPT]?: Kept })[KEPT];
}

function keep(sess: object, kept: Kept): void {
  Object.defineProperty(sess, KEPT, { value: kept, enumerable: false, configurable: true, writable: true });
}

// One round trip: the session row, and the stamp that tells whether the actor kept in it is still true.
const READ_SESSION = `
  select s.sess, extract(epoch from s.expire::timestamptz) * 1000 as expire_ms, u.access_version, now() as now
  from sessions s
  left join users u on u.id = case when s.sess->>'userId' ~ '^[0-9a-fA-F-]{36}$' then (s.sess->>'userId')::uuid end
  where s.sid = $1 and s.expire >= to_timestamp($2)`;

// Writes only the kept actor, and only while the row still belongs to that user: a tablet lock or
// sign-out made by a request running alongside is never overwritten.
const KEEP_ACCESS = `
  update sessions set sess = (sess::jsonb || jsonb_build_object('access', $2::jsonb))::json
  where sid = $1 and sess->>'userId' = $3`;

const PgStore = connectPgSimple(session);
type StoreCallback = (err?: unknown) => void;

/**
 * connect-pg-simple with three changes: reading a session also checks the kept actor's stamp;
 * the actor is saved with the session data; and touch() rewrites the expiry at most once a minute.
 */
export class SessionStore extends PgStore {
  readonly #pool: pg.Pool;

  constructor(pool: pg.Pool, options: { pruneSessionInterval: false | number }) {
    super({ pool, tableName: 'sessions', createTableIfMissing: false, pruneSessionInterval: options.pruneSessionInterval });
    this.#pool = pool;
  }

  override get(sid: string, fn: (err: unknown, session?: SessionData | null) => void): void {
    // Named, so each connection plans it once.
    this.#pool.query({ name: 'plinth_read_session', text: READ_SESSION, values: [sid, Math.ceil(Date.now() / 1000)] }).then(
      ({ rows }) => {
        const row = rows[0] as { sess: SessionData & { access?: StampedActor }; expire_ms: string; access_version: string | null; now: Date } | undefined;
        if (!row) return fn(null, null);
        const { access, ...data } = row.sess;
        const current =
          row.access_version !== null &&
          access?.accessVersion === row.access_version &&
          access.actor?.userId === data.userId &&
          // Kept before the profile was kept with it: read again once.
          access.profile !== undefined &&
          (access.validUntil === null || Date.parse(access.validUntil) > row.now.getTime());
        keep(data, { access: current ? access : null, storedExpireMs: Number(row.expire_ms) });
        fn(null, data);
      },
      (err: unknown) => fn(err),
    );
  }

  override createSession(req: Request, data: SessionData) {
    const kept = keptOf(data);
    const created = super.createSession(req, data);
    if (kept) keep(created, kept);
    return created;
  }

  override set(sid: string, sess: SessionData, fn?: StoreCallback): void {
    const access = keptOf(sess)?.access;
    super.set(sid, access && access.actor.userId === sess.userId ? { ...sess, access } as SessionData : sess, fn);
  }

  override touch(sid: string, sess: SessionData, fn?: () => void): void {
    const stored = keptOf(sess)?.storedExpireMs ?? null;
    const expires = sess.cookie?.expires ? new Date(sess.cookie.expires).getTime() : null;
    if (stored !== null && expires !== null && expires - stored < SESSION_REFRESH_MS) {
      fn?.();
      return;
    }
    super.touch(sid, sess, fn);
  }

  /** Keeps a freshly loaded actor in the stored session without rewriting anything else in it. */
  async keepAccess(sid: string, userId: string, access: StampedActor): Promise<void> {
    await this.#pool.query(KEEP_ACCESS, [sid, JSON.stringify(access), userId]);
  }
}

/**
 * The signed-in actor: the one kept with the session while its stamp holds (no extra round trip),
 * otherwise read afresh and kept. Null when the session has no user (signed out, or a lent tablet).
 */
export async function sessionActor(req: Request, db: Db, maxMs: number): Promise<Actor | null> {
  const sess = req.session;
  const userId = sess?.userId;
  if (!userId) return null;
  // The absolute limit: a sign-in older than it (or from before the limit existed) is over.
  if (!sess.signedInAt || Date.now() - sess.signedInAt > maxMs) {
    delete sess.userId;
    delete sess.idToken;
    delete sess.current;
    return null;
  }
  const kept = keptOf(sess);
  if (kept?.access && kept.access.actor.userId === userId) return kept.access.actor;
  const loaded = await loadActor(db, userId);
  if (!loaded) return null;
  if (kept) kept.access = loaded;
  else keep(sess, { access: loaded, storedExpireMs: null });
  if (req.sessionStore instanceof SessionStore) await req.sessionStore.keepAccess(req.sessionID, userId, loaded);
  return loaded.actor;
}

/**
 * The profile kept with the actor `sessionActor` answered for this request (read in the same statement,
 * under the same stamp), or null when none is kept.
 */
export function sessionProfile(req: Request): SessionProfile | null {
  const access = req.session ? keptOf(req.session)?.access : null;
  return access && access.actor.userId === req.session.userId ? (access.profile ?? null) : null;
}

/** Ends every session of a user at once (the tablet a user lent is locked already and stays so). */
export async function endSessionsOf(db: Db, userId: string): Promise<number> {
  const res = await db.deleteFrom('sessions').where(sql`sess->>'userId'`, '=', userId).executeTakeFirst();
  return Number(res.numDeletedRows);
}

/** Server-side sessions in PostgreSQL; the cookie holds only a signed id. */
export function sessionMiddleware(config: Config, pool: pg.Pool) {
  return session({
    name: SESSION_COOKIE,
    secret: config.sessionSecret,
    store: new SessionStore(pool, { pruneSessionInterval: config.isTest ? false : 900 }),
    resave: false,
    saveUninitialized: false,
    // The cookie's expiry moves with every reply; the stored row's at most once a minute (see touch()).
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
