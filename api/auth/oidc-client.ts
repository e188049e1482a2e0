import * as client from 'openid-client';
import type { Config } from '../config.ts';
import { ApiError } from '../http/errors.ts';

export interface OidcClient {
  /** Discovery is lazy and retried, so the app starts even while the identity provider is still coming up. */
  configuration(): Promise<client.Configuration>;
}

export function createOidcClient(config: Config['oidc'], log: (msg: string) => void = (msg) => console.error(msg)): OidcClient {
  let cached: Promise<client.Configuration> | null = null;
  const insecure = config.issuer.startsWith('http://');
  return {
    configuration() {
      // Plain http is allowed only for an issuer on loopback (the bundled development provider).
      const options = insecure ? { execute: [client.allowInsecureRequests] } : undefined;
      cached ??= client
        .discovery(new URL(config.issuer), config.clientId, config.clientSecret, undefined, options)
        .catch((err: unknown) => {
          cached = null;
          log(`identity provider discovery failed: ${err instanceof Error ? err.message : String(err)}`);
          throw new ApiError('unavailable', 'The sign-in service is not reachable right now. Try again in a moment.');
        });
      return cached;
    },
  };
}

export { client };
