import type { Request, RequestHandler } from 'express';
import { rateLimit } from 'express-rate-limit';
import { ApiError } from './errors.ts';

/** The app setting that switches every limiter on or off, set once from the configuration in createApp. */
export const RATE_LIMITS_SETTING = 'plinth.rateLimits';

/**
 * The one way Plinth limits a route: per client address (req.ip, which honours TRUST_PROXY), a
 * 429 in the one error shape, and switched off only where the configuration says so (tests).
 */
export function rateLimiter(opts: { windowMs: number; limit: number; message: string }): RequestHandler {
  return rateLimit({
    windowMs: opts.windowMs,
    limit: opts.limit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    skip: (req: Request) => req.app.get(RATE_LIMITS_SETTING) !== true,
    handler: (_req, _res, next) => next(new ApiError('rate_limited', opts.message)),
  });
}
