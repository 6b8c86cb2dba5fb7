// A real PostgreSQL server for tests: Debian's binaries, a fresh cluster in a temp folder, on a free
// loopback port. PostgreSQL refuses to run as root, so under root (CI) it runs as the postgres user.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { chmodSync, chownSync, mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import pg from 'pg';

export const PG_BIN = '/usr/lib/postgresql/15/bin';
const USER = 'voltfall';

export interface PostgresServer {
  /** A URL of the server's maintenance database; `urlOf(name)` names another. */
  url: string;
  urlOf(database: string): string;
  stop(): Promise<void>;
}

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const { port } = s.address() as { port: number };
      s.close(() => resolve(port));
    });
  });
}

/**
 * `argv` as the postgres user when this process is root, as this user otherwise. setpriv changes user
 * and execs (runuser would stay as a parent that does not pass SIGINT on, so `stop()` never ended).
 */
function asServerUser(argv: string[]): [string, string[]] {
  return process.getuid?.() === 0 ? ['setpriv', ['--reuid=postgres', '--regid=postgres', '--init-groups', '--', ...argv]] : [argv[0], argv.slice(1)];
}

async function waitUntilAccepting(url: string, child: ChildProcess, log: () => string): Promise<void> {
  const deadline = Date.now() + 30_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`postgres exited with ${child.exitCode}: ${log()}`);
    const client = new pg.Client({ connectionString: url });
    try {
      await client.connect();
      await client.end();
      return;
    } catch (err) {
      await client.end().catch(() => undefined);
      if (Date.now() > deadline) throw new Error(`postgres did not accept connections: ${(err as Error).message} ${log()}`, { cause: err });
      await new Promise((r) => setTimeout(r, 100));
    }
  }
}

export async function startPostgres(): Promise<PostgresServer> {
  const dir = mkdtempSync(join(tmpdir(), 'vf-pg-'));
  const data = join(dir, 'data');
  chmodSync(dir, 0o755);
  if (process.getuid?.() === 0) {
    const { uid, gid } = { uid: Number(spawnSync('id', ['-u', 'postgres']).stdout), gid: Number(spawnSync('id', ['-g', 'postgres']).stdout) };
    chownSync(dir, uid, gid);
  }
  const [initCmd, initArgs] = asServerUser([join(PG_BIN, 'initdb'), '-D', data, '-U', USER, '--auth=trust', '-E', 'UTF8', '--locale=C.UTF-8']);
  const init = spawnSync(initCmd, initArgs, { encoding: 'utf8' });
  if (init.status !== 0) throw new Error(`initdb failed: ${init.stderr || init.stdout}`);
  const port = await freePort();
  // Durability is not under test here: fsync off makes creating a database per test file quick.
  const [cmd, args] = asServerUser([
    join(PG_BIN, 'postgres'),
    '-D',
    data,
    '-k',
    dir,
    '-p',
    String(port),
    '-c',
    'listen_addresses=127.0.0.1',
    '-c',
    'fsync=off',
    '-c',
    'synchronous_commit=off',
    '-c',
    'full_page_writes=off',
    '-c',
    'max_connections=300',
  ]);
  const child = spawn(cmd, args, { stdio: ['ignore', 'ignore', 'pipe'] });
  let stderr = '';
  child.stderr!.on('data', (d: Buffer) => {
    stderr = (stderr + d.toString()).slice(-4000);
  });
  const urlOf = (database: string) => `postgres://${USER}@127.0.0.1:${port}/${database}`;
  const url = urlOf('postgres');
  await waitUntilAccepting(url, child, () => stderr);
  return {
    url,
    urlOf,
    async stop() {
      if (child.exitCode === null) {
        const exited = new Promise((r) => child.once('exit', r));
        // SIGINT: PostgreSQL's fast shutdown (sessions are ended, nothing waits).
        child.kill('SIGINT');
        await exited;
      }
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** Creates an empty database on the server. */
export async function createDatabase(server: { url: string }, name: string): Promise<void> {
  const client = new pg.Client({ connectionString: server.url });
  await client.connect();
  try {
    await client.query(`CREATE DATABASE "${name}"`);
  } finally {
    await client.end();
  }
}
