import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { parseEnv } from 'node:util';
import { z } from 'zod';
import { ROOT_DIR, resolveFromRoot } from './paths';
import { isPlaceholderSecret, signingSecretProblem } from './security/secretStrength';

const port = (fallback: number) => z.coerce.number().int().min(1).max(65535).default(fallback);
const positiveInt = (fallback: number) => z.coerce.number().int().positive().default(fallback);
/** `host:port[,host:port…]` (host names, IPv4, or [IPv6]). */
const NODE_LIST = /^\s*(?:[A-Za-z0-9.-]+|\[[0-9A-Fa-f:]+\]):\d{1,5}\s*(?:,\s*(?:[A-Za-z0-9.-]+|\[[0-9A-Fa-f:]+\]):\d{1,5}\s*)*$/;

/** One database server address. */
export type DbNode = { host: string; port: number };

/** Parses `host:port,host:port` (already checked against NODE_LIST). */
export function parseNodeList(raw: string): DbNode[] {
  return raw
    .split(',')
    .map((item) => item.trim())
    .filter(Boolean)
    .map((item) => {
      const colon = item.lastIndexOf(':');
      return { host: item.slice(0, colon).replace(/^\[|\]$/g, ''), port: Number(item.slice(colon + 1)) };
    });
}

/**
 * Every environment variable the server reads. `.env.example` documents each one;
 * keep the two in step.
 */
const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).optional(),
  HOST: z.string().min(1).default('127.0.0.1'),
  PORT: port(5180),
  APP_URL: z.url({ protocol: /^https?$/, message: 'must be an http(s) URL such as http://127.0.0.1:5180' }).optional(),
  DB_HOST: z.string().min(1).default('127.0.0.1'),
  DB_PORT: port(3407),
  DB_NAME: z
    .string()
    .regex(/^[A-Za-z0-9_]{1,64}$/, 'letters, digits and _ only')
    .default('gantrywright'),
  DB_USER: z
    .string()
    .regex(/^[A-Za-z0-9_]{1,32}$/, 'letters, digits and _ only')
    .default('gantry'),
  DB_PASSWORD: z
    .string({ message: 'is required (npm start writes one into .env)' })
    .min(8, 'must be at least 8 characters')
    .refine((v) => !isPlaceholderSecret(v), 'is a placeholder from .env.example, which anyone can read; set a random value'),
  /** The account that owns the schema: migrations and seeders run as it; the server never uses it. */
  DB_OWNER_USER: z
    .string()
    .regex(/^[A-Za-z0-9_]{1,32}$/, 'letters, digits and _ only')
    .default('gantry_owner'),
  DB_OWNER_PASSWORD: z
    .string()
    .min(8, 'must be at least 8 characters')
    .refine((v) => !isPlaceholderSecret(v), 'is a placeholder from .env.example, which anyone can read; set a random value')
    .optional(),
  DB_POOL_MAX: positiveInt(10),
  DB_NODES: z.string().regex(NODE_LIST, 'a comma-separated list of host:port, e.g. 10.0.0.1:3306,10.0.0.2:3306').optional(),
  DB_READ_REPLICAS: z.string().regex(NODE_LIST, 'a comma-separated list of host:port, e.g. 10.0.0.2:3306,10.0.0.3:3306').optional(),
  DB_SYNC_WAIT: z.coerce.number().int().min(0).max(15).default(1),
  DB_RETRY_ATTEMPTS: z.coerce.number().int().min(1).max(20).default(6),
  JWT_SECRET: z.string({ message: 'is required (npm start writes a random one into .env)' }).superRefine((value, ctx) => {
    const problem = signingSecretProblem(value);
    if (problem) ctx.addIssue({ code: 'custom', message: problem });
  }),
  SESSION_HOURS: z.coerce
    .number()
    .positive()
    .max(24 * 30)
    .default(12),
  SMTP_HOST: z.string().min(1).default('127.0.0.1'),
  SMTP_PORT: port(2526),
  SMTP_SECURE: z
    .enum(['true', 'false'])
    .default('false')
    .transform((v) => v === 'true'),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  MAILCATCHER_HTTP_PORT: port(2527),
  MAIL_FROM: z.string().min(3).default('Gantrywright <noreply@example.test>'),
  MAIL_WORKER_INTERVAL_SECONDS: z.coerce.number().int().min(1).max(3600).default(30),
  MAIL_CLAIM_SECONDS: z.coerce.number().int().min(70, 'must be at least 70 (longer than the longest SMTP send)').max(3600).default(120),
  DATA_DIR: z.string().min(1).default('.data'),
  UPLOAD_DIR: z.string().min(1).optional(),
  LOGIN_RATE_LIMIT: positiveInt(10),
  LOGIN_RATE_WINDOW_MINUTES: positiveInt(15),
  LOGIN_IP_RATE_LIMIT: positiveInt(50),
  RESET_RATE_LIMIT: positiveInt(3),
  RESET_IP_RATE_LIMIT: positiveInt(20),
  RESET_RATE_WINDOW_MINUTES: positiveInt(60),
  TRUST_PROXY: z.string().optional(),
  STORAGE: z.enum(['local', 's3']).default('local'),
  S3_ENDPOINT: z.url({ protocol: /^https?$/, message: 'must be an http(s) URL such as http://127.0.0.1:4650' }).optional(),
  S3_REGION: z.string().min(1).default('us-east-1'),
  S3_BUCKET: z
    .string()
    .regex(/^[a-z0-9][a-z0-9.-]{1,61}[a-z0-9]$/, '3 to 63 lower-case letters, digits, dots and hyphens')
    .optional(),
  S3_PREFIX: z
    .string()
    .regex(/^[A-Za-z0-9!_.*'()/-]{0,200}$/, "letters, digits and !_.*'()/- only")
    .optional(),
  S3_ACCESS_KEY_ID: z.string().optional(),
  S3_SECRET_ACCESS_KEY: z.string().optional(),
  S3_FORCE_PATH_STYLE: z.enum(['true', 'false']).optional(),
  /**
   * Worker threads for the engine (POST /api/calc, saves, revision freezing); default: one per core. The threads run
   * at a lower scheduling priority than the event loop (WORKER_NICE), so the event loop does not need a core kept free.
   */
  ENGINE_THREADS: z.coerce.number().int().min(1).max(64).optional(),
  /** Worker threads that render design sheets (PDF). */
  PDF_THREADS: positiveInt(1),
  /**
   * Niceness of the engine and PDF worker threads (Linux: per thread; 0 = same as the event loop). With 10 the
   * event loop gets a core first whenever it has work, so short requests never wait behind the engine.
   */
  WORKER_NICE: z.coerce.number().int().min(0).max(19).default(10),
});

/** The validated, typed configuration. Paths are absolute. */
export type AppConfig = {
  nodeEnv: 'development' | 'test' | 'production';
  isProduction: boolean;
  isTest: boolean;
  logLevel: string;
  host: string;
  port: number;
  appUrl: string;
  db: {
    host: string;
    port: number;
    name: string;
    user: string;
    password: string;
    poolMax: number;
    /**
     * Servers that all accept writes (a Galera cluster), in the order this process tries them; one entry
     * (DB_HOST:DB_PORT) when DB_NODES is not set.
     */
    nodes?: DbNode[];
    /** Read replicas of a primary (DB_HOST:DB_PORT): reads outside transactions go there. Empty: none. */
    readReplicas?: DbNode[];
    /** `wsrep_sync_wait` for every connection to a Galera node (1 = reads see every write committed before them). */
    syncWait?: number;
    /** Attempts of a transaction (or statement) that hit a write conflict or lost its server. */
    retryAttempts?: number;
  };
  /**
   * The schema owner's account (migrations, seeders), or null when DB_OWNER_PASSWORD is not set: then migrations run
   * as DB_USER, which must then hold the DDL rights itself.
   */
  dbOwner: { user: string; password: string } | null;
  jwtSecret: string;
  sessionHours: number;
  smtp: { host: string; port: number; secure: boolean; user?: string; password?: string };
  mailcatcherHttpPort: number;
  mailFrom: string;
  /** How often each process looks for queued mail that is due [ms]. */
  mailWorkerIntervalMs: number;
  /** How long a sender holds claimed mail before another may take it over [ms]. */
  mailClaimMs: number;
  dataDir: string;
  uploadDir: string;
  loginRateLimit: number;
  loginRateWindowMinutes: number;
  /** Failed sign-ins per client IP within the window, whatever the e-mail. */
  loginIpRateLimit: number;
  /** Password-reset requests per e-mail address, and per client IP, within `resetRateWindowMinutes`. */
  resetRateLimit: number;
  resetIpRateLimit: number;
  resetRateWindowMinutes: number;
  /** Express `trust proxy` setting: false, a hop count or a list of addresses. */
  trustProxy: boolean | number | string;
  /** Where uploads and design sheets are stored: a local folder (`uploadDir`) or an S3-compatible bucket. */
  storage: StorageConfig;
  /** Sizes of the worker-thread pools (server/workers/pool.ts). */
  workers: { engineThreads: number; pdfThreads: number; nice: number };
  version: string;
};

/** The content store's back end (see server/storage). */
export type StorageConfig =
  | { kind: 'local' }
  | {
      kind: 's3';
      endpoint?: string;
      region: string;
      bucket: string;
      prefix: string;
      forcePathStyle: boolean;
      credentials?: { accessKeyId: string; secretAccessKey: string };
    };

/** Thrown when the environment is invalid; the message names every bad variable. */
export class ConfigError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'ConfigError';
  }
}

function readVersion(): string {
  try {
    const pkg = JSON.parse(fs.readFileSync(path.join(ROOT_DIR, 'package.json'), 'utf8')) as { version?: string };
    return pkg.version ?? '0.0.0';
  } catch {
    return '0.0.0';
  }
}

function parseTrustProxy(raw: string | undefined): boolean | number | string {
  if (raw === undefined || raw === '' || raw === 'false') return false;
  if (raw === 'true') return true;
  if (/^\d+$/.test(raw)) return Number(raw);
  return raw;
}

/**
 * Parses and validates an environment object. Pure apart from reading package.json's version.
 * @throws ConfigError naming each invalid variable and what is wrong with it.
 */
export function loadConfig(env: NodeJS.ProcessEnv = process.env): AppConfig {
  // Empty strings in .env mean "not set", so defaults apply.
  const cleaned = Object.fromEntries(Object.entries(env).filter(([, v]) => v !== undefined && v !== ''));
  const parsed = envSchema.safeParse(cleaned);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((issue) => `  ${issue.path.join('.') || '(env)'}: ${issue.message}`);
    throw new ConfigError(`Invalid configuration (environment or .env):\n${lines.join('\n')}`);
  }
  const e = parsed.data;
  const dataDir = resolveFromRoot(e.DATA_DIR);
  const storageProblems: string[] = [];
  if (e.STORAGE === 's3' && !e.S3_BUCKET) storageProblems.push('  S3_BUCKET: is required when STORAGE=s3');
  if (!!e.S3_ACCESS_KEY_ID !== !!e.S3_SECRET_ACCESS_KEY)
    storageProblems.push('  S3_ACCESS_KEY_ID / S3_SECRET_ACCESS_KEY: set both or neither');
  if (storageProblems.length) throw new ConfigError(`Invalid configuration (environment or .env):\n${storageProblems.join('\n')}`);
  const storage: StorageConfig =
    e.STORAGE === 's3'
      ? {
          kind: 's3',
          endpoint: e.S3_ENDPOINT,
          region: e.S3_REGION,
          bucket: e.S3_BUCKET!,
          prefix: (e.S3_PREFIX ?? '').replace(/^\/+|\/+$/g, ''),
          // A custom endpoint (MinIO, a fake S3, most S3-compatible stores) usually wants path-style addresses.
          forcePathStyle: e.S3_FORCE_PATH_STYLE ? e.S3_FORCE_PATH_STYLE === 'true' : !!e.S3_ENDPOINT,
          credentials:
            e.S3_ACCESS_KEY_ID && e.S3_SECRET_ACCESS_KEY
              ? { accessKeyId: e.S3_ACCESS_KEY_ID, secretAccessKey: e.S3_SECRET_ACCESS_KEY }
              : undefined,
        }
      : { kind: 'local' };
  const nodes = e.DB_NODES ? parseNodeList(e.DB_NODES) : [{ host: e.DB_HOST, port: e.DB_PORT }];
  return {
    nodeEnv: e.NODE_ENV,
    isProduction: e.NODE_ENV === 'production',
    isTest: e.NODE_ENV === 'test',
    logLevel: e.LOG_LEVEL ?? (e.NODE_ENV === 'test' ? 'silent' : 'info'),
    host: e.HOST,
    port: e.PORT,
    appUrl: (e.APP_URL ?? `http://127.0.0.1:${e.PORT}`).replace(/\/+$/, ''),
    db: {
      host: nodes[0].host,
      port: nodes[0].port,
      name: e.DB_NAME,
      user: e.DB_USER,
      password: e.DB_PASSWORD,
      poolMax: e.DB_POOL_MAX,
      nodes,
      readReplicas: e.DB_READ_REPLICAS ? parseNodeList(e.DB_READ_REPLICAS) : [],
      syncWait: e.DB_SYNC_WAIT,
      retryAttempts: e.DB_RETRY_ATTEMPTS,
    },
    dbOwner: e.DB_OWNER_PASSWORD ? { user: e.DB_OWNER_USER, password: e.DB_OWNER_PASSWORD } : null,
    jwtSecret: e.JWT_SECRET,
    sessionHours: e.SESSION_HOURS,
    smtp: { host: e.SMTP_HOST, port: e.SMTP_PORT, secure: e.SMTP_SECURE, user: e.SMTP_USER, password: e.SMTP_PASSWORD },
    mailcatcherHttpPort: e.MAILCATCHER_HTTP_PORT,
    mailFrom: e.MAIL_FROM,
    mailWorkerIntervalMs: e.MAIL_WORKER_INTERVAL_SECONDS * 1000,
    mailClaimMs: e.MAIL_CLAIM_SECONDS * 1000,
    dataDir,
    uploadDir: e.UPLOAD_DIR ? resolveFromRoot(e.UPLOAD_DIR) : path.join(dataDir, 'uploads'),
    loginRateLimit: e.LOGIN_RATE_LIMIT,
    loginRateWindowMinutes: e.LOGIN_RATE_WINDOW_MINUTES,
    loginIpRateLimit: e.LOGIN_IP_RATE_LIMIT,
    resetRateLimit: e.RESET_RATE_LIMIT,
    resetIpRateLimit: e.RESET_IP_RATE_LIMIT,
    resetRateWindowMinutes: e.RESET_RATE_WINDOW_MINUTES,
    trustProxy: parseTrustProxy(e.TRUST_PROXY),
    storage,
    workers: { engineThreads: e.ENGINE_THREADS ?? os.availableParallelism(), pdfThreads: Math.min(e.PDF_THREADS, 8), nice: e.WORKER_NICE },
    version: readVersion(),
  };
}

let cached: AppConfig | undefined;

/** The process-wide configuration, parsed from process.env on first use. */
export function getConfig(): AppConfig {
  cached ??= loadConfig(process.env);
  return cached;
}

/** Forgets the cached configuration (tests that change process.env call this). */
export function resetConfigCache(): void {
  cached = undefined;
}

/**
 * Reads `.env` (if present) into process.env without overriding variables that are already set,
 * so the real environment always wins. Tests never call this: scripts/test.ts sets their environment.
 * @returns the variables found in the file.
 */
export function loadDotEnv(file = path.join(ROOT_DIR, '.env')): Record<string, string> {
  if (!fs.existsSync(file)) return {};
  const values = parseEnv(fs.readFileSync(file, 'utf8')) as Record<string, string>;
  for (const [key, value] of Object.entries(values)) {
    if (process.env[key] === undefined) process.env[key] = value;
  }
  return values;
}
