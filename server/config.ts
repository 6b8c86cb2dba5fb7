import { availableParallelism } from 'node:os';
import { resolve } from 'node:path';
import { z } from 'zod';

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
  SIGN_IN_LIMIT_PER_15_MIN: z.coerce.number().int().positive().default(20),
  UPLOAD_LIMIT_WAVEFORM_MB: z.coerce.number().positive().default(512),
  UPLOAD_LIMIT_OTHER_MB: z.coerce.number().positive().default(25),
  WEB_CONCURRENCY: z.coerce.number().int().min(1).max(64).optional(),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
});

export interface Config {
  production: boolean;
  port: number;
  host: string;
  dataDir: string;
  webDir: string;
  publicUrl: string | null;
  organisation: string;
  seedDemo: boolean;
  smtp: { url: string | null; from: string; fakePort: number };
  signing: { p12Path: string | null; p12Password: string | null };
  signInLimitPer15Min: number;
  uploadLimits: { waveformBytes: number; otherBytes: number };
  logLevel: z.infer<typeof envSchema>['LOG_LEVEL'];
  /** HTTP worker processes (WEB_CONCURRENCY, default one per CPU). */
  webConcurrency: number;
}

/** Reads and validates the environment once; refuses to start a production server without real mail and signing. */
export function loadConfig(env: Record<string, string | undefined> = process.env, overrides: Partial<Config> = {}): Config {
  const parsed = envSchema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ');
    throw new Error(`Invalid configuration: ${lines}`);
  }
  const e = parsed.data;
  const production = e.NODE_ENV === 'production';
  const config: Config = {
    production,
    port: e.PORT,
    host: e.HOST,
    dataDir: resolve(e.VOLTFALL_DATA_DIR),
    webDir: resolve(e.VOLTFALL_WEB_DIR),
    publicUrl: e.VOLTFALL_PUBLIC_URL ?? null,
    organisation: e.VOLTFALL_ORGANISATION,
    seedDemo: !production && (env.VOLTFALL_SEED_DEMO === undefined ? true : e.VOLTFALL_SEED_DEMO),
    smtp: { url: e.SMTP_URL ?? null, from: e.SMTP_FROM, fakePort: e.FAKE_SMTP_PORT },
    signing: { p12Path: e.SIGNING_P12_PATH ?? null, p12Password: e.SIGNING_P12_PASSWORD ?? null },
    signInLimitPer15Min: e.SIGN_IN_LIMIT_PER_15_MIN,
    uploadLimits: {
      waveformBytes: Math.round(e.UPLOAD_LIMIT_WAVEFORM_MB * 1024 * 1024),
      otherBytes: Math.round(e.UPLOAD_LIMIT_OTHER_MB * 1024 * 1024),
    },
    logLevel: e.LOG_LEVEL,
    webConcurrency: e.WEB_CONCURRENCY ?? availableParallelism(),
    ...overrides,
  };
  if (config.production) {
    const missing = [
      !config.smtp.url && 'SMTP_URL',
      !config.signing.p12Path && 'SIGNING_P12_PATH',
      !config.signing.p12Password && 'SIGNING_P12_PASSWORD',
      !config.publicUrl && 'VOLTFALL_PUBLIC_URL',
    ].filter(Boolean);
    if (missing.length) {
      throw new Error(`Production needs real mail and signing settings; missing: ${missing.join(', ')}`);
    }
  }
  return config;
}
