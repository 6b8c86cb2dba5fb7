// Optimistic concurrency on drafts: every stored change moves the revision's version on, and a write
// based on an older version is refused with the revision as it is now — nothing is overwritten silently.
import type supertest from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoDesign } from '../support/fixtures';
import { DEMO_PASSWORD, newDraft, startTestServer, type TestServer } from '../support/test-server';

let server: TestServer;
beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server.close());

const draft = (title: string) => newDraft(server, title);

const version = async (agent: supertest.Agent, id: number) => (await agent.get(`/api/revisions/${id}`)).body.version as number;

describe('versions of a draft', () => {
  it('when a draft changes in any stored way, then its version moves on by one each time', async () => {
    const { engineer, id } = await draft('Version counting');
    expect(await version(engineer, id)).toBe(1);

    const saved = await engineer.patch(`/api/revisions/${id}`).send({ version: 1, design: demoDesign });
    expect(saved.status).toBe(200);
    expect(saved.body.version).toBe(2);
    const notes = await engineer.patch(`/api/revisions/${id}`).send({ version: 2, notes: 'Bleeders across the bank.' });
    expect(notes.body.version).toBe(3);

    const added = await engineer
      .post(`/api/revisions/${id}/evidence`)
      .field('kind', 'other')
      .field('version', '3')
      .attach('file', Buffer.from('bench log 1'), 'log.txt');
    expect(added.status).toBe(201);
    expect(added.body.revisionVersion).toBe(4);
    const removed = await engineer.delete(`/api/evidence/${added.body.id}?version=4`);
    expect(removed.body).toEqual({ ok: true, revisionVersion: 5 });
    expect(await version(engineer, id)).toBe(5);

    const submitted = await engineer.post(`/api/revisions/${id}/submit`).send({ version: 5 });
    expect(submitted.status).toBe(200);
    expect(submitted.body).toMatchObject({ status: 'in_review', version: 6 });
  });

  it('when a change does not say which version it is based on, then 428 and nothing is saved', async () => {
    const { engineer, id } = await draft('No version');
    const res = await engineer.patch(`/api/revisions/${id}`).send({ notes: 'from an old client' });
    expect(res.status).toBe(428);
    expect(res.body.error).toMatchObject({ code: 'version_required', fields: [{ path: 'version' }] });
    const after = (await engineer.get(`/api/revisions/${id}`)).body;
    expect(after).toMatchObject({ version: 1, notes: '' });
  });

  it('when the version is not a positive whole number, then 400 names it', async () => {
    const { engineer, id } = await draft('Odd versions');
    for (const bad of ['1', 1.5, 0, -1, null, [1]]) {
      const res = await engineer.patch(`/api/revisions/${id}`).send({ version: bad, notes: 'x' });
      expect(res.status, JSON.stringify(bad)).toBe(400);
      expect(
        res.body.error.fields.map((f: { path: string }) => f.path),
        JSON.stringify(bad),
      ).toContain('version');
    }
    expect(await version(engineer, id)).toBe(1);
  });
});

describe('two tabs on one draft', () => {
  it('when the second tab saves over a version the first tab already changed, then 409 with the stored revision, and a save on top of it goes through', async () => {
    const { engineer, id } = await draft('Two tabs');
    const tabA = engineer;
    const tabB = await server.signIn('engineer');
    const a = await tabA.patch(`/api/revisions/${id}`).send({ version: 1, design: demoDesign, notes: 'A: 100 kΩ bleeders' });
    expect(a.status).toBe(200);

    const stale = await tabB.patch(`/api/revisions/${id}`).send({ version: 1, notes: 'B: typed from an old copy' });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('stale_version');
    expect(stale.body.error.message).toMatch(/changed elsewhere/);
    expect(stale.body.current).toMatchObject({ id, version: 2, notes: 'A: 100 kΩ bleeders', design: demoDesign });
    expect((await tabA.get(`/api/revisions/${id}`)).body.notes).toBe('A: 100 kΩ bleeders');

    // B has seen A's change and keeps its own notes on top of it.
    const rebased = await tabB.patch(`/api/revisions/${id}`).send({ version: stale.body.current.version, notes: 'B: typed from an old copy' });
    expect(rebased.status).toBe(200);
    expect(rebased.body).toMatchObject({ version: 3, notes: 'B: typed from an old copy', design: demoDesign });
  });

  it('when an abandoned older save arrives after a newer acknowledged one, then it is refused, not applied', async () => {
    const { engineer, id } = await draft('Late request');
    const newer = await engineer.patch(`/api/revisions/${id}`).send({ version: 1, notes: 'newer, acknowledged' });
    expect(newer.status).toBe(200);
    const late = await engineer.patch(`/api/revisions/${id}`).send({ version: 1, notes: 'older, sent first, arrived last' });
    expect(late.status).toBe(409);
    expect((await engineer.get(`/api/revisions/${id}`)).body.notes).toBe('newer, acknowledged');
  });

  it('when twenty saves based on the same version race, then exactly one is stored and nineteen are told it is stale', async () => {
    const { engineer, id } = await draft('Race of saves');
    const results = await Promise.all(
      Array.from({ length: 20 }, (_, i) => engineer.patch(`/api/revisions/${id}`).send({ version: 1, notes: `writer ${i}` })),
    );
    const statuses = results.map((r) => r.status);
    expect(statuses.filter((s) => s === 200)).toHaveLength(1);
    expect(statuses.filter((s) => s === 409)).toHaveLength(19);
    const winner = results.find((r) => r.status === 200)!.body.notes;
    expect((await engineer.get(`/api/revisions/${id}`)).body).toMatchObject({ version: 2, notes: winner });
  });
});

describe('evidence and submission follow the same rule', () => {
  it('when evidence is added or removed from an older version, then 409 and the evidence list is as it was', async () => {
    const { engineer, id } = await draft('Stale evidence');
    await engineer.patch(`/api/revisions/${id}`).send({ version: 1, notes: 'moved on' });
    const before = (await engineer.get(`/api/revisions/${id}`)).body.evidence.length;

    const upload = await engineer
      .post(`/api/revisions/${id}/evidence`)
      .field('version', '1')
      .field('kind', 'other')
      .attach('file', Buffer.from('stale upload'), 'stale.txt');
    expect(upload.status).toBe(409);
    expect(upload.body.error.code).toBe('stale_version');
    expect(upload.body.current.version).toBe(2);
    expect((await engineer.get(`/api/revisions/${id}`)).body.evidence).toHaveLength(before);

    // Without a version the upload is taken as before (the field is optional for uploads).
    const fresh = await engineer
      .post(`/api/revisions/${id}/evidence`)
      .field('kind', 'other')
      .attach('file', Buffer.from('current upload'), 'current.txt');
    expect(fresh.status).toBe(201);
    const removal = await engineer.delete(`/api/evidence/${fresh.body.id}?version=2`);
    expect(removal.status).toBe(409);
    expect((await engineer.get(`/api/revisions/${id}`)).body.evidence).toHaveLength(before + 1);
    expect((await engineer.delete(`/api/evidence/${fresh.body.id}?version=0x3`)).status).toBe(400);
  });

  it('when the author submits from an older version, then 409 and the draft stays a draft', async () => {
    const { engineer, id } = await draft('Stale submit');
    await engineer.patch(`/api/revisions/${id}`).send({ version: 1, design: demoDesign });
    const res = await engineer.post(`/api/revisions/${id}/submit`).send({ version: 1 });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('stale_version');
    expect((await engineer.get(`/api/revisions/${id}`)).body.status).toBe('draft');
  });
});

describe('versions in the database itself', () => {
  it("when someone changes versions with SQL, then a draft's may move and a submitted revision's may not", async () => {
    const { engineer, id } = await draft('Versions in SQL');
    const other = await draft('Versions in SQL, submitted');
    await other.engineer.patch(`/api/revisions/${other.id}`).send({ version: 1, design: demoDesign });
    await other.engineer.post(`/api/revisions/${other.id}/submit`);
    // SQL sent past the API (the app's own connection, SQLite or PostgreSQL).
    expect(await server.ctx.db('revision').where({ id }).increment('version', 1)).toBe(1);
    await expect(server.ctx.db('revision').where({ id: other.id }).increment('version', 1)).rejects.toThrow(/frozen/);
    expect(await version(engineer, id)).toBe(2);
  });
});

describe('comments belong to the review', () => {
  it('when a revision is a draft, approved or returned, then a comment is refused with 409 (by the API and by the database)', async () => {
    const reviewer = await server.signIn('reviewer');
    const early = await draft('Comment on a draft');
    expect((await early.engineer.post(`/api/revisions/${early.id}/comments`).send({ body: 'early remark' })).status).toBe(409);

    const approved = await draft('Comment after approval');
    await approved.engineer.patch(`/api/revisions/${approved.id}`).send({ version: 1, design: demoDesign });
    await approved.engineer.post(`/api/revisions/${approved.id}/submit`);
    const during = await reviewer.post(`/api/revisions/${approved.id}/comments`).send({ body: 'Which TCR corner?' });
    expect(during.status).toBe(201);
    await reviewer.post(`/api/revisions/${approved.id}/decision`).send({ decision: 'approve', comment: 'ok', password: DEMO_PASSWORD });
    const after = await reviewer.post(`/api/revisions/${approved.id}/comments`).send({ body: 'late remark' });
    expect(after.status).toBe(409);
    expect(after.body.error.message).toMatch(/approved/);

    const returned = await draft('Comment after return');
    await returned.engineer.patch(`/api/revisions/${returned.id}`).send({ version: 1, design: demoDesign });
    await returned.engineer.post(`/api/revisions/${returned.id}/submit`);
    await reviewer.post(`/api/revisions/${returned.id}/decision`).send({ decision: 'return', comment: 'Lower R.' });
    expect((await returned.engineer.post(`/api/revisions/${returned.id}/comments`).send({ body: 'but why' })).status).toBe(409);

    const comments = (await reviewer.get(`/api/revisions/${approved.id}`)).body.comments;
    expect(comments.map((c: { body: string }) => c.body)).toEqual(['Which TCR corner?']);
    const author = await server.ctx.db('user').where({ email: 'reviewer@fennel.test' }).first('id');
    await expect(
      server.ctx.db('review_comment').insert({ revision_id: approved.id, author_id: author.id, body: 'sql remark', created_at: 'now' }),
    ).rejects.toThrow(/frozen/);
  });
});
