// Two app instances — separate processes, each with its own empty data folder — on one PostgreSQL
// database and one S3 bucket, as behind a load balancer: whatever one instance decided, the other sees;
// races between them are won once; neither keeps a database file or stored bytes on its own disk.
// Real parts throughout: PostgreSQL 15 (initdb into a temp folder), s3rver, `server/index.ts` spawned
// twice, each with its local SMTP catcher; signatures checked by poppler's pdfsig against the root the
// instances publish.
import { createHash, randomUUID } from 'node:crypto';
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openDatabase, type Db } from '../../server/db/knex';
import { openContentStore } from '../../server/evidence/storage';
import { nssDatabase } from '../pdf/signature-tools';
import { pdfsig } from '../pdf/poppler';
import { captureCsv } from '../support/captures';
import { demoDesign, demoRequirement, pendingMailRow } from '../support/fixtures';
import { createDatabase, startPostgres, type PostgresServer } from '../support/postgres';
import { createBucket, S3_KEY, s3Env, startS3, type S3Server } from '../support/s3';
import { spawnServer, type ServerProcess } from '../support/server-process';
import { DEMO_PASSWORD } from '../support/test-server';
import { sessionCookie } from '../support/uploads';

const BUCKET = 'two-instances';
const work = mkdtempSync(join(tmpdir(), 'vf-two-'));
let pg: PostgresServer;
let s3: S3Server;
let db: Db;
const dataDirs = { a: join(work, 'data-a'), b: join(work, 'data-b') };
const instances = {} as Record<'a' | 'b', ServerProcess>;
/** Every stored sha256 the run produced: none of them may be found on an instance's disk. */
const storedHashes = new Set<string>();

beforeAll(async () => {
  [pg, s3] = await Promise.all([startPostgres(), startS3()]);
  await createDatabase(pg, 'shared');
  await createBucket(s3.endpoint, BUCKET);
  const env = {
    DATABASE_URL: pg.urlOf('shared'),
    ...s3Env(s3.endpoint, BUCKET),
    WEB_CONCURRENCY: '1',
    SIGN_IN_LIMIT_PER_15_MIN: '1000',
  };
  // Both start at once on the empty database: one migrates and seeds while the other waits for it.
  for (const dir of Object.values(dataDirs)) mkdirSync(dir);
  [instances.a, instances.b] = await Promise.all([spawnServer(dataDirs.a, { env }), spawnServer(dataDirs.b, { env })]);
  db = await openDatabase(work, { url: pg.urlOf('shared'), migrate: false });
}, 180_000);

afterAll(async () => {
  await Promise.all(Object.values(instances).map((i) => i?.stop()));
  await db?.destroy();
  await Promise.all([pg?.stop(), s3?.stop()]);
  rmSync(work, { recursive: true, force: true });
});

interface Answer {
  status: number;
  body: any; // eslint-disable-line @typescript-eslint/no-explicit-any -- JSON answers of several shapes
  bytes: Buffer;
}

async function call(
  base: string,
  path: string,
  options: { method?: string; cookie?: string; json?: unknown; form?: FormData } = {},
): Promise<Answer> {
  const headers: Record<string, string> = { Origin: base };
  if (options.cookie) headers.Cookie = options.cookie;
  if (options.json !== undefined) headers['Content-Type'] = 'application/json';
  const res = await fetch(`${base}${path}`, {
    method: options.method ?? (options.json !== undefined || options.form ? 'POST' : 'GET'),
    headers,
    body: options.form ?? (options.json !== undefined ? JSON.stringify(options.json) : undefined),
  });
  const bytes = Buffer.from(await res.arrayBuffer());
  let body: unknown = null;
  if ((res.headers.get('content-type') ?? '').includes('json')) body = JSON.parse(bytes.toString('utf8'));
  return { status: res.status, body, bytes };
}

const sha256 = (bytes: Buffer) => createHash('sha256').update(bytes).digest('hex');
const url = (which: 'a' | 'b') => instances[which].url;

async function waitFor<T>(what: string, check: () => Promise<T | undefined>, timeoutMs = 30_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const got = await check();
    if (got !== undefined) return got;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

/** A dossier with a saved design, made on `where`, submitted on `submitOn`: its revision id. */
async function submittedRevision(where: 'a' | 'b', submitOn: 'a' | 'b', title: string): Promise<number> {
  const engineer = await sessionCookie(url(where), 'engineer@fennel.test');
  const products = await call(url(where), '/api/products', { cookie: engineer });
  const dossier = await call(url(where), '/api/dossiers', {
    cookie: engineer,
    json: { productId: products.body[0].id, title, requirement: demoRequirement },
  });
  expect(dossier.status).toBe(201);
  const id = dossier.body.revisions[0].id as number;
  expect(
    (await call(url(where), `/api/revisions/${id}`, { method: 'PATCH', cookie: engineer, json: { version: 1, design: demoDesign } })).status,
  ).toBe(200);
  expect((await call(url(submitOn), `/api/revisions/${id}/submit`, { cookie: engineer, json: {} })).status).toBe(200);
  return id;
}

describe('two instances on one database and one bucket', () => {
  it('when both start at once on an empty database, then it is migrated and seeded once', async () => {
    expect(Number((await db('user').count({ n: '*' }).first())?.n)).toBe(5);
    expect(instances.a.pid).not.toBe(instances.b.pid);
  });

  it('when a user signs in on one instance, then the session is valid on the other, and signing out on it ends it on both', async () => {
    const cookie = await sessionCookie(url('a'), 'engineer@fennel.test');
    const onB = await call(url('b'), '/api/auth/me', { cookie });
    expect(onB.status).toBe(200);
    expect(onB.body.email).toBe('engineer@fennel.test');
    expect((await call(url('b'), '/api/auth/sign-out', { cookie, json: {} })).status).toBeLessThan(300);
    expect((await call(url('a'), '/api/auth/me', { cookie })).status).toBe(401);
  });

  it('when evidence is uploaded to one instance, then the other serves the same bytes', async () => {
    const engineer = await sessionCookie(url('a'), 'engineer@fennel.test');
    const products = await call(url('a'), '/api/products', { cookie: engineer });
    const dossier = await call(url('a'), '/api/dossiers', {
      cookie: engineer,
      json: { productId: products.body[0].id, title: 'Evidence across instances', requirement: demoRequirement },
    });
    const revisionId = dossier.body.revisions[0].id as number;
    const capture = Buffer.from(captureCsv(1.5));
    const form = new FormData();
    form.set('kind', 'waveform');
    form.set('file', new Blob([capture], { type: 'text/csv' }), 'across.csv');
    const uploaded = await call(url('a'), `/api/revisions/${revisionId}/evidence`, { cookie: engineer, form });
    expect(uploaded.status).toBe(201);
    expect(uploaded.body.sha256).toBe(sha256(capture));
    storedHashes.add(sha256(capture));

    const served = await call(url('b'), `/api/evidence/${uploaded.body.id}/file`, { cookie: engineer });
    expect(served.status).toBe(200);
    expect(served.bytes.length).toBe(capture.length);
    expect(sha256(served.bytes)).toBe(sha256(capture));
    // B read the revision A changed: the evidence is on it, with A's analysis.
    const revision = await call(url('b'), `/api/revisions/${revisionId}`, { cookie: engineer });
    expect(revision.body.evidence.map((e: { sha256: string }) => e.sha256)).toEqual([sha256(capture)]);
  });

  it('when one approval is raced across both instances, then it is taken once (one 200, one 409) and one signed PDF exists', async () => {
    const id = await submittedRevision('a', 'b', 'Approval raced across instances');
    const reviewerA = await sessionCookie(url('a'), 'reviewer@fennel.test');
    const reviewerB = await sessionCookie(url('b'), 'reviewer@fennel.test');
    const decide = (which: 'a' | 'b', cookie: string) =>
      call(url(which), `/api/revisions/${id}/decision`, {
        cookie,
        json: { decision: 'approve', comment: 'Checked on both.', password: DEMO_PASSWORD },
      });
    const answers = await Promise.all([decide('a', reviewerA), decide('b', reviewerB)]);
    expect(answers.map((a) => a.status).sort()).toEqual([200, 409]);
    expect(answers.find((a) => a.status === 409)!.body.error.code).toBe('conflict');

    const signed = await db('signed_dossier').where({ revision_id: id });
    expect(signed).toHaveLength(1);
    expect(await db('review_decision').where({ revision_id: id })).toHaveLength(1);
    // The loser's signed PDF was thrown away before it reached the bucket.
    const dossiers = openContentStore(
      {
        dataDir: work,
        evidenceStore: {
          kind: 's3',
          s3: { endpoint: s3.endpoint, bucket: BUCKET, region: 'us-east-1', accessKeyId: S3_KEY, secretAccessKey: S3_KEY, forcePathStyle: true },
        },
      },
      'dossiers',
    );
    expect((await dossiers.list()).map((o) => o.name)).toEqual([signed[0].sha256]);
    storedHashes.add(signed[0].sha256);

    // Either instance serves the one signed file.
    for (const which of ['a', 'b'] as const) {
      const pdf = await call(url(which), `/api/revisions/${id}/dossier.pdf`, { cookie: reviewerA });
      expect(pdf.status).toBe(200);
      expect(sha256(pdf.bytes)).toBe(signed[0].sha256);
    }
  });

  it('when each instance signs a dossier, then both publish one root and both signatures validate against it with the same signer', async () => {
    const trustA = await call(url('a'), '/api/signing/trust', { cookie: await sessionCookie(url('a'), 'viewer@fennel.test') });
    const trustB = await call(url('b'), '/api/signing/trust', { cookie: await sessionCookie(url('b'), 'viewer@fennel.test') });
    expect(trustA.status).toBe(200);
    expect(trustA.bytes.toString()).toMatch(/^-----BEGIN CERTIFICATE-----/);
    expect(trustB.bytes.toString()).toBe(trustA.bytes.toString());
    const rootPem = join(work, 'root.pem');
    writeFileSync(rootPem, trustA.bytes);
    const nss = await nssDatabase(join(work, 'nss'), { 'shared development root': rootPem });

    const signers: string[] = [];
    for (const which of ['a', 'b'] as const) {
      const id = await submittedRevision(which, which, `Signed on instance ${which.toUpperCase()}`);
      const reviewer = await sessionCookie(url(which), 'reviewer@fennel.test');
      const approved = await call(url(which), `/api/revisions/${id}/decision`, {
        cookie: reviewer,
        json: { decision: 'approve', comment: `Signed on ${which}.`, password: DEMO_PASSWORD },
      });
      expect(approved.status).toBe(200);
      const pdf = await call(url(which), `/api/revisions/${id}/dossier.pdf`, { cookie: reviewer });
      storedHashes.add(sha256(pdf.bytes));
      const file = join(work, `signed-${which}.pdf`);
      writeFileSync(file, pdf.bytes);
      const out = (await pdfsig(file, nss)).stdout;
      expect(out).toContain('Signature is Valid.');
      expect(out).toContain('Certificate is Trusted.');
      signers.push(/Signer Certificate Common Name: (.*)/.exec(out)![1]);
    }
    expect(signers[0]).toBe(signers[1]);
    expect(await db('dev_pki')).toHaveLength(1);
  });

  it('when failed sign-ins are split across the instances, then together they reach the account limit on both', async () => {
    const attempt = (which: 'a' | 'b', password: string) =>
      call(url(which), '/api/auth/sign-in', { json: { email: 'viewer@fennel.test', password } }).then((r) => r.status);
    // Five free failures an account (SIGN_IN_FREE_FAILURES_PER_ACCOUNT's default): three here, two there.
    const statuses = [];
    for (const which of ['a', 'b', 'a', 'b', 'a'] as const) statuses.push(await attempt(which, 'wrong-password'));
    expect(statuses).toEqual([401, 401, 401, 401, 401]);
    expect(await attempt('b', DEMO_PASSWORD)).toBe(429);
    expect(await attempt('a', DEMO_PASSWORD)).toBe(429);
  });

  it('when both instances deliver from one queue at once, then every message goes out once, a dead claimant’s included', async () => {
    const now = new Date().toISOString();
    const tag = randomUUID().slice(0, 8);
    const rows = Array.from({ length: 20 }, (_, i) => pendingMailRow(`Queue race ${tag} #${i}`, now));
    // One more, claimed by an instance that died: its claim ran out a minute ago.
    rows.push({ ...rows[0], subject: `Queue race ${tag} #dead-claimant` });
    await db('mail_queue').insert(rows.slice(0, 20));
    await db('mail_queue').insert({ ...rows[20], claimed_by: 'gone-host/1/dead', claimed_until: new Date(Date.now() - 60_000).toISOString() });
    // A reset request on each instance at the same moment: each queues a message and kicks its own sender.
    await Promise.all(
      (['a', 'b'] as const).map((which) => call(url(which), '/api/auth/forgot-password', { json: { email: 'engineer2@fennel.test' } })),
    );
    const subjects = rows.map((r) => r.subject);
    await waitFor('every queued message sent', async () => {
      const pending = await db('mail_queue').whereIn('subject', subjects).whereNot({ status: 'sent' });
      return pending.length === 0 ? true : undefined;
    });
    const received = (await db('mail_outbox').where('subject', 'like', `Queue race ${tag}%`)).map((m: { subject: string }) => m.subject);
    expect(received.sort()).toEqual([...subjects].sort());
    const resets = await waitFor('both reset messages delivered', async () => {
      const sent = await db('mail_queue').where({ to: 'engineer2@fennel.test', status: 'sent' });
      return sent.length >= 2 ? sent : undefined;
    });
    const resetSubjects = resets.map((r: { subject: string }) => r.subject);
    const delivered = await db('mail_outbox').where('to', 'like', '%engineer2@fennel.test%');
    expect(delivered).toHaveLength(resetSubjects.length);
  });

  it('when the submit on one instance e-mails the reviewers, then each message arrives once', async () => {
    const title = `Mailed once ${randomUUID().slice(0, 8)}`;
    await submittedRevision('b', 'a', title);
    const queued = await waitFor('the submit mail sent', async () => {
      const rows = await db('mail_queue').where('subject', 'like', `%${title}%`);
      return rows.length && rows.every((r: { status: string }) => r.status === 'sent') ? rows : undefined;
    });
    const received = await db('mail_outbox').where('subject', 'like', `%${title}%`);
    expect(received).toHaveLength(queued.length);
  });

  it('when the run is over, then neither data folder holds a database file, evidence, a signed PDF or the signing keys', async () => {
    await Promise.all(Object.values(instances).map((i) => i.stop()));
    for (const dir of Object.values(dataDirs)) {
      const files: string[] = [];
      const walk = (d: string) => {
        for (const name of readdirSync(d)) {
          const path = join(d, name);
          if (statSync(path).isDirectory()) walk(path);
          else files.push(path);
        }
      };
      walk(dir);
      expect(files.filter((f) => /\.sqlite|dev-pki/.test(f))).toEqual([]);
      expect(files.filter((f) => storedHashes.has(sha256(readFileSync(f))) || storedHashes.has(f.split('/').pop()!))).toEqual([]);
      expect(files).toEqual([]);
    }
    expect(storedHashes.size).toBe(4);
  });
});
