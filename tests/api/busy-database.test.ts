// A busy database never ends the process: while another connection holds SQLite's write lock for longer
// than the busy timeout, writes answer 503 with Retry-After, reads go on, the mail loop that meets the
// lock logs, backs off and delivers once the lock is gone; a rejection nobody handled is logged.
import type { AddressInfo } from 'node:net';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { SMTPServer } from 'smtp-server';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoDesign } from '../support/fixtures';
import { spawnServer } from '../support/server-process';
import { newDraft, startTestServer, TEST_BACKEND, type TestServer } from '../support/test-server';
import { holdPgWriteLock, holdWriteLock } from '../support/write-lock';

/** A mail relay that takes each message only when the test opens the gate, and counts what it took. */
async function gatedRelay() {
  let open: () => void = () => undefined;
  let gate = new Promise<void>((r) => (open = r));
  const received: string[] = [];
  let arrived: () => void = () => undefined;
  const arrival = new Promise<void>((r) => (arrived = r));
  const relay = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    onData(stream, _session, callback) {
      let text = '';
      stream.on('data', (c: Buffer) => (text += c.toString()));
      stream.on('end', () => {
        arrived();
        void gate.then(() => {
          received.push(text);
          callback();
        });
      });
    },
  });
  await new Promise<void>((r) => relay.listen(0, '127.0.0.1', () => r()));
  return {
    url: `smtp://127.0.0.1:${(relay.server.address() as AddressInfo).port}`,
    received,
    /** Resolves when a message has been handed over and waits at the gate. */
    arrival,
    open: () => open(),
    close: () => new Promise<void>((r) => relay.close(() => r())),
    reset() {
      gate = new Promise<void>((r) => (open = r));
    },
  };
}

let server: TestServer;
let relay: Awaited<ReturnType<typeof gatedRelay>>;
const BUSY_TIMEOUT_MS = 200;

beforeAll(async () => {
  relay = await gatedRelay();
  server = await startTestServer({}, { SQLITE_BUSY_TIMEOUT_MS: String(BUSY_TIMEOUT_MS), SMTP_URL: relay.url });
});
afterAll(async () => {
  await server.close();
  await relay.close();
});

/** Another connection takes the write lock: SQLite's on the file, or PostgreSQL's advisory write lock. */
const takeWriteLock = () =>
  server.ctx.config.databaseUrl ? holdPgWriteLock(server.ctx.config.databaseUrl) : holdWriteLock(join(server.dataDir, 'voltfall.sqlite3'));

describe('another connection holds the write lock', () => {
  it('when a write meets the lock past the busy timeout, then 503 with Retry-After and nothing saved, while reads go on', async () => {
    const { engineer, id } = await newDraft(server, 'Locked out', demoDesign);
    const lock = await takeWriteLock();
    try {
      const save = await engineer.patch(`/api/revisions/${id}`).send({ version: 2, notes: 'while locked' });
      expect(save.status).toBe(503);
      expect(save.body.error.code).toBe('busy');
      expect(save.headers['retry-after']).toBe('2');
      expect(save.text).not.toMatch(/SQLITE|update `revision`|lock timeout|advisory/i);
      const read = await engineer.get(`/api/revisions/${id}`);
      expect(read.status).toBe(200);
      expect(read.body.notes).toBe('');
    } finally {
      await lock.release();
    }
    // The client's retry after the lock is gone goes through.
    expect((await engineer.patch(`/api/revisions/${id}`).send({ version: 2, notes: 'after the lock' })).status).toBe(200);
  });

  it("when the lock is taken while a submit's mail is being delivered, then the server stays up and the mail is delivered once, after the lock", async () => {
    const { engineer, id } = await newDraft(server, 'Mail meets a lock', demoDesign);
    const submitted = await engineer.post(`/api/revisions/${id}/submit`);
    expect(submitted.status).toBe(200);
    // The mail sender has handed the message to the relay, which holds it at the gate.
    await relay.arrival;
    const lock = await takeWriteLock();
    try {
      relay.open();
      // The sender now records the delivery and meets the lock, more than once (its backoff: 0.5 s, 1 s …).
      await new Promise((r) => setTimeout(r, 6 * BUSY_TIMEOUT_MS + 1_000));
      expect((await server.anonymous().get('/api/health')).body).toEqual({ ok: true });
      const row = await server.ctx.db('mail_queue').where('subject', 'like', '%Mail meets a lock%').first();
      // SQLite's lock is the whole file's, so recording the delivery waits for it. PostgreSQL's write lock
      // orders transactions only; the single-row update that records a delivery goes through meanwhile.
      expect(row.status).toBe(TEST_BACKEND === 'sqlite' ? 'pending' : 'sent');
      expect(relay.received).toHaveLength(1);
    } finally {
      await lock.release();
    }
    // No flush from the test: the sender's own retry records it.
    const deadline = Date.now() + 15_000;
    let status = 'pending';
    while (status !== 'sent' && Date.now() < deadline) {
      await new Promise((r) => setTimeout(r, 100));
      status = (await server.ctx.db('mail_queue').where('subject', 'like', '%Mail meets a lock%').first()).status;
    }
    expect(status).toBe('sent');
    expect(relay.received).toHaveLength(1);
    expect(relay.received[0]).toContain('Mail meets a lock');
    expect((await engineer.get(`/api/revisions/${id}`)).body.status).toBe('in_review');
  });
});

describe('the process itself', () => {
  it('when a rejection escapes every handler, then it is logged and the server keeps serving', async () => {
    const dataDir = mkdtempSync(join(tmpdir(), 'vf-reject-'));
    const running = await spawnServer(dataDir, { imports: ['./tests/support/reject-once.ts'] });
    try {
      running.child.kill('SIGUSR2');
      const deadline = Date.now() + 10_000;
      while (!running.logs.some((l) => l.msg === 'unexpected rejection; still serving') && Date.now() < deadline)
        await new Promise((r) => setTimeout(r, 50));
      expect(running.logs.find((l) => l.msg === 'unexpected rejection; still serving')).toMatchObject({
        level: 50,
        err: { message: 'escaped every handler (test)' },
      });
      const health = await fetch(`${running.url}/api/health`);
      expect(await health.json()).toEqual({ ok: true });
      expect(running.child.exitCode).toBeNull();
    } finally {
      await running.stop();
      rmSync(dataDir, { recursive: true, force: true });
    }
  });
});
