import path from 'node:path';
import { z } from 'zod';

const root = path.resolve(import.meta.dirname, '..');

const DEV_SESSION_SECRET = 'plinth-dev-session-secret-change-me-0001';

const EnvSchema = z
  .object({
    NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
    HOST: z.string().default('127.0.0.1'),
    PORT: z.coerce.number().int().min(0).max(65535).default(3000),
    APP_ORIGIN: z.url({ message: 'must be a URL such as http://127.0.0.1:3000' }).optional(),
    DATABASE_URL: z.url({ message: 'must be a postgres:// URL' }).optional(),
    DB_PORT: z.coerce.number().int().min(1).max(65535).default(54329),
    DB_PASSWORD: z.string().min(8, 'must be at least 8 characters').default('plinth-dev-db'),
    SESSION_SECRET: z.string().min(32, 'must be at least 32 characters').default(DEV_SESSION_SECRET),
    SESSION_IDLE_MINUTES: z.coerce.number().positive().default(30),
    SESSION_MAX_HOURS: z.coerce.number().positive().default(12),
    TABLET_IDLE_MINUTES: z.coerce.number().positive().default(10),
    OIDC_ISSUER: z.url({ message: 'must be the issuer URL of the identity provider' }).default('http://127.0.0.1:3001'),
    OIDC_CLIENT_ID: z.string().min(1).default('plinth'),
    OIDC_CLIENT_SECRET: z.string().min(1).default('plinth-dev-secret'),
    OIDC_SCOPES: z.string().default('openid email profile'),
    IDP_PORT: z.coerce.number().int().min(0).max(65535).default(3001),
    SMTP_URL: z.url({ message: 'must be an smtp:// or smtps:// URL' }).default('smtp://127.0.0.1:2525'),
    SMTP_CATCHER_PORT: z.coerce.number().int().min(0).max(65535).default(2525),
    MAIL_FROM: z.string().min(3).default('Plinth <plinth@plinth.test>'),
    STORAGE_DIR: z.string().default(path.join(root, 'storage')),
    // Where stored files live: this machine's disk (STORAGE_DIR), or an S3-compatible bucket shared by several API processes.
    FILE_STORE: z.enum(['local', 's3']).default('local'),
    S3_BUCKET: z.string().regex(/^[a-z0-9][a-z0-9.-]{1,61}[a-z0-9]$/, 'must be a bucket name (3–63 lower-case letters, digits, dots or hyphens)').optional(),
    S3_ENDPOINT: z.url({ message: 'must be the URL of the S3-compatible service, such as https://s3.example.org' }).optional(),
    S3_REGION: z.string().min(1).default('us-east-1'),
    S3_ACCESS_KEY_ID: z.string().min(1).optional(),
    S3_SECRET_ACCESS_KEY: z.string().min(1).optional(),
    S3_FORCE_PATH_STYLE: z.enum(['true', 'false']).optional(),
    S3_PREFIX: z.string().regex(/^([a-z0-9-]+\/)*$/, 'must be empty or end with "/" (lower-case letters, digits and hyphens), such as plinth/').default(''),
    MAIL_DIR: z.string().optional(),
    // Unset means: start them in development and test, never in production.
    START_FAKES: z.enum(['true', 'false']).optional(),
    TRUST_PROXY: z.enum(['true', 'false']).default('false'),
    // Health details at rest are sealed with this key (32 bytes, base64); else with the key file.
    MEDICAL_DATA_KEY: z.string().regex(/^[A-Za-z0-9+/]{43}=$/, 'must be 32 bytes in base64 (openssl rand -base64 32)').optional(),
    MEDICAL_DATA_KEY_FILE: z.string().optional(),
    // Unset means on, except under NODE_ENV=test where tests that need them switch them on.
    RATE_LIMITS: z.enum(['on', 'off']).optional(),
    // Unset means on, except under NODE_ENV=test where tests start the job runner themselves.
    JOBS: z.enum(['on', 'off']).optional(),
    TIME_ZONE: z
      .string()
      .default('Europe/London')
      .refine((tz) => {
        try {
          return new Intl.DateTimeFormat('en', { timeZone: tz }).resolvedOptions().timeZone.length > 0;
        } catch {
          return false;
        }
      }, 'must be an IANA time zone such as Europe/London'),
  })
  .superRefine((env, ctx) => {
    if (env.NODE_ENV === 'production' && env.SESSION_SECRET === DEV_SESSION_SECRET) {
      ctx.addIssue({ code: 'custom', path: ['SESSION_SECRET'], message: 'must be set to a secret of your own in production' });
    }
    // Sign-in over plain http is only for the bundled provider on this machine.
    const issuer = new URL(env.OIDC_ISSUER);
    if (issuer.protocol === 'http:' && !['127.0.0.1', 'localhost', '[::1]'].includes(issuer.hostname)) {
      ctx.addIssue({ code: 'custom', path: ['OIDC_ISSUER'], message: 'must use https:// unless the identity provider runs on this machine (127.0.0.1 or localhost)' });
    }
    if (env.FILE_STORE === 's3' && !env.S3_BUCKET) {
      ctx.addIssue({ code: 'custom', path: ['S3_BUCKET'], message: 'must name the bucket when FILE_STORE=s3' });
    }
    if (!env.S3_ACCESS_KEY_ID !== !env.S3_SECRET_ACCESS_KEY) {
      ctx.addIssue({ code: 'custom', path: [env.S3_ACCESS_KEY_ID ? 'S3_SECRET_ACCESS_KEY' : 'S3_ACCESS_KEY_ID'], message: 'must be set together with the other S3 key (or leave both unset to use the AWS default credentials)' });
    }
    if (env.NODE_ENV === 'production' && env.START_FAKES === 'true') {
      ctx.addIssue({ code: 'custom', path: ['START_FAKES'], message: 'must be false in production: the demo identity provider and mail catcher are for development only' });
    }
  });

export interface Config {
  nodeEnv: 'development' | 'production' | 'test';
  isTest: boolean;
  isProduction: boolean;
  host: string;
  port: number;
  appOrigin: string;
  databaseUrl: string | null;
  dbPort: number;
  dbPassword: string;
  sessionSecret: string;
  /** A session unused this long is gone. */
  sessionTtlMs: number;
  /** However busy, a sign-in lasts at most this long. */
  sessionMaxMs: number;
  /** The lent tablet's signing screen, left alone this long, locks for good (staff sign in again). */
  tabletIdleMs: number;
  oidc: { issuer: string; clientId: string; clientSecret: string; scopes: string; redirectUri: string; postLogoutRedirectUri: string };
  idpPort: number;
  smtpUrl: string;
  smtpCatcherPort: number;
  mailFrom: string;
  storageDir: string;
  /** Where stored files live (local disk under storageDir unless an S3-compatible bucket is configured). */
  files: FilesConfig;
  mailDir: string;
  startFakes: boolean;
  trustProxy: boolean;
  rateLimits: boolean;
  medicalDataKey: string | null;
  medicalDataKeyFile: string;
  /** Run background jobs (daily reminders) in this process. */
  jobs: boolean;
  /** The studio's time zone: daily jobs run by its clock, and "once a day" counts its days. */
  timeZone: string;
  root: string;
}

export type FilesConfig =
  | { driver: 'local'; dir: string }
  | {
      driver: 's3';
      bucket: string;
      /** Unset means AWS itself. */
      endpoint: string | null;
      region: string;
      /** Unset means the AWS default credential chain (environment, profile, instance role). */
      credentials: { accessKeyId: string; secretAccessKey: string } | null;
      forcePathStyle: boolean;
      /** Prepended to every object key, so one bucket can hold several studios. */
      prefix: string;
    };

export class ConfigError extends Error {
  constructor(public readonly problems: string[]) {
    super(`Plinth cannot start; fix these environment variables:\n${problems.map((p) => `  - ${p}`).join('\n')}`);
  }
}

/** Parses an environment once; every bad variable is named in one error. */
export function parseConfig(source: Record<string, string | undefined>): Config {
  const cleaned = Object.fromEntries(Object.entries(source).filter(([, v]) => v !== undefined && v !== ''));
  const parsed = EnvSchema.safeParse(cleaned);
  if (!parsed.success) {
    throw new ConfigError(parsed.error.issues.map((i) => `${i.path.join('.') || '(env)'} ${i.message}`));
  }
  const env = parsed.data;
  const appOrigin = (env.APP_ORIGIN ?? `http://127.0.0.1:${env.PORT}`).replace(/\/$/, '');
  const storageDir = path.resolve(root, env.STORAGE_DIR);
  return {
    nodeEnv: env.NODE_ENV,
    isTest: env.NODE_ENV === 'test',
    isProduction: env.NODE_ENV === 'production',
    host: env.HOST,
    port: env.PORT,
    appOrigin,
    databaseUrl: env.DATABASE_URL ?? null,
    dbPort: env.DB_PORT,
    dbPassword: env.DB_PASSWORD,
    sessionSecret: env.SESSION_SECRET,
    sessionTtlMs: env.SESSION_IDLE_MINUTES * 60_000,
    sessionMaxMs: env.SESSION_MAX_HOURS * 3600_000,
    tabletIdleMs: env.TABLET_IDLE_MINUTES * 60_000,
    oidc: {
      issuer: env.OIDC_ISSUER.replace(/\/$/, ''),
      clientId: env.OIDC_CLIENT_ID,
      clientSecret: env.OIDC_CLIENT_SECRET,
      scopes: env.OIDC_SCOPES,
      redirectUri: `${appOrigin}/api/auth/callback`,
      postLogoutRedirectUri: `${appOrigin}/`,
    },
    idpPort: env.IDP_PORT,
    smtpUrl: env.SMTP_URL,
    smtpCatcherPort: env.SMTP_CATCHER_PORT,
    mailFrom: env.MAIL_FROM,
    storageDir,
    files:
      env.FILE_STORE === 's3'
        ? {
            driver: 's3',
            bucket: env.S3_BUCKET!,
            endpoint: env.S3_ENDPOINT ?? null,
            region: env.S3_REGION,
            credentials: env.S3_ACCESS_KEY_ID && env.S3_SECRET_ACCESS_KEY ? { accessKeyId: env.S3_ACCESS_KEY_ID, secretAccessKey: env.S3_SECRET_ACCESS_KEY } : null,
            // A self-hosted service at its own address seldom has a DNS name per bucket.
            forcePathStyle: env.S3_FORCE_PATH_STYLE ? env.S3_FORCE_PATH_STYLE === 'true' : Boolean(env.S3_ENDPOINT),
            prefix: env.S3_PREFIX,
          }
        : { driver: 'local', dir: storageDir },
    mailDir: env.MAIL_DIR ? path.resolve(root, env.MAIL_DIR) : path.join(storageDir, 'mail'),
    startFakes: env.START_FAKES ? env.START_FAKES === 'true' : env.NODE_ENV !== 'production',
    trustProxy: env.TRUST_PROXY === 'true',
    rateLimits: env.RATE_LIMITS ? env.RATE_LIMITS === 'on' : env.NODE_ENV !== 'test',
    medicalDataKey: env.MEDICAL_DATA_KEY ?? null,
    medicalDataKeyFile: path.resolve(root, env.MEDICAL_DATA_KEY_FILE ?? path.join('.data', 'medical-data.key')),
    jobs: env.JOBS ? env.JOBS === 'on' : env.NODE_ENV !== 'test',
    timeZone: env.TIME_ZONE,
    root,
  };
}
