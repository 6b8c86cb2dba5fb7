import { availableParallelism } from 'node:os';
import { resolve } from 'node:path';
import { z } from 'zod';
import { StartupError } from './errors';

const boolish = z
  .enum(['true', 'false', '1', '0', ''])
  .optional()
  .transform((v) => v === 'true' || v === '1');

const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  PORT: z.coerce.number().int().min(0).max(65535).default(8080),
  HOST: z.string().default('0.0.0.0'),
  VOLTFALL_DATA_DIR: z.string().default('./data'),
  VOLTFALL_PUBLIC_URL: z.string().url().optional(),
  VOLTFALL_ORGANISATION: z.string().default('Fennel Grid Labs'),
  VOLTFALL_WEB_DIR: z.string().default('./dist'),
  VOLTFALL_SEED_DEMO: boolish,
  SMTP_URL: z.string().url().optional(),
  SMTP_FROM: z.string().default('Voltfall <voltfall@fennel.test>'),
  FAKE_SMTP_PORT: z.coerce.number().int().min(0).max(65535).default(2525),
  SIGNING_P12_PATH: z.string().optional(),
  SIGNING_P12_PASSWORD: z.string().optional(),
  SIGNING_CHAIN_PATH: z.string().optional(),
  TSA_URL: z.union([z.literal('none'), z.string().url()]).optional(),
  SIGN_IN_LIMIT_PER_15_MIN: z.coerce.number().int().positive().default(20),
  SIGN_IN_FREE_FAILURES_PER_ACCOUNT: z.coerce.number().int().positive().default(5),
  TRUST_PROXY: z.string().trim().default(''),
  SESSION_ABSOLUTE_HOURS: z.coerce.number().positive().max(12, 'at most 12 hours (ASVS 3.3)').default(12),
  SESSION_IDLE_MINUTES: z.coerce.number().positive().max(720).default(30),
  SESSIONS_PER_USER: z.coerce.number().int().positive().max(100).default(5),
  SESSION_SWEEP_MINUTES: z.coerce.number().positive().default(10),
  UPLOAD_LIMIT_WAVEFORM_MB: z.coerce.number().positive().default(512),
  UPLOAD_LIMIT_OTHER_MB: z.coerce.number().positive().default(25),
  DATABASE_URL: z
    .string()
    .regex(/^postgres(ql)?:\/\//, 'a postgres:// URL (leave it unset for the SQLite file in the data folder)')
    .optional(),
  EVIDENCE_STORE: z.enum(['folder', 's3']).default('folder'),
  S3_ENDPOINT: z.string().url().optional(),
  S3_BUCKET: z.string().min(3).max(63).optional(),
  S3_REGION: z.string().default('us-east-1'),
  S3_ACCESS_KEY_ID: z.string().optional(),
  S3_SECRET_ACCESS_KEY: z.string().optional(),
  S3_FORCE_PATH_STYLE: boolish,
  SQLITE_BUSY_TIMEOUT_MS: z.coerce.number().int().min(0).max(600_000).default(5_000),
  EVIDENCE_ORPHAN_GRACE_HOURS: z.coerce.number().min(0).default(24),
  WEB_CONCURRENCY: z.coerce.number().int().min(1).max(64).optional(),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
});

export interface S3Settings {
  endpoint: string | null;
  bucket: string;
  region: string;
  accessKeyId: string | null;
  secretAccessKey: string | null;
  forcePathStyle: boolean;
}

export interface Config {
  production: boolean;
  port: number;
  host: string;
  dataDir: string;
  /** Only the default `./data` is created on a first start; a configured folder must exist. */
  createDataDir: boolean;
  webDir: string;
  publicUrl: string | null;
  organisation: string;
  seedDemo: boolean;
  smtp: { url: string | null; from: string; fakePort: number };
  signing: {
    p12Path: string | null;
    p12Password: string | null;
    /** PEM bundle of the issuing CAs and roots of the signing and time-stamping chains. */
    chainPath: string | null;
    /** RFC 3161 authority; 'none' signs without trusted time; null starts the local one (outside production). */
    tsaUrl: string | 'none' | null;
  };
  /** Failed sign-ins (or signatures) one client address may make in 15 minutes before it waits. */
  signInLimitPer15Min: number;
  /** Failures one account may have before each further attempt waits a growing delay. */
  signInFreeFailuresPerAccount: number;
  /** Express's `trust proxy`: false unless TRUST_PROXY names the proxies (hop count, addresses or subnets). */
  trustProxy: false | number | string;
  sessions: { absoluteMs: number; idleMs: number; perUser: number; sweepMs: number };
  uploadLimits: { waveformBytes: number; otherBytes: number };
  /** PostgreSQL (DATABASE_URL) instead of the SQLite file in the data folder. */
  databaseUrl: string | null;
  /** Where evidence and signed dossiers are kept: the data folder, or an S3-compatible bucket. */
  evidenceStore: { kind: 'folder' } | { kind: 's3'; s3: S3Settings };
  /** How long a write waits for another writer's lock before answering 503. */
  busyTimeoutMs: number;
  /** How long a stored file no evidence row references any more is kept before the sweep removes it. */
  orphanGraceMs: number;
  logLevel: z.infer<typeof envSchema>['LOG_LEVEL'];
  /** HTTP worker processes (WEB_CONCURRENCY, default one per CPU). */
  webConcurrency: number;
}

/**
 * TRUST_PROXY as Express takes it. Empty means the socket's address is the client, so a forged
 * X-Forwarded-For changes nothing. "true" is refused: it would believe the left-most forwarded
 * address, which any client writes.
 */
function parseTrustProxy(value: string): false | number | string {
  if (value === '' || value === 'false') return false;
  if (value === 'true') throw new Error('Invalid configuration: TRUST_PROXY: name the proxy hop count or its addresses, not "true"');
  if (/^\d+$/.test(value)) return Number(value);
  return value;
}

/** Reads and validates the environment once; refuses to start a production server without real mail and signing. */
export function loadConfig(env: Record<string, string | undefined> = process.env, overrides: Partial<Config> = {}): Config {
  const parsed = envSchema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ');
    throw new StartupError(`invalid configuration: ${lines}`);
  }
  const e = parsed.data;
  const production = e.NODE_ENV === 'production';
  const config: Config = {
    production,
    port: e.PORT,
    host: e.HOST,
    dataDir: resolve(e.VOLTFALL_DATA_DIR),
    createDataDir: env.VOLTFALL_DATA_DIR === undefined,
    webDir: resolve(e.VOLTFALL_WEB_DIR),
    publicUrl: e.VOLTFALL_PUBLIC_URL ?? null,
    organisation: e.VOLTFALL_ORGANISATION,
    seedDemo: !production && (env.VOLTFALL_SEED_DEMO === undefined ? true : e.VOLTFALL_SEED_DEMO),
    smtp: { url: e.SMTP_URL ?? null, from: e.SMTP_FROM, fakePort: e.FAKE_SMTP_PORT },
    signing: {
      p12Path: e.SIGNING_P12_PATH ?? null,
      p12Password: e.SIGNING_P12_PASSWORD ?? null,
      chainPath: e.SIGNING_CHAIN_PATH ?? null,
      tsaUrl: e.TSA_URL ?? null,
    },
    signInLimitPer15Min: e.SIGN_IN_LIMIT_PER_15_MIN,
    signInFreeFailuresPerAccount: e.SIGN_IN_FREE_FAILURES_PER_ACCOUNT,
    trustProxy: parseTrustProxy(e.TRUST_PROXY),
    sessions: {
      absoluteMs: e.SESSION_ABSOLUTE_HOURS * 3600_000,
      idleMs: e.SESSION_IDLE_MINUTES * 60_000,
      perUser: e.SESSIONS_PER_USER,
      sweepMs: e.SESSION_SWEEP_MINUTES * 60_000,
    },
    uploadLimits: {
      waveformBytes: Math.round(e.UPLOAD_LIMIT_WAVEFORM_MB * 1024 * 1024),
      otherBytes: Math.round(e.UPLOAD_LIMIT_OTHER_MB * 1024 * 1024),
    },
    databaseUrl: e.DATABASE_URL ?? null,
    evidenceStore:
      e.EVIDENCE_STORE === 's3'
        ? {
            kind: 's3',
            s3: {
              endpoint: e.S3_ENDPOINT ?? null,
              bucket: e.S3_BUCKET ?? '',
              region: e.S3_REGION,
              accessKeyId: e.S3_ACCESS_KEY_ID ?? null,
              secretAccessKey: e.S3_SECRET_ACCESS_KEY ?? null,
              forcePathStyle: e.S3_FORCE_PATH_STYLE,
            },
          }
        : { kind: 'folder' },
    busyTimeoutMs: e.SQLITE_BUSY_TIMEOUT_MS,
    orphanGraceMs: e.EVIDENCE_ORPHAN_GRACE_HOURS * 3600_000,
    logLevel: e.LOG_LEVEL,
    webConcurrency: e.WEB_CONCURRENCY ?? availableParallelism(),
    ...overrides,
  };
  if (config.evidenceStore.kind === 's3' && !config.evidenceStore.s3.bucket) {
    throw new StartupError('invalid configuration: S3_BUCKET: EVIDENCE_STORE=s3 needs the bucket name');
  }
  if (config.production) {
    const missing = [
      !config.smtp.url && 'SMTP_URL',
      !config.signing.p12Path && 'SIGNING_P12_PATH',
      !config.signing.p12Password && 'SIGNING_P12_PASSWORD',
      !config.signing.tsaUrl && 'TSA_URL (or TSA_URL=none to sign without trusted time)',
      !config.publicUrl && 'VOLTFALL_PUBLIC_URL',
    ].filter(Boolean);
    if (missing.length) {
      throw new StartupError(`production needs real mail and signing settings; missing: ${missing.join(', ')}`);
    }
  }
  return config;
}
