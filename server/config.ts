import path from 'node:path';

/** Runtime settings, read once from the environment. Every value has a working default. */
export interface ServerConfig {
  /** NODE_ENV=production: safe defaults (no demo data, no mail fake, SMTP required). */
  production: boolean;
  port: number;
  host: string;
  databasePath: string;
  /** DATABASE_URL=postgres://…: PostgreSQL through the same entities and migrations; unset keeps the SQLite file. */
  databaseUrl?: string;
  /** JOB_QUEUE_URL=redis://…: jobs go to a BullMQ queue served by `npm run worker` processes; live updates and rate limits are shared through Redis. */
  jobQueueUrl?: string;
  publicUrl: string;
  /** Other origins allowed to call the API with cookies (e.g. the Expo dev server). */
  extraAppOrigins: string[];
  webRoot: string;
  logLevel: string;
  mail: MailConfig;
  signInLimits: { perIpPer15Min: number; perAccountPer15Min: number };
  /**
   * A start that only this machine can reach and that is not production (HOST and PUBLIC_URL on loopback,
   * no proxy in front): the demo site admin with its published password and the captured-mail reader
   * exist only then.
   */
  localOnly: boolean;
  /** Sign-up, forgot-password and reset requests per source per 15 minutes; people one person may add to groups per hour. */
  authLimits: { signUpPerIpPer15Min: number; forgotPerIpPer15Min: number; resetPerIpPer15Min: number; groupAddsPerUserPerHour: number; versionSavesPerUserPerHour: number; invitationsPerSenderPerHour: number; mentionMailsPerSenderPerHour: number; sharedLinkOpensPerIpPer15Min: number; datasetUploadsPerUserPerHour: number };
  /** Express 'trust proxy' setting: false (default) ignores X-Forwarded-* headers. */
  trustProxy: boolean | number | string;
  seedDemoData: boolean;
  /** Production demo seed only: the password every demo person gets (unset = random, unknown to anyone). */
  demoPassword?: string;
  jobs: JobQueueConfig;
  /** LaTeX exports and version comparisons that may wait for a document thread; more are refused (429). */
  documentQueueLimit: number;
  bodyLimit: string;
  /** Largest exchange file POST /notebooks/import reads (it carries its datasets' points); read only for a signed-in, same-origin request. */
  importBodyLimit: string;
  /** Largest body of a pasted table (DATASET_LIMITS.maxPastedChars characters, up to 4 bytes each in UTF-8, plus JSON escapes). */
  pastedBodyLimit: string;
  /** Largest body of POST /calc (a kinks or compare job carries up to DATASET_LIMITS.maxComparedPoints points). */
  calcBodyLimit: string;
  /** Dataset uploads being read at once, server-wide (each buffers up to DATASET_LIMITS.maxFileBytes); more get 429. */
  uploadsInFlight: number;
}

export interface JobQueueConfig {
  threads: number;
  /** Engine time allowed per job. */
  timeLimitMs: number;
  /** Jobs one person may have waiting in the queue (not yet running). */
  perUserQueued: number;
  /** Jobs of one person that may run at the same time. */
  perUserRunning: number;
  /** How long a job may wait in the queue before it is given up. */
  queueWaitLimitMs: number;
}

export interface MailConfig {
  /** Start the built-in SMTP fake that captures every message into the database. */
  startFake: boolean;
  smtpHost: string;
  smtpPort: number;
  smtpSecure: boolean;
  smtpUser?: string;
  smtpPassword?: string;
  /** A real relay must upgrade to TLS (STARTTLS) unless SMTP_REQUIRE_TLS=false: credentials and sign-in links never travel in clear. */
  requireTls: boolean;
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

/** TRUST_PROXY: unset/false = trust no proxy; true; a hop count; or an address list such as 'loopback, 10.0.0.0/8'. */
function trustProxyFrom(value: string | undefined): boolean | number | string {
  if (value === undefined || value === '' || ['0', 'false', 'no', 'off'].includes(value.toLowerCase())) return false;
  if (['true', 'yes', 'on'].includes(value.toLowerCase())) return true;
  if (/^\d+$/.test(value)) return Number(value);
  return value;
}

export class ConfigError extends Error {}

function isLoopback(host: string): boolean {
  return host === 'localhost' || host === '::1' || host === '[::1]' || /^127\.\d+\.\d+\.\d+$/.test(host);
}

export function loadConfig(env: Record<string, string | undefined> = process.env): ServerConfig {
  const production = env.NODE_ENV === 'production';
  const port = intFrom(env.PORT, 8080);
  const host = env.HOST ?? '127.0.0.1';
  const publicUrl = (env.PUBLIC_URL ?? `http://localhost:${port}`).replace(/\/+$/, '');
  const threads = Math.max(1, intFrom(env.JOB_THREADS, 2));
  const config: ServerConfig = {
    production,
    localOnly: !production && isLoopback(host) && isLoopback(new URL(publicUrl).hostname) && trustProxyFrom(env.TRUST_PROXY) === false,
    port,
    host,
    databasePath: env.DATABASE_PATH ?? path.resolve('data', 'rungbook.sqlite'),
    databaseUrl: env.DATABASE_URL || undefined,
    jobQueueUrl: env.JOB_QUEUE_URL || undefined,
    publicUrl,
    extraAppOrigins: (env.APP_ORIGINS ?? '').split(',').map((o) => o.trim().replace(/\/+$/, '')).filter(Boolean),
    webRoot: env.WEB_ROOT ?? path.resolve('dist'),
    logLevel: env.LOG_LEVEL ?? 'info',
    mail: {
      startFake: boolFrom(env.MAIL_FAKE, !production),
      smtpHost: env.SMTP_HOST ?? '127.0.0.1',
      smtpPort: intFrom(env.SMTP_PORT, 2525),
      smtpSecure: boolFrom(env.SMTP_SECURE, false),
      smtpUser: env.SMTP_USER || undefined,
      smtpPassword: env.SMTP_PASSWORD || undefined,
      requireTls: boolFrom(env.SMTP_REQUIRE_TLS, true),
      from: env.MAIL_FROM ?? 'Rungbook <no-reply@rungbook.example>',
    },
    signInLimits: {
      perIpPer15Min: intFrom(env.SIGNIN_LIMIT_PER_IP, 30),
      perAccountPer15Min: intFrom(env.SIGNIN_LIMIT_PER_ACCOUNT, 8),
    },
    authLimits: {
      signUpPerIpPer15Min: intFrom(env.SIGNUP_LIMIT_PER_IP, 10),
      forgotPerIpPer15Min: intFrom(env.FORGOT_LIMIT_PER_IP, 10),
      resetPerIpPer15Min: intFrom(env.RESET_LIMIT_PER_IP, 20),
      groupAddsPerUserPerHour: intFrom(env.GROUP_ADD_LIMIT_PER_USER, 30),
      // each version may hold megabytes of results
      versionSavesPerUserPerHour: Math.max(1, intFrom(env.VERSION_SAVE_LIMIT_PER_USER, 60)),
      // sharing and invitation e-mails a person may cause per hour (to accounts and to new addresses alike)
      invitationsPerSenderPerHour: Math.max(1, intFrom(env.INVITE_LIMIT_PER_USER, 30)),
      mentionMailsPerSenderPerHour: Math.max(1, intFrom(env.MENTION_MAIL_LIMIT_PER_USER, 60)),
      // every request through a share link (notebook, comments, live stream) counts: slows token guessing
      sharedLinkOpensPerIpPer15Min: Math.max(1, intFrom(env.SHARED_LINK_LIMIT_PER_IP, 300)),
      // each upload may be 10 MB of table read in the document pool
      datasetUploadsPerUserPerHour: Math.max(1, intFrom(env.DATASET_UPLOAD_LIMIT_PER_USER, 60)),
    },
    trustProxy: trustProxyFrom(env.TRUST_PROXY),
    seedDemoData: boolFrom(env.SEED_DEMO_DATA, !production),
    demoPassword: env.DEMO_PASSWORD || undefined,
    jobs: {
      threads,
      timeLimitMs: intFrom(env.JOB_TIME_LIMIT_MS, 120_000),
      perUserQueued: Math.max(1, intFrom(env.JOB_QUEUE_PER_USER, 8)),
      // One person alone may use every thread; with others waiting, free threads go to them in turn.
      perUserRunning: Math.max(1, intFrom(env.JOB_RUNNING_PER_USER, threads)),
      queueWaitLimitMs: intFrom(env.JOB_QUEUE_WAIT_LIMIT_MS, 600_000),
    },
    documentQueueLimit: Math.max(0, intFrom(env.DOCUMENT_QUEUE_LIMIT, 16)),
    bodyLimit: env.BODY_LIMIT ?? '100kb',
    importBodyLimit: env.IMPORT_BODY_LIMIT ?? '12mb',
    pastedBodyLimit: env.PASTED_BODY_LIMIT ?? '1mb',
    calcBodyLimit: env.CALC_BODY_LIMIT ?? '1mb',
    uploadsInFlight: Math.max(1, intFrom(env.UPLOADS_IN_FLIGHT, 4)),
  };
  if (production && config.trustProxy === true) {
    throw new ConfigError(
      'TRUST_PROXY=true would believe any X-Forwarded-For a client sends (and so every rate limit could be dodged): give the number of proxies in front of Rungbook (e.g. TRUST_PROXY=1) or their addresses (e.g. TRUST_PROXY=10.0.0.5).',
    );
  }
  if (production && !config.mail.startFake && !env.SMTP_HOST) {
    throw new ConfigError(
      'NODE_ENV=production sends real e-mail (sign-up verification, password resets): set SMTP_HOST (and SMTP_PORT, SMTP_USER, SMTP_PASSWORD, SMTP_SECURE as your relay needs), or MAIL_FAKE=true to capture mail locally.',
    );
  }
  return config;
}
