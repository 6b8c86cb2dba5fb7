// The real server as its own process (`node --import tsx server/index.ts`, as production runs it), for
// tests that kill it, restart it, start it on a broken data folder or run it in a mount namespace.
import { spawn, type ChildProcess } from 'node:child_process';
import { resolve } from 'node:path';

export interface ServerProcess {
  child: ChildProcess;
  pid: number;
  url: string;
  /** Parsed JSON log lines printed so far. */
  logs: Array<Record<string, unknown>>;
  stderr(): string;
  exited: Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
  /** SIGKILL: no handler runs, nothing is flushed — a power cut as far as the process is concerned. */
  kill(): Promise<void>;
  /** SIGTERM and wait: the server's own orderly shutdown. */
  stop(): Promise<void>;
}

export interface SpawnOptions {
  env?: Record<string, string>;
  /** Runs the server inside `unshare -m` after this shell setup (mounts visible only to the server). */
  mountSetup?: string;
  /** Extra modules loaded before the server (`--import`). */
  imports?: string[];
}

const ROOT = resolve(import.meta.dirname, '..', '..');

function command(dataDir: string, options: SpawnOptions): { argv: string[]; env: NodeJS.ProcessEnv } {
  const node = [process.execPath, '--import', 'tsx', ...(options.imports ?? []).flatMap((m) => ['--import', m]), 'server/index.ts'];
  const argv = options.mountSetup
    ? ['unshare', '-m', '--propagation', 'private', 'sh', '-c', `${options.mountSetup}\nexec "$@"`, 'sh', ...node]
    : node;
  const env: NodeJS.ProcessEnv = {
    PATH: process.env.PATH,
    HOME: process.env.HOME,
    NODE_ENV: 'test',
    PORT: '0',
    HOST: '127.0.0.1',
    VOLTFALL_DATA_DIR: dataDir,
    FAKE_SMTP_PORT: '0',
    LOG_LEVEL: 'info',
    SIGN_IN_LIMIT_PER_15_MIN: '10000',
    ...options.env,
  };
  return { argv, env };
}

/** Starts the server and resolves once it listens. */
export async function spawnServer(dataDir: string, options: SpawnOptions = {}, timeoutMs = 90_000): Promise<ServerProcess> {
  const { argv, env } = command(dataDir, options);
  const child = spawn(argv[0], argv.slice(1), { cwd: ROOT, env, stdio: ['ignore', 'pipe', 'pipe'] });
  const logs: Array<Record<string, unknown>> = [];
  let stderr = '';
  let pending = '';
  child.stderr!.on('data', (c: Buffer) => (stderr += c.toString()));
  const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((done) =>
    child.once('exit', (code, signal) => done({ code, signal })),
  );
  let timer: ReturnType<typeof setTimeout> | undefined;
  const listening = new Promise<number>((done, fail) => {
    child.stdout!.on('data', (c: Buffer) => {
      pending += c.toString();
      const lines = pending.split('\n');
      pending = lines.pop()!;
      for (const line of lines) {
        try {
          const entry = JSON.parse(line) as Record<string, unknown>;
          logs.push(entry);
          if (entry.msg === 'Voltfall is listening') done(Number(entry.port));
        } catch {
          // Not a log line.
        }
      }
    });
    void exited.then(({ code, signal }) => fail(new Error(`server exited before listening (${code ?? signal}): ${stderr}`)));
    timer = setTimeout(() => fail(new Error(`server did not listen within ${timeoutMs} ms: ${stderr}`)), timeoutMs);
  });
  const port = await listening.finally(() => clearTimeout(timer));
  return {
    child,
    pid: child.pid!,
    url: `http://127.0.0.1:${port}`,
    logs,
    stderr: () => stderr,
    exited,
    async kill() {
      child.kill('SIGKILL');
      await exited;
    },
    async stop() {
      child.kill('SIGTERM');
      await exited;
    },
  };
}

/** Runs the server expecting it not to start; resolves with how it ended. */
export async function runUntilExit(
  dataDir: string,
  options: SpawnOptions = {},
  timeoutMs = 60_000,
): Promise<{ code: number | null; stdout: string; stderr: string }> {
  const { argv, env } = command(dataDir, options);
  const child = spawn(argv[0], argv.slice(1), { cwd: ROOT, env, stdio: ['ignore', 'pipe', 'pipe'] });
  let stdout = '';
  let stderr = '';
  child.stdout!.on('data', (c: Buffer) => (stdout += c.toString()));
  child.stderr!.on('data', (c: Buffer) => (stderr += c.toString()));
  const timer = setTimeout(() => child.kill('SIGKILL'), timeoutMs);
  const code = await new Promise<number | null>((done) => child.once('exit', (c) => done(c)));
  clearTimeout(timer);
  return { code, stdout, stderr };
}
