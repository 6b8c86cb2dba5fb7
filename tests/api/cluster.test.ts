// The cluster: two HTTP workers share one port and one SQLite file; the primary alone runs the local
// mail server and the delivery loop, so a submission is e-mailed exactly once.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import supertest from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startCluster, type RunningCluster } from '../../server/cluster';
import { openDatabase, type Db } from '../../server/db/knex';
import { demoDesign, demoRequirement } from '../support/fixtures';
import { DEMO_PASSWORD, demoEmail } from '../support/test-server';

let cluster: RunningCluster;
let db: Db;
let dataDir: string;

beforeAll(async () => {
  dataDir = mkdtempSync(join(tmpdir(), 'vf-cluster-'));
  cluster = await startCluster(
    {
      ...process.env,
      NODE_ENV: 'test',
      PORT: '0',
      HOST: '127.0.0.1',
      VOLTFALL_DATA_DIR: dataDir,
      FAKE_SMTP_PORT: '0',
      LOG_LEVEL: 'silent',
      SIGN_IN_LIMIT_PER_15_MIN: '1000',
    },
    2,
  );
  db = await openDatabase(dataDir, { migrate: false });
});
afterAll(async () => {
  await db?.destroy();
  await cluster?.close();
  rmSync(dataDir, { recursive: true, force: true });
});

async function signIn(role: 'engineer' | 'reviewer') {
  const agent = supertest.agent(cluster.url);
  agent.set('Origin', cluster.url);
  const res = await agent.post('/api/auth/sign-in').send({ email: demoEmail(role), password: DEMO_PASSWORD });
  expect(res.status).toBe(200);
  return agent;
}

describe('a cluster of two workers', () => {
  it('when an engineer submits through the workers, then the reviewer gets exactly one e-mail, sent by the primary', async () => {
    expect(cluster.workers()).toHaveLength(2);
    const engineer = await signIn('engineer');
    const products = (await engineer.get('/api/products')).body;
    const dossier = (await engineer.post('/api/dossiers').send({ productId: products[0].id, title: 'Cluster story', requirement: demoRequirement }))
      .body;
    const id = dossier.revisions[0].id;
    // A new dossier's first draft is at version 1.
    expect((await engineer.patch(`/api/revisions/${id}`).send({ design: demoDesign, version: 1 })).status).toBe(200);
    expect((await engineer.post(`/api/revisions/${id}/submit`)).status).toBe(200);

    const mailFor = () => db('mail_outbox').where('subject', 'like', '%Cluster story%').select('to');
    const deadline = Date.now() + 20_000;
    while ((await mailFor()).length === 0 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 100));
    // Past one more round of the primary's 5 s delivery loop, where a second sender would also have sent it.
    await new Promise((r) => setTimeout(r, 6_000));
    const mails = await mailFor();
    expect(mails.map((m) => m.to)).toEqual([demoEmail('reviewer')]);
    expect(await db('mail_queue').where({ status: 'pending' }).count({ n: '*' }).first()).toEqual({ n: 0 });
  });

  it('when both workers take concurrent creates and saves on one file, then every request succeeds and every save is kept', async () => {
    const engineer = await signIn('engineer');
    const products = (await engineer.get('/api/products')).body;
    const dossiers = await Promise.all(
      Array.from({ length: 8 }, (_, i) =>
        engineer.post('/api/dossiers').send({ productId: products[0].id, title: `Concurrent ${i}`, requirement: demoRequirement }),
      ),
    );
    expect(dossiers.map((r) => r.status)).toEqual(Array(8).fill(201));
    const saves = await Promise.all(
      dossiers.map((d) =>
        engineer.patch(`/api/revisions/${d.body.revisions[0].id}`).send({ design: demoDesign, notes: `note ${d.body.id}`, version: 1 }),
      ),
    );
    expect(saves.map((r) => r.status)).toEqual(Array(8).fill(200));
    const notes = await db('revision')
      .whereIn(
        'id',
        dossiers.map((d) => d.body.revisions[0].id),
      )
      .pluck('notes');
    expect(notes.sort()).toEqual(dossiers.map((d) => `note ${d.body.id}`).sort());
  });
});
