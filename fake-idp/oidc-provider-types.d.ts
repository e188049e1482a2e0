// oidc-provider ships no type declarations and none are installed, so this describes only the
// parts the development identity provider touches. Anything wider is left as `unknown` on purpose:
// a guess at the library's full surface would look authoritative without being checked.

declare module 'oidc-provider' {
  import type { IncomingMessage, ServerResponse } from 'node:http';
  import type { JsonWebKey } from 'node:crypto';

  export type AnyObject = Record<string, unknown>;

  export interface ClientMetadata {
    client_id: string;
    client_secret?: string;
    redirect_uris?: string[];
    post_logout_redirect_uris?: string[];
    grant_types?: string[];
    response_types?: string[];
    token_endpoint_auth_method?: string;
    id_token_signed_response_alg?: string;
    [key: string]: unknown;
  }

  export interface Client {
    clientId: string;
    clientName?: string;
  }

  export interface Session {
    accountId?: string;
    exp?: number;
    grantIdFor(clientId: string): string | undefined;
  }

  export interface Grant {
    jti: string;
    accountId?: string;
    clientId?: string;
    exp?: number;
    getOIDCScope(): string;
    getOIDCClaims(): string[];
    addOIDCScope(scope: string): void;
    addOIDCClaims(claims: string[]): void;
    addResourceScope(resource: string, scope: string): void;
    save(ttl?: number): Promise<string>;
  }

  export interface GrantConstructor {
    new (properties: { accountId?: string; clientId?: string }): Grant;
    find(id: string, options?: { ignoreExpiration?: boolean }): Promise<Grant | undefined>;
  }

  export interface OIDCContext {
    provider: Provider;
    client?: Client;
    session?: Session;
    account?: Account;
    result?: InteractionResults;
    params?: AnyObject;
    requestParamOIDCScopes: Set<string>;
    requestParamClaims: Set<string>;
  }

  /** The Koa context oidc-provider hands to configuration callbacks, narrowed to what is used here. */
  export interface KoaContextWithOIDC {
    oidc: OIDCContext;
    req: IncomingMessage;
    res: ServerResponse;
    host: string;
    status: number;
    type: string;
    body: unknown;
    set(field: string, value: string): void;
    get(field: string): string;
  }

  export type FindAccount = (
    ctx: KoaContextWithOIDC,
    sub: string,
    token?: unknown,
  ) => Promise<Account | undefined> | Account | undefined;

  export interface Account {
    accountId: string;
    claims(
      use: string,
      scope: string,
      claims: AnyObject,
      rejected: string[],
    ): Promise<AccountClaims> | AccountClaims;
  }

  export interface AccountClaims {
    sub: string;
    [claim: string]: unknown;
  }

  export interface ErrorOut {
    error: string;
    error_description?: string;
    [key: string]: unknown;
  }

  export type TTLValue = number | ((ctx: KoaContextWithOIDC, ...rest: unknown[]) => number);

  export interface CookieOptions {
    httpOnly?: boolean;
    sameSite?: 'lax' | 'strict' | 'none';
    secure?: boolean;
    signed?: boolean;
    path?: string;
    domain?: string;
    overwrite?: boolean;
  }

  export interface Configuration {
    clients?: ClientMetadata[];
    clientDefaults?: Partial<ClientMetadata>;
    clientAuthMethods?: string[];
    responseTypes?: string[];
    scopes?: string[];
    claims?: Record<string, string[] | null>;
    conformIdTokenClaims?: boolean;
    findAccount?: FindAccount;
    loadExistingGrant?: (ctx: KoaContextWithOIDC) => Promise<Grant | undefined>;
    pkce?: { required?: (ctx: KoaContextWithOIDC, client: Client) => boolean };
    jwks?: { keys: JsonWebKey[] };
    cookies?: {
      keys?: (string | Buffer)[];
      names?: { session?: string; interaction?: string; resume?: string };
      long?: CookieOptions;
      short?: CookieOptions;
    };
    ttl?: Record<string, TTLValue>;
    interactions?: { url?: (ctx: KoaContextWithOIDC, interaction: Interaction) => Promise<string> | string };
    features?: {
      devInteractions?: { enabled: boolean };
      rpInitiatedLogout?: {
        enabled: boolean;
        logoutSource?: (ctx: KoaContextWithOIDC, form: string) => Promise<void> | void;
        postLogoutSuccessSource?: (ctx: KoaContextWithOIDC) => Promise<void> | void;
      };
      [feature: string]: unknown;
    };
    renderError?: (ctx: KoaContextWithOIDC, out: ErrorOut, error: Error) => Promise<void> | void;
    [key: string]: unknown;
  }

  export interface InteractionResults {
    login?: { accountId: string; [key: string]: unknown };
    consent?: { grantId?: string; [key: string]: unknown };
    error?: string;
    error_description?: string;
    [key: string]: unknown;
  }

  export interface PromptDetail {
    name: string;
    reasons: string[];
    details: {
      missingOIDCScope?: string[];
      missingOIDCClaims?: string[];
      missingResourceScopes?: Record<string, string[]>;
      [key: string]: unknown;
    };
  }

  export interface Interaction {
    uid: string;
    jti: string;
    exp: number;
    returnTo: string;
    grantId?: string;
    prompt: PromptDetail;
    params: AnyObject & { client_id?: string };
    session?: { accountId?: string; uid?: string; cookie?: string };
    lastSubmission?: InteractionResults;
  }

  export class Provider {
    constructor(issuer: string, configuration?: Configuration);
    readonly issuer: string;
    proxy: boolean;
    readonly Grant: GrantConstructor;
    callback(): (req: IncomingMessage, res: ServerResponse) => Promise<void>;
    interactionDetails(req: IncomingMessage, res: ServerResponse): Promise<Interaction>;
    interactionFinished(
      req: IncomingMessage,
      res: ServerResponse,
      result: InteractionResults,
      options?: { mergeWithLastSubmission?: boolean },
    ): Promise<void>;
    interactionResult(
      req: IncomingMessage,
      res: ServerResponse,
      result: InteractionResults,
      options?: { mergeWithLastSubmission?: boolean },
    ): Promise<string>;
    on(event: 'server_error', listener: (ctx: KoaContextWithOIDC, error: Error) => void): this;
    on(event: string, listener: (...args: unknown[]) => void): this;
  }

  class OIDCProviderError extends Error {
    status: number;
    statusCode: number;
    error: string;
    error_description?: string;
  }

  export const errors: {
    OIDCProviderError: typeof OIDCProviderError;
    SessionNotFound: typeof OIDCProviderError;
    InvalidRequest: typeof OIDCProviderError;
    [name: string]: typeof OIDCProviderError;
  };

  export default Provider;
}
