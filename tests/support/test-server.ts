// Starts the real server in-process on a fresh data folder: a real SQLite file, the real local SMTP
// fake on a free loopback port, the real mail sender.
import { mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import supertest from 'supertest';
import { loadConfig, type Config } from '../../server/config';
import { DEMO_PASSWORD, DEMO_USERS } from '../../server/db/seed';
import { openContentStore, type ContentKind, type ContentStore } from '../../server/evidence/storage';
import { startServer, type RunningServer, type StartOptions } from '../../server/server';
import { demoRequirement } from './fixtures';
import { createDatabase, startPostgres, type PostgresServer } from './postgres';
import { createBucket, s3Env, startS3, type S3Server } from './s3';

/** VOLTFALL_TEST_BACKEND=pg-s3: PostgreSQL and a bucket instead of the SQLite file and the evidence folder. */
export const TEST_BACKEND = process.env.VOLTFALL_TEST_BACKEND === 'pg-s3' ? 'pg-s3' : 'sqlite';

// One PostgreSQL and one S3 server per test file (each vitest worker), started on first use.
let backends: Promise<{ pg: PostgresServer; s3: S3Server }> | null = null;

/** The environment of a server on the pg-s3 back end: its own database and bucket, named after its data folder. */
async function backendEnv(dataDir: string): Promise<Record<string, string>> {
  if (TEST_BACKEND === 'sqlite') return {};
  backends ??= Promise.all([startPostgres(), startS3()]).then(([pg, s3]) => {
    process.once('exit', () => void pg.stop());
    return { pg, s3 };
  });
  const { pg, s3 } = await backends;
  const name = `vf-${dataDir
    .split('/')
    .pop()!
    .toLowerCase()
    .replace(/[^a-z0-9]/g, '')}`.slice(0, 60);
  await createDatabase(pg, name).catch((err: { code?: string }) => {
    if (err.code !== '42P04') throw err; // a restart on the same data folder keeps its database
  });
  await createBucket(s3.endpoint, name).catch(() => undefined);
  return { DATABASE_URL: pg.urlOf(name), ...s3Env(s3.endpoint, name) };
}

export type DemoRole = 'admin' | 'engineer' | 'engineer2' | 'reviewer' | 'viewer';

export const demoEmail = (role: DemoRole) => `${role}@fennel.test`;

export interface TestServer extends RunningServer {
  dataDir: string;
  /** The server's content stores (its evidence folder or bucket), as the server opens them. */
  stores: Record<ContentKind, ContentStore>;
  /** SHA-256 names of the objects stored in one store (folder or bucket alike). */
  storedFiles(kind: ContentKind): Promise<string[]>;
  /**
   * Temporary files of this process's uploads and signings in progress in one store's staging folder
   * (the S3 store stages in the system's temp folder, which test files in other workers share).
   */
  stagingFiles(kind: ContentKind): string[];
  /** A supertest agent holding the session cookie of a demo user; sends a same-origin Origin header. */
  signIn(role: DemoRole): Promise<supertest.Agent>;
  anonymous(): supertest.Agent;
  /** Waits until the fake SMTP server has received a message matching `predicate`. */
  waitForMail(
    predicate: (m: { to: string; subject: string; text: string; html: string | null }) => boolean,
    timeoutMs?: number,
  ): Promise<{ to: string; subject: string; text: string; html: string | null }>;
}

/** A clock the test moves by hand, so expiry is tested without sleeping. */
export class FakeClock {
  constructor(private ms = Date.now()) {}
  now(): number {
    return this.ms;
  }
  advance(ms: number): void {
    this.ms += ms;
  }
}

export interface TestServerOptions extends StartOptions {
  /** Restart on this existing data folder (kept on close); otherwise a fresh one is made and removed. */
  dataDir?: string;
}

export async function startTestServer(
  overrides: Partial<Config> = {},
  env: Record<string, string> = {},
  options: TestServerOptions = {},
): Promise<TestServer> {
  const { dataDir: existingDataDir, ...start } = options;
  const dataDir = existingDataDir ?? mkdtempSync(join(tmpdir(), 'vf-test-'));
  const config = loadConfig(
    {
      NODE_ENV: 'test',
      PORT: '0',
      HOST: '127.0.0.1',
      VOLTFALL_DATA_DIR: dataDir,
      FAKE_SMTP_PORT: '0',
      LOG_LEVEL: 'silent',
      SIGN_IN_LIMIT_PER_15_MIN: '1000',
      ...(await backendEnv(env.VOLTFALL_DATA_DIR ?? dataDir)),
      ...env,
    },
    overrides,
  );
  const running = await startServer(config, start);
  const origin = running.url;
  const agentFor = () => {
    const agent = supertest.agent(running.server);
    agent.set('Origin', origin);
    return agent;
  };
  const stores: Record<ContentKind, ContentStore> = {
    evidence: openContentStore(config, 'evidence'),
    dossiers: openContentStore(config, 'dossiers'),
  };
  return {
    ...running,
    dataDir,
    stores,
    async storedFiles(kind) {
      return (await stores[kind].list()).map((o) => o.name);
    },
    stagingFiles(kind) {
      return readdirSync(stores[kind].stagingDir).filter((f) => f.startsWith(`${process.pid}-`) && f.endsWith('.part'));
    },
    anonymous: agentFor,
    async signIn(role) {
      const agent = agentFor();
      const res = await agent.post('/api/auth/sign-in').send({ email: demoEmail(role), password: DEMO_PASSWORD });
      if (res.status !== 200) throw new Error(`sign-in as ${role} failed: ${res.status} ${JSON.stringify(res.body)}`);
      return agent;
    },
    async waitForMail(predicate, timeoutMs = 10_000) {
      const deadline = Date.now() + timeoutMs;
      while (Date.now() < deadline) {
        await running.mail.flush();
        const rows = await running.ctx.db('mail_outbox').orderBy('id');
        const hit = rows.find(predicate);
        if (hit) return hit;
        await new Promise((r) => setTimeout(r, 50));
      }
      throw new Error('expected e-mail did not arrive at the fake SMTP server');
    },
    async close() {
      await running.close();
      if (!existingDataDir) rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

export { DEMO_PASSWORD, DEMO_USERS };

/**
 * Saves a draft the way the app does: with the version it last read (for tests that are not about
 * concurrency; those send versions themselves).
 */
export async function saveDraft(agent: supertest.Agent, revisionId: number, body: Record<string, unknown>): Promise<supertest.Response> {
  const current = await agent.get(`/api/revisions/${revisionId}`);
  if (current.status !== 200) throw new Error(`reading revision ${revisionId} failed: ${current.status}`);
  return agent.patch(`/api/revisions/${revisionId}`).send({ ...body, version: current.body.version });
}

/** A fresh dossier (first product, demo requirement) and its revision 1 draft, authored by the engineer; `design` saved when given. */
export async function newDraft(
  server: TestServer,
  title: string,
  design?: Record<string, unknown>,
): Promise<{ engineer: supertest.Agent; id: number; dossierId: number }> {
  const engineer = await server.signIn('engineer');
  const products = (await engineer.get('/api/products')).body;
  const dossier = (await engineer.post('/api/dossiers').send({ productId: products[0].id, title, requirement: demoRequirement })).body;
  const id = dossier.revisions[0].id as number;
  if (design) await engineer.patch(`/api/revisions/${id}`).send({ version: 1, design });
  return { engineer, id, dossierId: dossier.id as number };
}
