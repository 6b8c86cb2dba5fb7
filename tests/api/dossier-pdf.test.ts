// The dossier PDF through the API: an approved revision's PDF is signed once at approval (in a worker
// thread, before the approval's transaction) and served as stored bytes; anything else is an unsigned
// draft. Checked with poppler's pdfsig (trusting the roots the API publishes, through certutil),
// pdftotext and qpdf, tools independent of the code that wrote the PDF.
import { createHash } from 'node:crypto';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type supertest from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { flat, pdfsig, pdftext, qpdfCheck } from '../pdf/poppler';
import { nssDatabase } from '../pdf/signature-tools';
import { demoDesign, demoRequirement } from '../support/fixtures';
import { DEMO_PASSWORD, saveDraft, startTestServer, type TestServer } from '../support/test-server';

let server: TestServer;
let nss: string;
beforeAll(async () => {
  server = await startTestServer();
  // What an assessor does: fetch the published trust anchors and trust them in the validator.
  const viewer = await server.signIn('viewer');
  const trust = await viewer.get('/api/signing/trust');
  expect(trust.status).toBe(200);
  expect(trust.headers['content-type']).toContain('application/pem-certificate-chain');
  const anchors = save('trust-anchors.pem', Buffer.from(trust.text));
  nss = await nssDatabase(join(server.dataDir, 'nss'), { 'Voltfall trust anchor': anchors });
});
afterAll(() => server.close());

async function download(agent: supertest.Agent, path: string): Promise<{ status: number; body: Buffer; headers: Record<string, string> }> {
  const res = await agent
    .get(path)
    .buffer(true)
    .parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
  return { status: res.status, body: res.body as Buffer, headers: res.headers as Record<string, string> };
}

/** A new dossier whose first revision (a passing design) the engineer has submitted. */
async function revisionInReview(title: string): Promise<{ engineer: supertest.Agent; reviewer: supertest.Agent; id: number }> {
  const engineer = await server.signIn('engineer');
  const reviewer = await server.signIn('reviewer');
  const products = (await engineer.get('/api/products')).body;
  const dossier = (await engineer.post('/api/dossiers').send({ productId: products[0].id, title, requirement: demoRequirement })).body;
  const id = dossier.revisions[0].id;
  await saveDraft(engineer, id, { design: demoDesign });
  await engineer.post(`/api/revisions/${id}/submit`);
  return { engineer, reviewer, id };
}

function save(name: string, bytes: Buffer): string {
  const file = join(server.dataDir, name);
  writeFileSync(file, bytes);
  return file;
}

describe('dossier PDF through the API', () => {
  // The first render starts the PDF worker thread, which loads its modules: slow on a loaded machine.
  it(
    'when a reviewer approves, then the signed PDF is stored once, validates with pdfsig and comes back byte-identical',
    { timeout: 180_000 },
    async () => {
      const engineer = await server.signIn('engineer');
      const products = (await engineer.get('/api/products')).body;
      const dossier = (await engineer.post('/api/dossiers').send({ productId: products[0].id, title: 'Signed story', requirement: demoRequirement }))
        .body;
      const id = dossier.revisions[0].id;
      await saveDraft(engineer, id, { design: demoDesign, notes: 'Bleeder across the bank.' });
      const csv = [
        't,v',
        ...Array.from({ length: 400 }, (_, i) => `${(i * 0.02).toFixed(3)},${(622 * Math.exp(-(i * 0.02) / 1.3)).toFixed(3)}`),
      ].join('\n');
      const evidence = await engineer.post(`/api/revisions/${id}/evidence`).field('kind', 'waveform').attach('file', Buffer.from(csv), 'bench.csv');
      expect(evidence.status).toBe(201);

      const draft = await download(engineer, `/api/revisions/${id}/dossier.pdf`);
      expect(draft.status).toBe(200);
      const draftFile = save('draft.pdf', draft.body);
      expect(flat(await pdftext(draftFile, 1))).toMatch(/NOT APPROVED — not for certification/);
      expect((await pdfsig(draftFile)).stdout + (await pdfsig(draftFile)).stderr).toMatch(/does not contain any signatures/);

      await engineer.post(`/api/revisions/${id}/submit`);
      const reviewer = await server.signIn('reviewer');
      const approved = await reviewer
        .post(`/api/revisions/${id}/decision`)
        .send({ decision: 'approve', comment: 'Checked against the BOM.', password: DEMO_PASSWORD });
      expect(approved.status).toBe(200);
      expect(approved.body.signedPdf.sha256).toMatch(/^[0-9a-f]{64}$/);

      const viewer = await server.signIn('viewer');
      const first = await download(viewer, `/api/revisions/${id}/dossier.pdf`);
      const second = await download(viewer, `/api/revisions/${id}/dossier.pdf`);
      expect(first.status).toBe(200);
      const digest = createHash('sha256').update(first.body).digest('hex');
      expect(digest).toBe(approved.body.signedPdf.sha256);
      expect(second.body.equals(first.body)).toBe(true);

      const file = save('approved.pdf', first.body);
      const sig = await pdfsig(file, nss);
      expect(sig.stdout).toContain('Signature is Valid.');
      expect(sig.stdout).toContain('Certificate is Trusted.');
      expect(sig.stdout).toContain('Signature Type: ETSI.CAdES.detached');
      expect((await qpdfCheck(file)).code).toBe(0);
      const text = flat(await pdftext(file));
      expect(text).toContain('Marta Kowalczyk');
      // The PDF was built with the pending decision: it shows the approval as stored afterwards.
      const decided = (await viewer.get(`/api/revisions/${id}`)).body;
      expect(decided.status).toBe('approved');
      expect(text).toContain('approved as reviewer');
      // The audit chain records the signed file's hash with the approval.
      const audit = (await reviewer.get(`/api/audit?dossierId=${dossier.id}`)).body;
      const approval = audit.events.find((e: { action: string }) => e.action === 'revision.approved');
      expect(approval.payload.signedDossierSha256).toBe(digest);
      expect(text).toContain(evidence.body.sha256);
      expect(text).not.toMatch(/NOT APPROVED/);
    },
  );

  it('when a seeded approval has no stored PDF yet, then the first download signs and stores it', async () => {
    const viewer = await server.signIn('viewer');
    const seeded = await server.ctx
      .db('revision')
      .where({ status: 'approved' })
      .whereNotExists(server.ctx.db('signed_dossier').whereRaw('signed_dossier.revision_id = revision.id'))
      .first('id');
    const res = await download(viewer, `/api/revisions/${seeded.id}/dossier.pdf`);
    expect(res.status).toBe(200);
    const sig = (await pdfsig(save('seeded.pdf', res.body), nss)).stdout;
    expect(sig).toContain('Signature is Valid.');
    expect(sig).toContain('Certificate is Trusted.');
    expect(await server.ctx.db('signed_dossier').where({ revision_id: seeded.id }).first()).toBeTruthy();
  });

  it('when two approvals of one revision race, then one wins with its signed PDF, the other gets 409 and its PDF is discarded', async () => {
    const { reviewer, id } = await revisionInReview('Race story');
    const filesBefore = (await server.storedFiles('dossiers')).length;

    const body = { decision: 'approve', comment: 'Race.', password: 'voltfall-demo' };
    const answers = await Promise.all([
      reviewer.post(`/api/revisions/${id}/decision`).send(body),
      reviewer.post(`/api/revisions/${id}/decision`).send(body),
    ]);
    expect(answers.map((a) => a.status).sort()).toEqual([200, 409]);

    const rows = await server.ctx.db('signed_dossier').where({ revision_id: id });
    expect(rows).toHaveLength(1);
    expect(await server.ctx.db('review_decision').where({ revision_id: id })).toHaveLength(1);
    const files = await server.storedFiles('dossiers');
    expect(server.stagingFiles('dossiers')).toEqual([]);
    expect(files).toHaveLength(filesBefore + 1);
    expect(files).toContain(rows[0].sha256);
  });

  it('when the approval cannot be signed, then nothing is recorded and the revision stays in review', async () => {
    const { engineer, reviewer, id } = await revisionInReview('No TSA story');
    // The time-stamping authority goes away: signing fails before the approval's transaction.
    const setup = await server.ctx.signing.setup();
    const tsaUrl = setup.tsaUrl;
    setup.tsaUrl = 'http://127.0.0.1:9/';
    try {
      const res = await reviewer.post(`/api/revisions/${id}/decision`).send({ decision: 'approve', comment: 'No time.', password: 'voltfall-demo' });
      expect(res.status).toBe(503);
      expect(res.body.error.code).toBe('signing_unavailable');
    } finally {
      setup.tsaUrl = tsaUrl;
    }
    expect((await engineer.get(`/api/revisions/${id}`)).body.status).toBe('in_review');
    expect(await server.ctx.db('review_decision').where({ revision_id: id })).toHaveLength(0);
    expect(await server.ctx.db('signed_dossier').where({ revision_id: id })).toHaveLength(0);
    expect(server.stagingFiles('dossiers')).toEqual([]);
  });
});
