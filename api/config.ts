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
    MAIL_DIR: z.string().optional(),
    // Unset means: start them in development and test, never in production.
    START_FAKES: z.enum(['true', 'false']).optional(),
    TRUST_PROXY: z.enum(['true', 'false']).default('false'),
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
  mailDir: string;
  startFakes: boolean;
  trustProxy: boolean;
  rateLimits: boolean;
  /** Run background jobs (daily reminders) in this process. */
  jobs: boolean;
  /** The studio's time zone: daily jobs run by its clock, and "once a day" counts its days. */
  timeZone: string;
  root: string;
}

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
    mailDir: env.MAIL_DIR ? path.resolve(root, env.MAIL_DIR) : path.join(storageDir, 'mail'),
    startFakes: env.START_FAKES ? env.START_FAKES === 'true' : env.NODE_ENV !== 'production',
    trustProxy: env.TRUST_PROXY === 'true',
    rateLimits: env.RATE_LIMITS ? env.RATE_LIMITS === 'on' : env.NODE_ENV !== 'test',
    jobs: env.JOBS ? env.JOBS === 'on' : env.NODE_ENV !== 'test',
    timeZone: env.TIME_ZONE,
    root,
  };
}
