// DEVELOPMENT-ONLY identity provider configuration. Keys are made fresh at every start, accounts are
// the invented demo people, and everything lives in memory: never point a real deployment at this.

import { generateKeyPairSync, randomBytes, type JsonWebKey } from 'node:crypto';
import {
  errors,
  type Account,
  type Configuration,
  type Grant,
  type KoaContextWithOIDC,
} from 'oidc-provider';

import { findDemoAccountBySub } from './accounts.ts';
import { cspNonce } from './interactions.ts';
import { EXPIRED_MESSAGE, EXPIRED_TITLE, layout, messagePage } from './pages.ts';
import type { IdpClient } from './server.ts';

const HOUR = 60 * 60;

/** A working day in the workshop: long enough not to interrupt a fitting, short enough to end overnight. */
const SESSION_TTL = 8 * HOUR;

const SCOPE_CLAIMS = {
  openid: ['sub'],
  email: ['email', 'email_verified'],
  profile: ['name'],
} as const;

const SUPPORTED_SCOPES = Object.keys(SCOPE_CLAIMS);

export interface DevelopmentKeys {
  signingKey: JsonWebKey;
  cookieKeys: string[];
}

/**
 * Made per start and never written down, so nothing signed by one run is trusted by the next and no
 * key material is ever committed.
 */
export function createDevelopmentKeys(): DevelopmentKeys {
  const { privateKey } = generateKeyPairSync('rsa', { modulusLength: 2048 });
  const signingKey: JsonWebKey = {
    ...privateKey.export({ format: 'jwk' }),
    kid: `dev-${randomBytes(9).toString('base64url')}`,
    alg: 'RS256',
    use: 'sig',
  };
  return { signingKey, cookieKeys: [randomBytes(32).toString('base64url')] };
}

export interface ConfigurationInput {
  clients: readonly IdpClient[];
  keys: DevelopmentKeys;
}

export function buildConfiguration({ clients, keys }: ConfigurationInput): Configuration {
  // Only clients registered at start-up are Plinth itself; they get no consent question because the
  // person is signing in to the same product, and a question they can only answer "yes" teaches
  // people to click through prompts without reading.
  const firstPartyClientIds = new Set(clients.map((client) => client.clientId));

  return {
    clients: clients.map((client) => ({
      client_id: client.clientId,
      client_secret: client.clientSecret,
      redirect_uris: [...client.redirectUris],
      post_logout_redirect_uris: [...client.postLogoutRedirectUris],
      grant_types: ['authorization_code'],
      response_types: ['code'],
      token_endpoint_auth_method: 'client_secret_basic',
      id_token_signed_response_alg: 'RS256',
    })),
    clientAuthMethods: ['client_secret_basic', 'client_secret_post'],
    responseTypes: ['code'],
    // Leaving out offline_access means no refresh tokens: the app keeps its own session instead.
    scopes: [...SUPPORTED_SCOPES],
    claims: Object.fromEntries(
      Object.entries(SCOPE_CLAIMS).map(([scope, claims]) => [scope, [...claims]]),
    ),
    // By default oidc-provider follows the strict reading of the spec and, whenever an access token is
    // issued too, leaves scope-requested claims (email, name) out of the ID token and serves them only
    // from userinfo. The app reads who signed in from the ID token, so they go in there as well.
    conformIdTokenClaims: false,

    // oidc-provider 9 accepts only S256 challenges, so requiring PKCE here is all that is needed.
    pkce: { required: () => true },

    jwks: { keys: [keys.signingKey] },

    findAccount: (_ctx, sub) => accountFor(sub),

    async loadExistingGrant(ctx) {
      return loadOrCreateGrant(ctx, firstPartyClientIds);
    },

    cookies: {
      keys: keys.cookieKeys,
      // Browsers do not separate cookies by port, so the app on the same host receives these too;
      // distinct names keep them from ever colliding with the app's own cookies.
      names: {
        session: 'plinth_idp_session',
        interaction: 'plinth_idp_interaction',
        resume: 'plinth_idp_interaction_resume',
      },
      // No `secure` flag: this runs on plain http on the loopback interface, where browsers drop
      // secure cookies. oidc-provider would add the flag by itself only on an https request.
      long: { httpOnly: true, sameSite: 'lax' },
      short: { httpOnly: true, sameSite: 'lax' },
    },

    ttl: {
      Session: SESSION_TTL,
      // Kept as long as the session, so a grant never runs out under a live session and brings back
      // the consent prompt that loadExistingGrant exists to avoid.
      Grant: SESSION_TTL,
      Interaction: HOUR,
      AccessToken: HOUR,
      IdToken: HOUR,
      AuthorizationCode: 60,
    },

    features: {
      devInteractions: { enabled: false },
      rpInitiatedLogout: {
        enabled: true,
        logoutSource,
        postLogoutSuccessSource,
      },
    },

    renderError,
  };
}

function accountFor(sub: string): Account | undefined {
  const person = findDemoAccountBySub(sub);
  if (!person) {
    return undefined;
  }
  return {
    accountId: person.sub,
    // oidc-provider filters these down to what the granted scopes allow, so returning all of them is safe.
    claims: () => ({
      sub: person.sub,
      email: person.email,
      email_verified: true,
      name: person.name,
    }),
  };
}

async function loadOrCreateGrant(
  ctx: KoaContextWithOIDC,
  firstPartyClientIds: ReadonlySet<string>,
): Promise<Grant | undefined> {
  const { oidc } = ctx;
  const clientId = oidc.client?.clientId;
  const grantId = oidc.result?.consent?.grantId ?? (clientId ? oidc.session?.grantIdFor(clientId) : undefined);
  const existing = grantId ? await oidc.provider.Grant.find(grantId) : undefined;

  const accountId = oidc.account?.accountId;
  if (!clientId || !accountId || !firstPartyClientIds.has(clientId)) {
    return existing;
  }

  const grant = existing ?? new oidc.provider.Grant({ accountId, clientId });
  let changed = !existing;

  // A later request may ask for more than the first one did; topping up the grant here is what keeps
  // the consent prompt away for that request too.
  const granted = new Set(grant.getOIDCScope().split(' ').filter(Boolean));
  const missingScopes = [...oidc.requestParamOIDCScopes].filter((scope) => !granted.has(scope));
  if (missingScopes.length > 0) {
    grant.addOIDCScope(missingScopes.join(' '));
    changed = true;
  }

  const grantedClaims = new Set(grant.getOIDCClaims());
  const missingClaims = [...oidc.requestParamClaims].filter((claim) => !grantedClaims.has(claim));
  if (missingClaims.length > 0) {
    grant.addOIDCClaims(missingClaims);
    changed = true;
  }

  if (changed) {
    await grant.save();
  }
  return grant;
}

async function logoutSource(ctx: KoaContextWithOIDC, form: string): Promise<void> {
  // The form comes from oidc-provider and carries its anti-forgery token. Submitting it with
  // logout=yes ends the whole identity-provider session, not just this app's part of it, so the next
  // sign-in shows the sign-in page and a different demo person can be chosen.
  const nonce = cspNonce(ctx.res);
  ctx.type = 'html';
  ctx.body = layout({
    title: 'Signing out',
    body: `<h1>Signing out</h1>
<p>Signing you out of the identity provider.</p>
${form}
<input type="hidden" name="logout" value="yes" form="op.logoutForm">
<button type="submit" form="op.logoutForm">Sign out of the identity provider</button>`,
    script: { nonce, source: "document.getElementById('op.logoutForm').submit();" },
  });
}

async function postLogoutSuccessSource(ctx: KoaContextWithOIDC): Promise<void> {
  ctx.type = 'html';
  ctx.body = messagePage(
    'You are signed out',
    'You are signed out of the identity provider. You can close this tab.',
  );
}

async function renderError(
  ctx: KoaContextWithOIDC,
  out: { error: string; error_description?: string },
  error: Error,
): Promise<void> {
  ctx.type = 'html';
  if (error instanceof errors.SessionNotFound) {
    ctx.body = messagePage(EXPIRED_TITLE, EXPIRED_MESSAGE);
    return;
  }
  // Only the OAuth error code and its one-line description: enough to fix a misconfigured client,
  // without stack traces or internals.
  const description = out.error_description ?? 'Something went wrong.';
  ctx.body = messagePage('Sign-in could not continue', `${description} (${out.error})`);
}
