import type { Config } from './config.ts';
import type { Db } from './db/index.ts';
import type { FileStore } from './files/drivers.ts';
import type { Mailer } from './mail/mailer.ts';
import type { OidcClient } from './auth/oidc-client.ts';

/** What every handler may use; built once in createApp, replaced wholesale in tests. */
export interface AppContext {
  config: Config;
  db: Db;
  /** Stored files (disk or bucket, by configuration); only api/files/store.ts reads and writes it. */
  files: FileStore;
  mailer: Mailer;
  oidc: OidcClient;
  log: (msg: string, err?: unknown) => void;
}
