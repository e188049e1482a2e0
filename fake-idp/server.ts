// DEVELOPMENT-ONLY OpenID Connect provider: the local stand-in for a real identity provider, with
// invented demo accounts, in-memory state and keys made fresh at every start.
// Run it with `npm run idp`, or start it from a test with startIdp({ port: 0, clients }).

import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { pathToFileURL } from 'node:url';

import express from 'express';
import { Provider } from 'oidc-provider';

import { DEMO_PASSWORD, demoAccounts } from './accounts.ts';
import { buildConfiguration, createDevelopmentKeys } from './config.ts';
import { createInteractionRouter, securityHeaders } from './interactions.ts';

export interface IdpClient {
  clientId: string;
  clientSecret: string;
  redirectUris: string[];
  postLogoutRedirectUris: string[];
}

export interface StartIdpOptions {
  port: number;
  /** Defaults to 127.0.0.1: the provider is for this machine only. */
  host?: string;
  clients: IdpClient[];
  quiet?: boolean;
}

export interface RunningIdp {
  issuer: string;
  port: number;
  close(): Promise<void>;
}

export async function startIdp(opts: StartIdpOptions): Promise<RunningIdp> {
  // Its accounts and keys are public knowledge: it must never stand in for a studio's real sign-in.
  if (process.env.NODE_ENV === 'production') {
    throw new Error('The demo identity provider does not run with NODE_ENV=production. Configure OIDC_ISSUER to point at your studio\'s identity provider.');
  }
  const host = opts.host ?? '127.0.0.1';
  const keys = createDevelopmentKeys();

  // The issuer has to name the real port, and with port 0 that is known only once listening, so the
  // server listens first and gets its request handler afterwards. Everything from 'listening' to
  // attaching the handler runs synchronously, so no request can arrive in between.
  const server = createServer();
  await listen(server, opts.port, host);
  const { port } = server.address() as AddressInfo;
  const issuer = `http://${hostForUrl(host)}:${port}`;

  const provider = new Provider(issuer, buildConfiguration({ clients: opts.clients, keys }));
  // Nothing sits in front of this server, so forwarded headers are never to be believed.
  provider.proxy = false;
  provider.on('server_error', (_ctx, error) => {
    console.error('[fake-idp] server error:', error);
  });

  const app = express();
  app.set('trust proxy', false);
  app.use(securityHeaders());
  app.use(createInteractionRouter(provider));
  app.use(provider.callback());
  server.on('request', app);
  server.on('error', (error) => {
    console.error('[fake-idp] server error:', error);
  });

  if (!opts.quiet) {
    console.log(`[fake-idp] Development identity provider listening, issuer ${issuer}`);
  }

  let closing: Promise<void> | undefined;
  return {
    issuer,
    port,
    close() {
      closing ??= new Promise<void>((resolve, reject) => {
        server.close((error) => (error ? reject(error) : resolve()));
        // Browsers and fetch keep connections open; without this close() would wait for them to time out.
        server.closeAllConnections();
      });
      return closing;
    },
  };
}

function listen(server: Server, port: number, host: string): Promise<void> {
  return new Promise((resolve, reject) => {
    const onError = (error: NodeJS.ErrnoException) => {
      server.off('listening', onListening);
      reject(
        error.code === 'EADDRINUSE'
          ? new Error(`Port ${port} (identity provider) is already in use`, { cause: error })
          : error,
      );
    };
    const onListening = () => {
      server.off('error', onError);
      resolve();
    };
    server.once('error', onError);
    server.once('listening', onListening);
    server.listen(port, host);
  });
}

/** A wildcard bind address is not somewhere a browser can be sent, so the issuer names loopback instead. */
function hostForUrl(host: string): string {
  if (host === '0.0.0.0' || host === '::' || host === '') {
    return '127.0.0.1';
  }
  return host.includes(':') ? `[${host}]` : host;
}

function readPort(value: string | undefined, fallback: number): number {
  if (value === undefined || value.trim() === '') {
    return fallback;
  }
  const port = Number(value);
  if (!Number.isInteger(port) || port < 0 || port > 65535) {
    throw new Error(`IDP_PORT must be a whole number from 0 to 65535, not "${value}"`);
  }
  return port;
}

async function main(): Promise<void> {
  const port = readPort(process.env['IDP_PORT'], 3001);
  const appOrigin = (process.env['APP_ORIGIN'] || 'http://127.0.0.1:3000').replace(/\/+$/, '');
  const clientId = process.env['OIDC_CLIENT_ID'] || 'plinth';
  const clientSecret = process.env['OIDC_CLIENT_SECRET'] || 'plinth-dev-secret';

  const idp = await startIdp({
    port,
    clients: [
      {
        clientId,
        clientSecret,
        redirectUris: [`${appOrigin}/api/auth/callback`],
        postLogoutRedirectUris: [`${appOrigin}/`],
      },
    ],
  });

  const emailWidth = Math.max(...demoAccounts.map((account) => account.email.length));
  console.log(
    [
      `[fake-idp] Issuer:    ${idp.issuer}`,
      `[fake-idp] Client:    ${clientId}, redirect ${appOrigin}/api/auth/callback`,
      `[fake-idp] Demo sign-ins (password "${DEMO_PASSWORD}"):`,
      ...demoAccounts.map(
        (account) => `[fake-idp]   ${account.email.padEnd(emailWidth)}  ${account.description}`,
      ),
    ].join('\n'),
  );

  const stop = (signal: NodeJS.Signals) => {
    console.log(`[fake-idp] ${signal} received, stopping`);
    idp.close().then(
      () => process.exit(0),
      (error: unknown) => {
        console.error('[fake-idp] could not stop cleanly:', error);
        process.exit(1);
      },
    );
  };
  process.once('SIGINT', stop);
  process.once('SIGTERM', stop);
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  main().catch((error: unknown) => {
    console.error(`[fake-idp] ${error instanceof Error ? error.message : String(error)}`);
    process.exit(1);
  });
}
