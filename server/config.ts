import path from 'node:path';

/** Runtime settings, read once from the environment. Every value has a working default. */
export interface ServerConfig {
  port: number;
  host: string;
  databasePath: string;
  publicUrl: string;
  /** Other origins allowed to call the API with cookies (e.g. the Expo dev server). */
  extraAppOrigins: string[];
  webRoot: string;
  logLevel: string;
  mail: MailConfig;
  signInLimits: { perIpPer15Min: number; perAccountPer15Min: number };
  seedDemoData: boolean;
  jobs: { threads: number; timeLimitMs: number };
  bodyLimit: string;
}

export interface MailConfig {
  /** Start the built-in SMTP fake that captures every message into the database. */
  startFake: boolean;
  smtpHost: string;
  smtpPort: number;
  smtpSecure: boolean;
  smtpUser?: string;
  smtpPassword?: string;
  from: string;
}

function intFrom(value: string | undefined, fallback: number): number {
  if (value === undefined || value === '') return fallback;
  const parsed = Number.parseInt(value, 10);
  if (!Number.isFinite(parsed)) throw new Error(`Expected an integer, got "${value}"`);
  return parsed;
}

function boolFrom(value: string | undefined, fallback: boolean): boolean {
  if (value === undefined || value === '') return fallback;
  return ['1', 'true', 'yes', 'on'].includes(value.toLowerCase());
}

export function loadConfig(env: Record<string, string | undefined> = process.env): ServerConfig {
  const port = intFrom(env.PORT, 8080);
  const host = env.HOST ?? '127.0.0.1';
  const publicUrl = (env.PUBLIC_URL ?? `http://localhost:${port}`).replace(/\/+$/, '');
  return {
    port,
    host,
    databasePath: env.DATABASE_PATH ?? path.resolve('data', 'rungbook.sqlite'),
    publicUrl,
    extraAppOrigins: (env.APP_ORIGINS ?? '').split(',').map((o) => o.trim().replace(/\/+$/, '')).filter(Boolean),
    webRoot: env.WEB_ROOT ?? path.resolve('dist'),
    logLevel: env.LOG_LEVEL ?? 'info',
    mail: {
      startFake: boolFrom(env.MAIL_FAKE, true),
      smtpHost: env.SMTP_HOST ?? '127.0.0.1',
      smtpPort: intFrom(env.SMTP_PORT, 2525),
      smtpSecure: boolFrom(env.SMTP_SECURE, false),
      smtpUser: env.SMTP_USER || undefined,
      smtpPassword: env.SMTP_PASSWORD || undefined,
      from: env.MAIL_FROM ?? 'Rungbook <no-reply@rungbook.example>',
    },
    signInLimits: {
      perIpPer15Min: intFrom(env.SIGNIN_LIMIT_PER_IP, 30),
      perAccountPer15Min: intFrom(env.SIGNIN_LIMIT_PER_ACCOUNT, 8),
    },
    seedDemoData: boolFrom(env.SEED_DEMO_DATA, true),
    jobs: { threads: Math.max(1, intFrom(env.JOB_THREADS, 2)), timeLimitMs: intFrom(env.JOB_TIME_LIMIT_MS, 120_000) },
    bodyLimit: env.BODY_LIMIT ?? '100kb',
  };
}
