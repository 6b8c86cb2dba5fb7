// Nothing left behind: temporary files of interrupted uploads go at start-up, by the periodic sweep and
// when the upload is cut off; stored files no revision references go after the grace period — never
// one that a submitted revision references.
import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, mkdtempSync, rmSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoDesign } from '../support/fixtures';
import { newDraft, startTestServer, type TestServer } from '../support/test-server';
import { sessionCookie, startSlowUpload } from '../support/uploads';

let server: TestServer;
beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server.close());

const tmpFiles = (of: TestServer) => of.stagingFiles('evidence');

async function until(condition: () => boolean | Promise<boolean>, what: string, timeoutMs = 10_000) {
  const deadline = Date.now() + timeoutMs;
  while (!(await condition())) {
    if (Date.now() > deadline) throw new Error(`timed out waiting until ${what}`);
    await new Promise((r) => setTimeout(r, 25));
  }
}

/** The id of a process that has exited (a real, dead pid). */
function deadPid(): number {
  const child = spawnSync(process.execPath, ['-e', 'process.stdout.write(String(process.pid))']);
  return Number(child.stdout.toString());
}

const hoursAgo = (file: string, hours: number) => {
  const t = new Date(Date.now() - hours * 3600_000);
  utimesSync(file, t, t);
};

describe('temporary files', () => {
  it("when the server starts on a folder with leftovers of a crashed process, then they are removed and a live worker's upload is kept", async () => {
    const dataDir = mkdtempSync(join(tmpdir(), 'vf-restart-'));
    const first = await startTestServer({}, {}, { dataDir });
    const { evidence, dossiers } = first.stores;
    await first.close();
    const dead = deadPid();
    const leftovers = [
      join(evidence.stagingDir, `${dead}-1700000000000-0123456789abcdef.part`),
      join(evidence.stagingDir, `${process.pid}-1700000000000-fedcba9876543210.part`),
      join(dossiers.stagingDir, `${dead}-1700000000000-00112233aabbccdd.part`),
    ];
    // pid 1 is alive: a worker of a cluster in the middle of its upload.
    const live = join(evidence.stagingDir, '1-1700000000000-aaaaaaaaaaaaaaaa.part');
    for (const f of [...leftovers, live]) writeFileSync(f, 'half an upload');

    const restarted = await startTestServer({}, {}, { dataDir });
    try {
      for (const f of leftovers) expect(existsSync(f), f).toBe(false);
      expect(existsSync(live)).toBe(true);
      // The periodic sweep takes it once nothing has written to it for over an hour.
      expect(await restarted.housekeeping.sweep(false)).toMatchObject({ tempFiles: 0 });
      hoursAgo(live, 1.1);
      expect(await restarted.housekeeping.sweep(false)).toMatchObject({ tempFiles: 1 });
      expect(existsSync(live)).toBe(false);
    } finally {
      await restarted.close();
      rmSync(dataDir, { recursive: true, force: true });
    }
  });

  it('when the client disconnects mid-upload, then its temporary file is removed and the server stays healthy', async () => {
    const { id } = await newDraft(server, 'Client goes away', demoDesign);
    const cookie = await sessionCookie(server.url, 'engineer@fennel.test');
    const upload = startSlowUpload(server.url, id, cookie, 50 * 1024 * 1024);
    await upload.send(2 * 1024 * 1024);
    await until(() => tmpFiles(server).length === 1, 'the upload has a temporary file');
    upload.req.destroy();
    await until(() => tmpFiles(server).length === 0, 'the temporary file is gone');
    expect((await server.anonymous().get('/api/health')).body).toEqual({ ok: true });
    const engineer = await server.signIn('engineer');
    expect((await engineer.get(`/api/revisions/${id}`)).body.evidence).toEqual([]);
  });

  it('when the server is stopped mid-upload, then the temporary file is removed', async () => {
    const dataDir = mkdtempSync(join(tmpdir(), 'vf-stop-'));
    try {
      const own = await startTestServer({}, {}, { dataDir });
      const { id } = await newDraft(own, 'Server stops', demoDesign);
      const cookie = await sessionCookie(own.url, 'engineer@fennel.test');
      const upload = startSlowUpload(own.url, id, cookie, 50 * 1024 * 1024);
      await upload.send(2 * 1024 * 1024);
      await until(() => tmpFiles(own).length === 1, 'the upload has a temporary file');
      await own.close();
      await until(() => tmpFiles(own).length === 0, 'the temporary file is gone');
    } finally {
      rmSync(dataDir, { recursive: true, force: true });
    }
  });

  it('when a complete upload finishes, then no temporary file remains and every sample was read', async () => {
    const { engineer, id } = await newDraft(server, 'Slow but complete', demoDesign);
    const cookie = await sessionCookie(server.url, 'engineer@fennel.test');
    const upload = startSlowUpload(server.url, id, cookie, 3 * 1024 * 1024);
    const res = await upload.finish();
    expect(res.status, res.body).toBe(201);
    expect(JSON.parse(res.body).analysis.samples).toBe(upload.rows());
    expect(tmpFiles(server)).toEqual([]);
    expect((await engineer.get(`/api/revisions/${id}`)).body.evidence).toHaveLength(1);
  });
});

describe('stored files nobody references', () => {
  it('when a draft removes its only reference to a file, then the file stays through the grace period and goes after it', async () => {
    const { engineer, id } = await newDraft(server, 'Released file', demoDesign);
    const added = await engineer.post(`/api/revisions/${id}/evidence`).field('kind', 'other').attach('file', Buffer.from('released bytes'), 'r.txt');
    const stored = async () => (await server.storedFiles('evidence')).includes(added.body.sha256);
    await engineer.delete(`/api/evidence/${added.body.id}`);
    expect(await server.housekeeping.sweep(false)).toMatchObject({ orphanEvidence: 0 });
    expect(await stored()).toBe(true);

    // A day and a bit later (the default grace period is 24 h).
    await server.ctx
      .db('evidence_release')
      .where({ sha256: added.body.sha256 })
      .update({ released_at: new Date(Date.now() - 25 * 3600_000).toISOString() });
    expect(await server.housekeeping.sweep(false)).toMatchObject({ orphanEvidence: 1 });
    expect(await stored()).toBe(false);
  });

  it('when the same bytes are attached again within the grace period, then the file is in use again and stays', async () => {
    const { engineer, id } = await newDraft(server, 'Re-attached file', demoDesign);
    const bytes = Buffer.from('bytes attached twice');
    const first = await engineer.post(`/api/revisions/${id}/evidence`).field('kind', 'other').attach('file', bytes, 'a.txt');
    await engineer.delete(`/api/evidence/${first.body.id}`);
    await engineer.post(`/api/revisions/${id}/evidence`).field('kind', 'other').attach('file', bytes, 'a-again.txt');
    await server.ctx.db('evidence_release').update({ released_at: new Date(0).toISOString() });
    await server.housekeeping.sweep(false);
    expect(await server.storedFiles('evidence')).toContain(first.body.sha256);
  });

  it('when a submitted revision references a file that a later draft drops, then the file is never removed', async () => {
    const { engineer, id, dossierId } = await newDraft(server, 'Frozen reference', demoDesign);
    const added = await engineer
      .post(`/api/revisions/${id}/evidence`)
      .field('kind', 'other')
      .attach('file', Buffer.from('kept for the record'), 'k.txt');
    await engineer.post(`/api/revisions/${id}/submit`);
    const reviewer = await server.signIn('reviewer');
    await reviewer.post(`/api/revisions/${id}/decision`).send({ decision: 'return', comment: 'Add the capture.' });
    const second = (await engineer.post(`/api/dossiers/${dossierId}/revisions`).send({ fromRevisionId: id })).body;
    const copied = second.evidence.find((e: { sha256: string }) => e.sha256 === added.body.sha256);
    await engineer.delete(`/api/evidence/${copied.id}`);
    await server.ctx.db('evidence_release').update({ released_at: new Date(0).toISOString() });
    await server.housekeeping.sweep(false);
    expect(await server.storedFiles('evidence')).toContain(added.body.sha256);
    const download = await engineer.get(`/api/evidence/${added.body.id}/file`);
    expect(download.status).toBe(200);
  });

  it('when a file was placed but its row never committed, then the next sweep removes it at once', async () => {
    const bytes = Buffer.from('placed by an upload that was killed before its commit');
    const sha = createHash('sha256').update(bytes).digest('hex');
    await server.stores.evidence.putBytes(sha, bytes);
    const signed = createHash('sha256').update('an approval that never committed').digest('hex');
    await server.stores.dossiers.putBytes(signed, Buffer.from('pdf bytes'));
    expect(await server.housekeeping.sweep(false)).toMatchObject({ orphanEvidence: 1, orphanSignedDossiers: 1 });
    expect(await server.storedFiles('evidence')).not.toContain(sha);
    expect(await server.storedFiles('dossiers')).not.toContain(signed);
  });
});
