// A full disk and a read-only data folder, made real: the server runs in its own mount namespace
// (`unshare -m`, needs root as CI has) with its data folder on a small tmpfs or behind a read-only bind
// mount. Writes answer 507 / 503 with the error shape, reads keep working, nothing is half-written, and
// start-up on a folder it cannot use ends with one line naming the path and why.
import Database from 'better-sqlite3';
import { execFileSync } from 'node:child_process';
import { closeSync, mkdtempSync, openSync, readdirSync, rmSync, writeSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { runUntilExit, spawnServer, type ServerProcess } from '../support/server-process';
import { sessionCookie } from '../support/uploads';

const cleanups: Array<() => Promise<void> | void> = [];
afterEach(async () => {
  for (const c of cleanups.splice(0).reverse()) await c();
});

function tempFolder(prefix: string): string {
  const dir = mkdtempSync(join(tmpdir(), prefix));
  cleanups.push(() => rmSync(dir, { recursive: true, force: true }));
  return dir;
}

async function start(dataDir: string, mountSetup: string): Promise<ServerProcess> {
  const server = await spawnServer(dataDir, { mountSetup });
  cleanups.push(() => server.kill());
  return server;
}

/** The server's view of a path: its mounts live in its own namespace, reachable through /proc. */
const inside = (server: ServerProcess, path: string) => join(`/proc/${server.pid}/root`, path);

async function call(server: ServerProcess, cookie: string, method: string, path: string, body?: unknown) {
  const res = await fetch(`${server.url}/api${path}`, {
    method,
    headers: { Cookie: cookie, Origin: server.url, ...(body === undefined ? {} : { 'Content-Type': 'application/json' }) },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  const text = await res.text();
  return { status: res.status, headers: res.headers, text, body: text ? JSON.parse(text) : null };
}

async function uploadText(server: ServerProcess, cookie: string, revisionId: number, bytes: number) {
  const form = new FormData();
  form.append('kind', 'other');
  form.append('file', new Blob([Buffer.alloc(bytes, 'x')]), 'bench-log.txt');
  const res = await fetch(`${server.url}/api/revisions/${revisionId}/evidence`, {
    method: 'POST',
    headers: { Cookie: cookie, Origin: server.url },
    body: form,
  });
  const text = await res.text();
  return { status: res.status, text, body: JSON.parse(text) };
}

/** The engineer's seeded draft (Heron revision 2) and its version. */
async function seededDraft(server: ServerProcess, cookie: string) {
  const overview = await call(server, cookie, 'GET', '/overview');
  const id = overview.body.myDrafts.items[0].id as number;
  return { id, version: (await call(server, cookie, 'GET', `/revisions/${id}`)).body.version as number };
}

/** Writes zeros until the file system says it is full. */
function fillUp(file: string): void {
  const fd = openSync(file, 'w');
  const chunk = Buffer.alloc(256 * 1024);
  try {
    for (;;) writeSync(fd, chunk);
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== 'ENOSPC') throw err;
  } finally {
    closeSync(fd);
  }
}

describe('a full disk', () => {
  it("when the data folder's disk is full, then uploads and saves answer 507 insufficient_storage, reads go on, and writes resume once space is freed", async () => {
    const dataDir = tempFolder('vf-full-');
    const server = await start(dataDir, `mount -t tmpfs -o size=24m tmpfs "${dataDir}"`);
    const cookie = await sessionCookie(server.url, 'engineer@fennel.test');
    const draft = await seededDraft(server, cookie);
    const filler = inside(server, join(dataDir, 'filler'));
    fillUp(filler);

    const upload = await uploadText(server, cookie, draft.id, 2 * 1024 * 1024);
    expect(upload.status, upload.text.slice(0, 300)).toBe(507);
    expect(upload.body.error.code).toBe('insufficient_storage');
    const save = await call(server, cookie, 'PATCH', `/revisions/${draft.id}`, { version: draft.version, notes: 'on a full disk' });
    expect(save.status, save.text.slice(0, 300)).toBe(507);
    expect(save.body.error.message).toMatch(/no storage space left; nothing was saved/);
    expect(save.text).not.toMatch(/SQLITE|ENOSPC|update|\bat \//);

    const read = await call(server, cookie, 'GET', `/revisions/${draft.id}`);
    expect(read.status).toBe(200);
    expect(read.body).toMatchObject({ version: draft.version, evidence: [] });
    expect((await call(server, cookie, 'GET', '/dossiers')).status).toBe(200);
    expect(readdirSync(inside(server, join(dataDir, 'evidence', 'tmp')))).toEqual([]);

    rmSync(filler);
    const later = await call(server, cookie, 'PATCH', `/revisions/${draft.id}`, { version: draft.version, notes: 'space again' });
    expect(later.status, later.text.slice(0, 300)).toBe(200);
    expect((await uploadText(server, cookie, draft.id, 1024)).status).toBe(201);
    const db = new Database(inside(server, join(dataDir, 'voltfall.sqlite3')));
    try {
      expect(db.pragma('integrity_check', { simple: true })).toBe('ok');
    } finally {
      db.close();
    }
  });
});

describe('a read-only data folder', () => {
  it('when the data folder turns read-only while the server runs, then every write answers 503 read_only, reads go on, and writes resume when it is writable again', async () => {
    const dataDir = tempFolder('vf-ro-');
    const server = await start(dataDir, 'true');
    const cookie = await sessionCookie(server.url, 'engineer@fennel.test');
    const draft = await seededDraft(server, cookie);
    const nsenter = (script: string) => execFileSync('nsenter', ['-t', String(server.pid), '-m', 'sh', '-c', script]);
    nsenter(`mount --bind "${dataDir}" "${dataDir}" && mount -o remount,bind,ro "${dataDir}"`);
    // The guard looks at the folder at most every two seconds.
    await new Promise((r) => setTimeout(r, 2_100));

    const save = await call(server, cookie, 'PATCH', `/revisions/${draft.id}`, { version: draft.version, notes: 'read-only' });
    expect(save.status, save.text.slice(0, 300)).toBe(503);
    expect(save.body.error.code).toBe('read_only');
    expect(save.headers.get('retry-after')).toBe('60');
    const upload = await uploadText(server, cookie, draft.id, 1024);
    expect(upload.status).toBe(503);
    const signIn = await fetch(`${server.url}/api/auth/sign-in`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json', Origin: server.url },
      body: JSON.stringify({ email: 'viewer@fennel.test', password: 'voltfall-demo' }),
    });
    expect(signIn.status).toBe(503);

    const read = await call(server, cookie, 'GET', `/revisions/${draft.id}`);
    expect(read.status).toBe(200);
    expect(read.body.version).toBe(draft.version);
    expect((await call(server, cookie, 'GET', '/overview')).status).toBe(200);

    nsenter(`umount "${dataDir}"`);
    await new Promise((r) => setTimeout(r, 2_100));
    const later = await call(server, cookie, 'PATCH', `/revisions/${draft.id}`, { version: draft.version, notes: 'writable again' });
    expect(later.status, later.text.slice(0, 300)).toBe(200);
  });
});

describe('start-up on a folder it cannot use', () => {
  const expectOneLine = (out: { code: number | null; stdout: string; stderr: string }, pattern: RegExp) => {
    expect(out.code).toBe(1);
    const lines = out.stderr.trim().split('\n');
    expect(lines, out.stderr).toHaveLength(1);
    expect(lines[0]).toMatch(pattern);
    expect(out.stderr).not.toMatch(/\n\s+at /);
  };

  it('when the data folder is read-only, then the server exits with one line naming the path and why', async () => {
    const dataDir = tempFolder('vf-ro-start-');
    const out = await runUntilExit(dataDir, { mountSetup: `mount --bind "${dataDir}" "${dataDir}" && mount -o remount,bind,ro "${dataDir}"` });
    expectOneLine(out, new RegExp(`^Voltfall cannot start: data folder ${dataDir} is on a read-only file system$`));
  });

  it('when the configured data folder does not exist, then the server exits with one line naming the path and why', async () => {
    const missing = join(tempFolder('vf-missing-'), 'volume', 'voltfall');
    const out = await runUntilExit(missing);
    expectOneLine(
      out,
      new RegExp(
        `^Voltfall cannot start: data folder ${missing} does not exist \\(VOLTFALL_DATA_DIR\\); create it or mount the volume, then start again$`,
      ),
    );
  });
});
