import type { Request, Response } from 'express';
import { z } from 'zod';
import { LogoutResultSchema } from '#shared/schemas/session.ts';
import { recordEvent } from '../http/audit.ts';
import { defineRoute } from '../http/route.ts';
import { client } from './oidc-client.ts';
import { linkConfirmedPerformerAtSignIn } from '../features/performers/index.ts';
import { findLastSeat } from '../features/session/index.ts';
import { EmailBoundElsewhere, mayActAsPerformer, upsertUserFromClaims } from './users.ts';

const LoginQuerySchema = z.object({
  returnTo: z
    .string()
    // A path on this site only: no "//host" or "/\host" (browsers read both as another site), no spaces.
    .regex(/^\/(?![/\\])[^\s\\]*$/, 'Must be a path on this site')
    .max(500)
    .optional(),
  reauth: z.enum(['true', 'false']).optional(),
});

function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

/** A failed callback: 401, nothing created, and a way back to sign-in. */
function signInFailed(res: Response, reason: string): void {
  res
    .status(401)
    .type('html')
    .set('Cache-Control', 'no-store')
    .send(
      `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width,initial-scale=1"><title>Sign-in not completed · Plinth</title>` +
        `<style>body{font-family:system-ui,sans-serif;background:#faf6f0;color:#2b2420;display:grid;place-items:center;min-height:100vh;margin:0}main{max-width:32rem;padding:2rem}a{display:inline-block;margin-top:1rem;padding:.75rem 1.25rem;background:#7a3e2a;color:#fff;border-radius:.5rem;text-decoration:none;min-height:44px;box-sizing:border-box}</style></head>` +
        `<body><main><h1>Sign-in was not completed</h1><p>${escapeHtml(reason)}</p><a href="/signin">Back to sign in</a></main></body></html>`,
    );
}

function regenerate(req: Request): Promise<void> {
  return new Promise((resolve, reject) => req.session.regenerate((err) => (err ? reject(err) : resolve())));
}
function save(req: Request): Promise<void> {
  return new Promise((resolve, reject) => req.session.save((err) => (err ? reject(err) : resolve())));
}
function destroy(req: Request): Promise<void> {
  return new Promise((resolve, reject) => req.session.destroy((err) => (err ? reject(err) : resolve())));
}

export const authRoutes = [
  defineRoute({
    method: 'get',
    path: '/api/auth/login',
    summary: 'Start sign-in: redirects to the identity provider (authorization code + PKCE)',
    tag: 'auth',
    auth: 'public',
    query: LoginQuerySchema,
    status: 302,
    errors: [503],
    async handler({ req, res, ctx, query }) {
      const configuration = await ctx.oidc.configuration();
      const codeVerifier = client.randomPKCECodeVerifier();
      const state = client.randomState();
      const nonce = client.randomNonce();
      // Leaving the tablet's hand-back screen needs the staff member's own credentials, not a remembered sign-in.
      const forceLogin = Boolean(req.session.tablet) || query.reauth === 'true';
      req.session.oidc = { codeVerifier, state, nonce, returnTo: query.returnTo ?? '/', forceLogin, startedAt: Date.now() };
      await save(req);
      const url = client.buildAuthorizationUrl(configuration, {
        redirect_uri: ctx.config.oidc.redirectUri,
        scope: ctx.config.oidc.scopes,
        code_challenge: await client.calculatePKCECodeChallenge(codeVerifier),
        code_challenge_method: 'S256',
        state,
        nonce,
        ...(forceLogin ? { prompt: 'login', max_age: '0' } : {}),
      });
      res.set('Cache-Control', 'no-store').redirect(302, url.href);
    },
  }),
  defineRoute({
    method: 'get',
    path: '/api/auth/callback',
    summary: 'Finish sign-in: exchanges the code, checks state and nonce, starts a session',
    tag: 'auth',
    auth: 'public',
    query: z.object({}).catchall(z.string()),
    status: 302,
    produces: 'text/html',
    errors: [503],
    async handler({ req, res, ctx }) {
      const pending = req.session.oidc;
      if (!pending) return signInFailed(res, 'This sign-in attempt has expired or was started in another browser.');
      if (typeof req.query.error === 'string') {
        delete req.session.oidc;
        return signInFailed(res, 'The identity provider did not sign you in.');
      }
      const configuration = await ctx.oidc.configuration();
      let tokens: Awaited<ReturnType<typeof client.authorizationCodeGrant>>;
      try {
        tokens = await client.authorizationCodeGrant(configuration, new URL(req.originalUrl, ctx.config.appOrigin), {
          pkceCodeVerifier: pending.codeVerifier,
          expectedState: pending.state,
          expectedNonce: pending.nonce,
          idTokenExpected: true,
        });
      } catch (err) {
        ctx.log(`sign-in callback refused: ${err instanceof Error ? err.message : String(err)}`);
        delete req.session.oidc;
        return signInFailed(res, 'The sign-in response could not be verified. Please start again.');
      }
      const claims = tokens.claims();
      if (!claims) return signInFailed(res, 'The identity provider sent no identity.');
      // A forced sign-in (leaving the lent tablet) must really have been made just now, with credentials.
      if (pending.forceLogin && (typeof claims.auth_time !== 'number' || claims.auth_time * 1000 < pending.startedAt - 2000)) {
        delete req.session.oidc;
        return signInFailed(res, 'Staff must enter their password again to leave the signing screen.');
      }
      let user: Awaited<ReturnType<typeof upsertUserFromClaims>>;
      try {
        user = await upsertUserFromClaims(ctx.db, {
        issuer: String(claims.iss),
        sub: claims.sub,
        email: typeof claims.email === 'string' ? claims.email : null,
        emailVerified: claims.email_verified === true,
        name: typeof claims.name === 'string' ? claims.name : null,
        });
      } catch (err) {
        if (!(err instanceof EmailBoundElsewhere)) throw err;
        delete req.session.oidc;
        await recordEvent(ctx.db, { actorUserId: err.userId, action: 'auth.sign_in_refuse', entityType: 'user', entityId: err.userId, req, details: { reason: 'email_bound_to_other_subject', issuer: String(claims.iss) } });
        return signInFailed(res, 'This e-mail address already belongs to another sign-in at Plinth. Ask the studio administrator to check your account.');
      }
      if (claims.email_verified === true && typeof claims.email === 'string') await linkConfirmedPerformerAtSignIn(ctx, user.id, claims.email, mayActAsPerformer);
      const returnTo = pending.returnTo;
      // A new session id at sign-in, so an id planted before sign-in is worthless after it.
      await regenerate(req);
      req.session.userId = user.id;
      req.session.signedInAt = Date.now();
      req.session.idToken = tokens.id_token;
      // Start where the person last worked: the seat they last chose, or their latest production in the audit log.
      const lastSeat = await findLastSeat(ctx.db, user.id);
      if (lastSeat) req.session.current = lastSeat;
      await save(req);
      await recordEvent(ctx.db, { actorUserId: user.id, action: 'auth.sign_in', entityType: 'user', entityId: user.id, req, details: { created: user.created } });
      res.set('Cache-Control', 'no-store').redirect(302, returnTo);
    },
  }),
  defineRoute({
    method: 'post',
    path: '/api/auth/logout',
    summary: 'Sign out: ends the Plinth session and returns the identity provider logout URL',
    tag: 'auth',
    auth: 'public',
    response: LogoutResultSchema,
    async handler({ req, ctx }) {
      const idToken = req.session.idToken;
      const userId = req.session.userId;
      const tablet = req.session.tablet;
      if (tablet) {
        // Signing out cannot unlock a lent tablet: the lock survives into the new session.
        await regenerate(req);
        req.session.tablet = tablet;
        await save(req);
        return { redirectTo: '/tablet' };
      }
      await destroy(req);
      if (userId) await recordEvent(ctx.db, { actorUserId: userId, action: 'auth.sign_out', entityType: 'user', entityId: userId, req });
      let redirectTo = '/signin';
      try {
        const configuration = await ctx.oidc.configuration();
        if (configuration.serverMetadata().end_session_endpoint) {
          redirectTo = client.buildEndSessionUrl(configuration, {
            post_logout_redirect_uri: ctx.config.oidc.postLogoutRedirectUri,
            ...(idToken ? { id_token_hint: idToken } : { client_id: ctx.config.oidc.clientId }),
          }).href;
        }
      } catch {
        // The app session is gone either way; the IdP session ends when the IdP is back.
      }
      return { redirectTo };
    },
  }),
];
