import type { Application, Request, RequestHandler } from 'express';
import { type IncrementResponse, rateLimit, type Store } from 'express-rate-limit';
import type pg from 'pg';
import { ApiError } from './errors.ts';

/** The app setting that switches every limiter on or off, set once from the configuration in createApp. */
export const RATE_LIMITS_SETTING = 'plinth.rateLimits';
/** The app setting holding the pool the counters live in, set once in createApp. */
export const RATE_LIMIT_POOL_SETTING = 'plinth.rateLimitPool';

/** How many increments between sweeps of windows long past. */
const SWEEP_EVERY = 500;

/**
 * Counters in PostgreSQL (`rate_limit_hits`), so every API process behind a load balancer counts
 * the same tries: one upsert per limited request, which starts a new window once the old one ended.
 */
export class PgRateLimitStore implements Store {
  prefix: string;
  private windowMs = 60_000;
  private increments = 0;
  constructor(
    private readonly pool: pg.Pool,
    name: string,
  ) {
    this.prefix = `${name}:`;
  }

  init(options: { windowMs: number }): void {
    this.windowMs = options.windowMs;
  }

  async increment(key: string): Promise<IncrementResponse> {
    if (++this.increments % SWEEP_EVERY === 0) await this.pool.query(`delete from rate_limit_hits where reset_at < now() - interval '1 hour'`);
    const { rows } = await this.pool.query<{ hits: number; reset_at: Date }>(
      `insert into rate_limit_hits as r (key, hits, reset_at) values ($1, 1, now() + $2 * interval '1 millisecond')
       on conflict (key) do update set
         hits = case when r.reset_at <= now() then 1 else r.hits + 1 end,
         reset_at = case when r.reset_at <= now() then excluded.reset_at else r.reset_at end
       returning hits, reset_at`,
      [this.prefix + key, this.windowMs],
    );
    return { totalHits: rows[0]!.hits, resetTime: rows[0]!.reset_at };
  }

  async get(key: string): Promise<IncrementResponse | undefined> {
    const { rows } = await this.pool.query<{ hits: number; reset_at: Date }>(`select hits, reset_at from rate_limit_hits where key = $1 and reset_at > now()`, [this.prefix + key]);
    return rows[0] ? { totalHits: rows[0].hits, resetTime: rows[0].reset_at } : undefined;
  }

  async decrement(key: string): Promise<void> {
    await this.pool.query(`update rate_limit_hits set hits = greatest(hits - 1, 0) where key = $1 and reset_at > now()`, [this.prefix + key]);
  }

  async resetKey(key: string): Promise<void> {
    await this.pool.query(`delete from rate_limit_hits where key = $1`, [this.prefix + key]);
  }
}

/**
 * The one way Plinth limits a route: per client address (req.ip, which honours TRUST_PROXY), a
 * 429 in the one error shape, counted in PostgreSQL under the limiter's name (shared by every
 * process), and switched off only where the configuration says so (tests).
 */
export function rateLimiter(opts: { name: string; windowMs: number; limit: number; message: string }): RequestHandler {
  if (!/^[a-z-]+$/.test(opts.name)) throw new Error(`bad rate limiter name ${opts.name}`);
  // One limiter per app, made on its first limited request, with the app's own pool.
  const perApp = new WeakMap<Application, RequestHandler>();
  return (req, res, next) => {
    if (req.app.get(RATE_LIMITS_SETTING) !== true) return next();
    let limiter = perApp.get(req.app);
    if (!limiter) {
      const pool = req.app.get(RATE_LIMIT_POOL_SETTING) as pg.Pool | undefined;
      if (!pool) return next(new Error('rate limits are on but the app has no pool for their counters'));
      limiter = rateLimit({
        windowMs: opts.windowMs,
        limit: opts.limit,
        standardHeaders: 'draft-8',
        legacyHeaders: false,
        store: new PgRateLimitStore(pool, opts.name),
        // Made on the first limited request of each app (so it has that app's pool), then kept.
        validate: { creationStack: false },
        skip: (r: Request) => r.app.get(RATE_LIMITS_SETTING) !== true,
        handler: (_req, _res, nextFn) => nextFn(new ApiError('rate_limited', opts.message)),
      });
      perApp.set(req.app, limiter);
    }
    return limiter(req, res, next);
  };
}
