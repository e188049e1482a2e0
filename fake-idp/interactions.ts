import { createHash, randomBytes, timingSafeEqual } from 'node:crypto';
import type { ServerResponse } from 'node:http';

import express, {
  Router,
  type ErrorRequestHandler,
  type Request,
  type RequestHandler,
  type Response,
} from 'express';
import helmet from 'helmet';
import { errors, type Interaction, type Provider } from 'oidc-provider';

import { findDemoAccount } from './accounts.ts';
import { EXPIRED_MESSAGE, EXPIRED_TITLE, messagePage, signInPage } from './pages.ts';

const WRONG_CREDENTIALS = 'Email or password is not right.';

type ResponseWithLocals = ServerResponse & { locals?: Record<string, unknown> };

/** The nonce for this response's one allowed inline script; undefined outside the Express app. */
export function cspNonce(res: ServerResponse): string | undefined {
  const value = (res as ResponseWithLocals).locals?.['cspNonce'];
  return typeof value === 'string' ? value : undefined;
}

/**
 * Helmet's defaults, changed only where this provider needs it:
 * - script-src gets a per-response nonce, for the sign-out page's auto-submit. oidc-provider adds
 *   the hash of its own inline form-post script to the same directive by itself.
 * - style-src allows the pages' inline <style> and nothing remote: there are no external assets.
 * - form-action is dropped: the sign-in and sign-out forms post here, and the answer redirects to the
 *   app's registered callback on another origin, which browsers check against form-action too.
 * - upgrade-insecure-requests and HSTS are dropped: there is no https on the loopback interface.
 */
export function securityHeaders(): RequestHandler[] {
  const setNonce: RequestHandler = (_req, res, next) => {
    res.locals['cspNonce'] = randomBytes(16).toString('base64');
    next();
  };
  const headers = helmet({
    contentSecurityPolicy: {
      directives: {
        'script-src': ["'self'", (_req, res) => `'nonce-${cspNonce(res) ?? ''}'`],
        'style-src': ["'self'", "'unsafe-inline'"],
        'form-action': null,
        'upgrade-insecure-requests': null,
      },
    },
    strictTransportSecurity: false,
  });
  return [setNonce, headers];
}

export interface InteractionRouterOptions {
  /** Called for unexpected failures only; expected ones (expired links, bad forms) are shown to the person. */
  logError?: (error: unknown) => void;
}

/** Mount before provider.callback(): these paths are ours, and oidc-provider answers 404 for them. */
export function createInteractionRouter(
  provider: Provider,
  { logError = (error) => console.error('[fake-idp] interaction failed:', error) }: InteractionRouterOptions = {},
): Router {
  const router = Router();

  // Sign-in pages hold one-time interaction state; a cached copy could replay an expired form.
  router.use('/interaction', (_req, res, next) => {
    res.set('Cache-Control', 'no-store');
    next();
  });

  async function currentInteraction(req: Request<{ uid: string }>, res: Response): Promise<Interaction> {
    const details = await provider.interactionDetails(req, res);
    // The cookie decides which interaction is loaded; a page for another uid would post into the wrong one.
    if (details.uid !== req.params.uid) {
      throw new errors.SessionNotFound('interaction does not match this sign-in page');
    }
    return details;
  }

  router.get('/interaction/:uid', async (req, res) => {
    const details = await currentInteraction(req, res);
    switch (details.prompt.name) {
      case 'login':
        sendHtml(res, 200, signInPage({ uid: details.uid }));
        return;
      case 'consent':
        await finishConsent(provider, req, res, details);
        return;
      default:
        throw new Error(`Unsupported interaction prompt: ${details.prompt.name}`);
    }
  });

  router.post(
    '/interaction/:uid/login',
    express.urlencoded({ extended: false, limit: '10kb' }),
    async (req: Request<{ uid: string }>, res) => {
      const details = await currentInteraction(req, res);
      if (details.prompt.name !== 'login') {
        // Already signed in (a second click, or the back button): let the page route decide what is next.
        res.redirect(303, `/interaction/${encodeURIComponent(details.uid)}`);
        return;
      }

      const body = (req.body ?? {}) as Record<string, unknown>;
      const email = typeof body['email'] === 'string' ? body['email'].trim() : '';
      const password = typeof body['password'] === 'string' ? body['password'] : '';
      const account = email ? findDemoAccount(email) : undefined;

      if (!account || !sameSecret(password, account.password)) {
        sendHtml(res, 401, signInPage({ uid: details.uid, email, error: WRONG_CREDENTIALS }));
        return;
      }

      await provider.interactionFinished(
        req,
        res,
        { login: { accountId: account.sub } },
        { mergeWithLastSubmission: false },
      );
    },
  );

  router.get('/interaction/:uid/abort', async (req, res) => {
    await currentInteraction(req, res);
    await provider.interactionFinished(
      req,
      res,
      { error: 'access_denied', error_description: 'End-User aborted interaction' },
      { mergeWithLastSubmission: false },
    );
  });

  const handleError: ErrorRequestHandler = (error, _req, res, next) => {
    if (res.headersSent) {
      next(error);
      return;
    }
    if (error instanceof errors.SessionNotFound) {
      sendHtml(res, 400, messagePage(EXPIRED_TITLE, EXPIRED_MESSAGE));
      return;
    }
    const status = httpStatusOf(error);
    if (status !== undefined && status >= 400 && status < 500) {
      sendHtml(res, status, messagePage('Sign-in could not continue', 'The sign-in form could not be read. Go back to Plinth and choose Sign in again.'));
      return;
    }
    logError(error);
    sendHtml(res, 500, messagePage('Sign-in could not continue', 'Something went wrong. Go back to Plinth and choose Sign in again.'));
  };
  router.use('/interaction', handleError);

  return router;
}

/**
 * Every registered client is Plinth itself, and config.ts already grants first-party clients what
 * they ask for before a consent prompt is considered. This is the fallback should one still appear,
 * so a person is never asked a question they can only answer one way.
 */
async function finishConsent(
  provider: Provider,
  req: Request,
  res: Response,
  details: Interaction,
): Promise<void> {
  const accountId = details.session?.accountId;
  const clientId = details.params.client_id;
  if (!accountId || typeof clientId !== 'string') {
    throw new errors.SessionNotFound('consent without a signed-in account');
  }

  const existing = details.grantId ? await provider.Grant.find(details.grantId) : undefined;
  const grant = existing ?? new provider.Grant({ accountId, clientId });
  const missing = details.prompt.details;
  if (missing.missingOIDCScope?.length) {
    grant.addOIDCScope(missing.missingOIDCScope.join(' '));
  }
  if (missing.missingOIDCClaims?.length) {
    grant.addOIDCClaims(missing.missingOIDCClaims);
  }
  for (const [indicator, scopes] of Object.entries(missing.missingResourceScopes ?? {})) {
    grant.addResourceScope(indicator, scopes.join(' '));
  }
  const grantId = await grant.save();

  // Merged so the login result from the previous step is kept alongside the consent.
  await provider.interactionFinished(req, res, { consent: { grantId } }, { mergeWithLastSubmission: true });
}

function sendHtml(res: Response, status: number, html: string): void {
  res.status(status).type('html').send(html);
}

/** Comparing digests keeps the comparison constant-time whatever the lengths are. */
function sameSecret(given: string, expected: string): boolean {
  const digest = (value: string) => createHash('sha256').update(value, 'utf8').digest();
  return timingSafeEqual(digest(given), digest(expected));
}

function httpStatusOf(error: unknown): number | undefined {
  if (typeof error === 'object' && error !== null && 'status' in error) {
    const { status } = error as { status: unknown };
    return typeof status === 'number' ? status : undefined;
  }
  return undefined;
}
