// Capacity of the real server on this machine (issue 13). Starts `server/index.ts` (the cluster, as
// `npm start` runs it) on a temporary data folder and a bare Express JSON route beside it, seeds 100
// and then 10 000 dossiers, and prints each figure with its target. Throughput is a ratio to the bare
// route measured in the same run, so it means the same on a loaded machine. It runs twice: on SQLite
// with the evidence folder, then on PostgreSQL with an S3 bucket (a real PostgreSQL 15 and s3rver, as
// the tests start them), and prints the two columns side by side.
// Run: node --import tsx scripts/bench-server.ts
//   BENCH_BACKENDS=sqlite or pg-s3 runs one; BENCH_SHORT=1 (a check that it works, not a measurement)
//   runs every step for a second or two; BENCH_MIXED_SECONDS sets the mixed run (60 s, 3 s short).
import { spawn, type ChildProcess } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import { closeSync, mkdirSync, mkdtempSync, openSync, readFileSync, rmSync } from 'node:fs';
import { availableParallelism, loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import autocannon from 'autocannon';
import { hashPassword } from '../server/auth/passwords';
import { openDatabase, type Db } from '../server/db/knex';
import { DEMO_PASSWORD, seedDemo } from '../server/db/seed';
import { listDossiers } from '../server/dossiers/store';
import { resultColumns } from '../server/revisions/store';
import { computeDischarge } from '../shared/engine';
import { dossierListQuerySchema } from '../shared/schema/lists';
import { demoDesign, demoRequirement, failingDesign } from '../tests/support/fixtures';
import { createDatabase, startPostgres } from '../tests/support/postgres';
import { createBucket, s3Env, startS3 } from '../tests/support/s3';

const SHORT = process.env.BENCH_SHORT === '1';
const MIXED_SECONDS = Number(process.env.BENCH_MIXED_SECONDS ?? (SHORT ? 3 : 60));
const SESSIONS = SHORT ? 20 : 200;
const ROUNDS = SHORT ? 1 : 2;
const ROUND_SECONDS = SHORT ? 1 : 5;
const READ_SECONDS = SHORT ? 2 : 10;
const LIST_CALLS = SHORT ? 30 : 300;
type Backend = 'sqlite' | 'pg-s3';
const BACKENDS = (process.env.BENCH_BACKENDS ?? 'sqlite,pg-s3').split(',').map((b) => b.trim()) as Backend[];
const TITLES: Record<Backend, string> = { sqlite: 'SQLite + folder', 'pg-s3': 'PostgreSQL + S3' };

const top = mkdtempSync(join(tmpdir(), 'vf-bench-server-'));
const children: ChildProcess[] = [];
const stops: Array<() => Promise<void>> = [];

interface Row {
  figure: string;
  target: string;
  met: string;
}
let rows = new Map<string, Row>();
const report = (what: string, figure: string, target: string, met: boolean | null) => {
  rows.set(what, { figure, target, met: met === null ? '' : met ? 'met' : 'NOT MET' });
  console.log(`  ${what}: ${figure}${target ? `  (target ${target}: ${met ? 'met' : 'NOT MET'})` : ''}`);
};

/** Starts a node child with its stdout in a file and resolves with the first stdout text matching `ready`. */
async function startChild(dir: string, args: string[], env: Record<string, string>, name: string, ready: RegExp): Promise<RegExpExecArray> {
  const logFile = join(dir, `${name}.log`);
  const fd = openSync(logFile, 'w');
  const child = spawn(process.execPath, args, { env: { ...process.env, ...env }, stdio: ['ignore', fd, 'inherit'] });
  closeSync(fd);
  children.push(child);
  const deadline = Date.now() + 180_000;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`${name} exited with ${child.exitCode}`);
    const match = ready.exec(readFileSync(logFile, 'utf8'));
    if (match) return match;
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`${name} did not start`);
}

const results = {
  meets: resultColumns(computeDischarge({ requirement: demoRequirement, design: demoDesign })),
  fails: resultColumns(computeDischarge({ requirement: demoRequirement, design: failingDesign })),
};

/** Adds dossiers (one revision each, in every status) until the database holds `total`. */
async function seedDossiers(db: Db, total: number, authorId: string, productId: number): Promise<void> {
  const have = Number((await db('dossier').count({ n: '*' }).first())?.n ?? 0);
  const now = new Date().toISOString();
  await db.transaction(async (trx) => {
    for (let start = have; start < total; start += 500) {
      const batch = Array.from({ length: Math.min(500, total - start) }, (_, k) => start + k);
      const dossierIds: number[] = [];
      for (const i of batch) {
        const [row] = await trx('dossier')
          .insert({
            product_id: productId,
            title: `Seeded dossier ${i}`,
            requirement: JSON.stringify({ ...demoRequirement, reference: `Plan ${i}` }),
            created_by: authorId,
            created_at: now,
          })
          .returning('id');
        dossierIds.push(row.id);
      }
      const revisions = dossierIds.map((dossierId, k) => ({
        dossier_id: dossierId,
        number: 1,
        status: 'draft',
        design: JSON.stringify(k % 3 ? demoDesign : failingDesign),
        notes: '',
        ...(k % 3 ? results.meets : results.fails),
        author_id: authorId,
        created_at: now,
        updated_at: now,
      }));
      const ids: number[] = [];
      for (let k = 0; k < revisions.length; k += 50) {
        ids.push(
          ...(
            await trx('revision')
              .insert(revisions.slice(k, k + 50))
              .returning('id')
          ).map((r: { id: number }) => r.id),
        );
      }
      // Along the workflow the triggers allow: a quarter stay drafts, the rest are submitted, some decided.
      const submitted = ids.filter((_, k) => k % 4 !== 0);
      await trx('revision').whereIn('id', submitted).update({ status: 'in_review', submitted_at: now });
      await trx('revision')
        .whereIn(
          'id',
          submitted.filter((_, k) => k % 3 === 1),
        )
        .update({ status: 'approved', decided_at: now });
      await trx('revision')
        .whereIn(
          'id',
          submitted.filter((_, k) => k % 3 === 2),
        )
        .update({ status: 'returned', decided_at: now });
    }
  });
}

async function signIn(base: string, email: string): Promise<string> {
  const res = await fetch(`${base}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', origin: base },
    body: JSON.stringify({ email, password: DEMO_PASSWORD }),
  });
  if (!res.ok) throw new Error(`sign-in ${email}: ${res.status}`);
  return res.headers.get('set-cookie')!.split(';')[0];
}

// autocannon counts a timeout among its errors too.
const errorsOf = (r: autocannon.Result) => r.errors + r.non2xx;
const run = (options: autocannon.Options) => autocannon(options);

/**
 * Where the server keeps its data: the SQLite file and folder in `dir`, or a fresh PostgreSQL server and
 * bucket. `database(name)` opens another empty database of the same kind (the small list-query one).
 */
async function backendOf(backend: Backend, dir: string): Promise<{ env: Record<string, string>; open: (name?: string) => Promise<Db> }> {
  if (backend === 'sqlite') return { env: {}, open: async (name) => openDatabase(name ? join(dir, name) : dir, { migrate: name !== undefined }) };
  const [pg, s3] = await Promise.all([startPostgres(), startS3()]);
  stops.push(
    () => s3.stop(),
    () => pg.stop(),
  );
  await createDatabase(pg, 'bench');
  await createBucket(s3.endpoint, 'bench');
  return {
    env: { DATABASE_URL: pg.urlOf('bench'), ...s3Env(s3.endpoint, 'bench') },
    open: async (name) => {
      if (name) await createDatabase(pg, name);
      return openDatabase(dir, { url: pg.urlOf(name ?? 'bench'), migrate: name !== undefined });
    },
  };
}

/** Alternates the two runs ROUNDS times so both see the same machine load; answers the mean req/s and the worse p99. */
async function alternate(a: autocannon.Options, b: autocannon.Options) {
  const got = { a: [] as autocannon.Result[], b: [] as autocannon.Result[] };
  for (let i = 0; i < ROUNDS; i += 1) {
    got.a.push(await run({ ...a, duration: ROUND_SECONDS }));
    got.b.push(await run({ ...b, duration: ROUND_SECONDS }));
  }
  const sum = (rs: autocannon.Result[]) => ({
    rps: rs.reduce((s, r) => s + r.requests.average, 0) / rs.length,
    p99: Math.max(...rs.map((r) => r.latency.p99)),
    errors: rs.reduce((s, r) => s + errorsOf(r), 0),
    bytes: rs[0].throughput.average / rs[0].requests.average,
  });
  return { a: sum(got.a), b: sum(got.b) };
}

/** One whole run on one back end; answers its figures by name. */
async function benchOn(backend: Backend, workers: number): Promise<Map<string, Row>> {
  rows = new Map();
  const dir = join(top, backend);
  mkdirSync(dir);
  const data = await backendOf(backend, dir);
  console.log(`\n=== ${TITLES[backend]} ===`);
  const [, port] = await startChild(
    dir,
    ['--import', 'tsx', 'server/index.ts'],
    {
      ...data.env,
      NODE_ENV: 'development',
      PORT: '0',
      HOST: '127.0.0.1',
      VOLTFALL_DATA_DIR: dir,
      FAKE_SMTP_PORT: '0',
      WEB_CONCURRENCY: String(workers),
      SIGN_IN_LIMIT_PER_15_MIN: '100000',
    },
    'server',
    /"port":(\d+),"workers"|"port":(\d+),"dataDir"/,
  ).then((m) => [m[0], m[1] ?? m[2]]);
  const base = `http://127.0.0.1:${port}`;
  const [, barePort] = await startChild(dir, ['--import', 'tsx', 'scripts/bare-express.ts'], {}, 'bare', /^(\d+)\n/);
  const bare: autocannon.Options = { url: `http://127.0.0.1:${barePort}/json`, connections: 64 };

  const db = await data.open();
  const engineer = await db('user').where({ email: 'engineer@fennel.test' }).first('id');
  const product = await db('product').orderBy('id').first('id');
  const cookie = await signIn(base, 'engineer@fennel.test');
  const headers = { cookie, origin: base, 'content-type': 'application/json' };

  // The dossier list at 100 and at 10 000 dossiers.
  const listCost: Record<number, { rps: number; p99: number; errors: number; bytes: number }> = {};
  for (const total of [100, 10_000]) {
    const started = Date.now();
    await seedDossiers(db, total, engineer.id, product.id);
    console.log(`\nseeded ${total} dossiers (${((Date.now() - started) / 1000).toFixed(1)} s)`);
    const { a: reference, b: list } = await alternate(bare, { url: `${base}/api/dossiers`, connections: 8, headers });
    listCost[total] = { ...list, rps: list.rps / reference.rps };
    report(
      `dossier list, first page of 50, at ${total}`,
      `${list.rps.toFixed(0)} req/s = ${listCost[total].rps.toFixed(3)} × bare, p99 ${list.p99} ms, ${list.bytes.toFixed(0)} B, ${list.errors} errors`,
      '',
      null,
    );
  }
  const httpRatio = listCost[100].rps / listCost[10_000].rps;
  report(
    'dossier list over HTTP, cost at 10 000 / at 100',
    `${httpRatio.toFixed(2)} (each against bare at its size; noisy on a loaded machine)`,
    '',
    null,
  );
  // The list query itself, on a second data folder of 100 dossiers, alternating call by call with the
  // 10 000 one so both see the same load.
  const small = await data.open('small');
  await seedDemo(small);
  const smallAuthor = await small('user').where({ email: 'engineer@fennel.test' }).first('id');
  await seedDossiers(small, 100, smallAuthor.id, (await small('product').orderBy('id').first('id')).id);
  const firstPage = dossierListQuerySchema.parse({});
  const times: Record<'small' | 'large', number[]> = { small: [], large: [] };
  for (let i = 0; i < LIST_CALLS; i += 1) {
    for (const [key, target] of [
      ['small', small],
      ['large', db],
    ] as const) {
      const start = performance.now();
      await listDossiers(target, firstPage, { approvedOnly: false });
      times[key].push(performance.now() - start);
    }
  }
  const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
  const queryRatio = median(times.large) / median(times.small);
  report(
    `dossier list query, median of ${LIST_CALLS} calls each`,
    `${median(times.small).toFixed(2)} ms at 100, ${median(times.large).toFixed(2)} ms at 10 000: ${queryRatio.toFixed(2)}×`,
    'same cost (≤ 1.5×)',
    queryRatio <= 1.5,
  );
  await small.destroy();
  for (const filter of ['status=in_review', 'q=Seeded%20dossier%209999', `productId=${product.id}&status=approved`]) {
    const r = await run({ url: `${base}/api/dossiers?${filter}`, connections: 8, headers, duration: ROUND_SECONDS });
    report(`dossier list ?${filter} at 10 000`, `${r.requests.average.toFixed(0)} req/s, p99 ${r.latency.p99} ms, ${errorsOf(r)} errors`, '', null);
  }

  // The check route against the bare route, 64 connections each.
  console.log('\ncheck route, 64 connections');
  const body = JSON.stringify({ requirement: demoRequirement, design: demoDesign });
  const { a: reference, b: check } = await alternate(bare, { url: `${base}/api/calc/discharge`, method: 'POST', connections: 64, headers, body });
  report('bare Express JSON route', `${reference.rps.toFixed(0)} req/s, p99 ${reference.p99} ms`, '', null);
  report(
    'check route req/s ÷ bare',
    `${(check.rps / reference.rps).toFixed(3)} (${check.rps.toFixed(0)} req/s, ${check.bytes.toFixed(0)} B a answer)`,
    '≥ 0.40',
    check.rps / reference.rps >= 0.4,
  );
  report('check route p99', `${check.p99} ms`, '≤ 50 ms', check.p99 <= 50);
  report('check route errors', `${check.errors}`, '0', check.errors === 0);

  // 200 connections reading one revision (with its full results).
  console.log('\nreading a revision, 200 connections');
  const revision = await db('revision').where({ status: 'approved' }).orderBy('id', 'desc').first('id');
  const read = await run({ url: `${base}/api/revisions/${revision.id}`, connections: 200, headers, duration: READ_SECONDS });
  report('revision read p99', `${read.latency.p99} ms (${read.requests.average.toFixed(0)} req/s)`, '≤ 500 ms', read.latency.p99 <= 500);
  report('revision read errors', `${errorsOf(read)} (${read.timeouts} timeouts, ${read.non2xx} non-2xx)`, '0', errorsOf(read) === 0);

  // 200 signed-in sessions, each editing its own draft while reading lists and revisions.
  console.log(`\n${SESSIONS} sessions mixing reads and writes for ${MIXED_SECONDS} s`);
  const hash = await hashPassword(DEMO_PASSWORD);
  const now = new Date().toISOString();
  const sessions: Array<{ cookie: string; draftId: number; version: number; sent: number; acked: number }> = [];
  for (let i = 0; i < SESSIONS; i += 1) {
    const id = randomUUID();
    await db('user').insert({ id, email: `bench-${i}@fennel.test`, name: `Bench ${i}`, role: 'engineer', password_hash: hash, created_at: now });
  }
  const draftOf = async (i: number) => {
    const c = await signIn(base, `bench-${i}@fennel.test`);
    const res = await fetch(`${base}/api/dossiers`, {
      method: 'POST',
      headers: { ...headers, cookie: c },
      body: JSON.stringify({ productId: product.id, title: `Session ${i}`, requirement: demoRequirement }),
    });
    const dossier = (await res.json()) as { revisions: Array<{ id: number }> };
    sessions[i] = { cookie: c, draftId: dossier.revisions[0].id, version: 0, sent: 0, acked: 0 };
  };
  for (let i = 0; i < SESSIONS; i += 10) await Promise.all(Array.from({ length: 10 }, (_, k) => draftOf(i + k)));

  // One session per connection for the whole run. autocannon clears a connection's context each time
  // its request list starts over, so the session's index goes into the context it starts from.
  type Ctx = { index: number };
  let next = 0;
  // autocannon builds each connection's first request before setupClient runs; that one is rebuilt there.
  const sessionOf = (context: object) => sessions[(context as Partial<Ctx>).index ?? 0];
  const as = (req: autocannon.Request, context: object) => ({ ...req, headers: { ...headers, cookie: sessionOf(context).cookie } });
  // A save carries the version its session last read (each session edits its own draft, so none is stale).
  const draftPatch = (s: (typeof sessions)[number]) => ({ version: s.version, notes: `write ${s.sent}`, design: demoDesign });
  const keepVersion = (status: number, body: string, c: object) => {
    if (status === 200) sessionOf(c).version = (JSON.parse(body) as { version: number }).version;
  };
  const mixed = await run({
    url: base,
    connections: SESSIONS,
    duration: MIXED_SECONDS,
    setupClient: (client) => {
      const iterator = (client as unknown as { requestIterator: { initialContext: Ctx; context: Ctx; rebuildRequest(): void } }).requestIterator;
      iterator.initialContext = { index: next };
      iterator.context = { index: next };
      next += 1;
      iterator.rebuildRequest();
    },
    requests: [
      { method: 'GET', setupRequest: (req, c) => ({ ...as(req, c), path: `/api/revisions/${sessionOf(c).draftId}` }), onResponse: keepVersion },
      { method: 'GET', path: '/api/dossiers', setupRequest: as },
      {
        method: 'PATCH',
        setupRequest: (req, c) => {
          const s = sessionOf(c);
          s.sent += 1;
          return { ...as(req, c), path: `/api/revisions/${s.draftId}`, body: JSON.stringify(draftPatch(s)) };
        },
        onResponse: (status, body, c) => {
          const s = sessionOf(c);
          const written = Number(/write (\d+)/.exec(body)?.[1] ?? 0);
          if (status === 200 && written > s.acked) s.acked = written;
          keepVersion(status, body, c);
        },
      },
      { method: 'GET', path: '/api/overview', setupRequest: as },
    ],
  });
  await new Promise((r) => setTimeout(r, 1_000));
  const stored = new Map(
    (
      await db('revision')
        .whereIn(
          'id',
          sessions.map((s) => s.draftId),
        )
        .select('id', 'notes')
    ).map((r) => [r.id, Number(/write (\d+)/.exec(r.notes)?.[1] ?? 0)]),
  );
  const lost = sessions.filter((s) => (stored.get(s.draftId) ?? 0) < s.acked).length;
  const writes = sessions.reduce((n, s) => n + s.acked, 0);
  report('mixed: requests', `${mixed.requests.total} (${mixed.requests.average.toFixed(0)} req/s), ${writes} acknowledged saves`, '', null);
  report(
    'mixed: errors',
    `${errorsOf(mixed)} (${mixed.timeouts} timeouts, ${mixed.non2xx} non-2xx, ${mixed.errors - mixed.timeouts} other)`,
    '0',
    errorsOf(mixed) === 0,
  );
  report('mixed: lost writes', `${lost} of ${SESSIONS} drafts behind their last acknowledged save`, '0', lost === 0);
  report('mixed: p99', `${mixed.latency.p99} ms`, '≤ 1000 ms', mixed.latency.p99 <= 1000);
  await db.destroy();
  for (const child of children.splice(0)) child.kill('SIGTERM');
  await new Promise((r) => setTimeout(r, 2_000));
  return rows;
}

try {
  const workers = Number(process.env.WEB_CONCURRENCY ?? availableParallelism());
  console.log(
    `Voltfall server benchmark: ${workers} worker(s), ${availableParallelism()} CPU(s), load average ${loadavg()
      .map((l) => l.toFixed(1))
      .join(' ')}${SHORT ? ' — SHORT run: checks that it works, the figures mean nothing' : ''}`,
  );
  const results = new Map<Backend, Map<string, Row>>();
  for (const backend of BACKENDS) results.set(backend, await benchOn(backend, workers));
  // Both columns side by side; throughput figures are each against the bare route of their own run.
  const names = [...new Set([...results.values()].flatMap((r) => [...r.keys()]))];
  console.log('\nsummary (req/s ratios are against the bare Express route measured in the same run)');
  console.table(
    names.map((what) => {
      const line: Record<string, string> = { what };
      for (const [backend, r] of results)
        line[TITLES[backend]] = r.get(what) ? `${r.get(what)!.figure}${r.get(what)!.met ? ` [${r.get(what)!.met}]` : ''}` : '';
      line.target = [...results.values()].map((r) => r.get(what)?.target).find(Boolean) ?? '';
      return line;
    }),
  );
} finally {
  for (const child of children) child.kill('SIGTERM');
  await new Promise((r) => setTimeout(r, 2_000));
  for (const stop of stops) await stop();
  rmSync(top, { recursive: true, force: true });
}
