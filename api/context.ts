import type { Config } from './config.ts';
import type { Db } from './db/index.ts';
import type { Mailer } from './mail/mailer.ts';
import type { OidcClient } from './auth/oidc-client.ts';

/** What every handler may use; built once in createApp, replaced wholesale in tests. */
export interface AppContext {
  config: Config;
  db: Db;
  mailer: Mailer;
  oidc: OidcClient;
  log: (msg: string, err?: unknown) => void;
}
