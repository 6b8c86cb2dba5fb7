// The dossier PDF through the API: an approved revision's PDF is signed once at approval and served
// as stored bytes; anything else is an unsigned draft. Checked with poppler's pdfsig/pdftotext and
// qpdf, tools independent of the code that wrote the PDF.
import { createHash } from 'node:crypto';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type supertest from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { flat, pdfsig, pdftext, qpdfCheck } from '../pdf/poppler';
import { demoDesign, demoRequirement } from '../support/fixtures';
import { saveDraft, startTestServer, type TestServer } from '../support/test-server';

let server: TestServer;
beforeAll(async () => {
  server = await startTestServer();
});
afterAll(() => server.close());

async function download(agent: supertest.Agent, path: string): Promise<{ status: number; body: Buffer; headers: Record<string, string> }> {
  const res = await agent.get(path).buffer(true).parse((r, cb) => {
    const chunks: Buffer[] = [];
    r.on('data', (c: Buffer) => chunks.push(c));
    r.on('end', () => cb(null, Buffer.concat(chunks)));
  });
  return { status: res.status, body: res.body as Buffer, headers: res.headers as Record<string, string> };
}

function save(name: string, bytes: Buffer): string {
  const file = join(server.dataDir, name);
  writeFileSync(file, bytes);
  return file;
}

describe('dossier PDF through the API', () => {
  it('when a reviewer approves, then the signed PDF is stored once, validates with pdfsig and comes back byte-identical', async () => {
    const engineer = await server.signIn('engineer');
    const products = (await engineer.get('/api/products')).body;
    const dossier = (await engineer.post('/api/dossiers').send({ productId: products[0].id, title: 'Signed story', requirement: demoRequirement })).body;
    const id = dossier.revisions[0].id;
    await saveDraft(engineer, id, { design: demoDesign, notes: 'Bleeder across the bank.' });
    const csv = ['t,v', ...Array.from({ length: 400 }, (_, i) => `${(i * 0.02).toFixed(3)},${(622 * Math.exp(-(i * 0.02) / 1.3)).toFixed(3)}`)].join('\n');
    const evidence = await engineer.post(`/api/revisions/${id}/evidence`).field('kind', 'waveform').attach('file', Buffer.from(csv), 'bench.csv');
    expect(evidence.status).toBe(201);

    const draft = await download(engineer, `/api/revisions/${id}/dossier.pdf`);
    expect(draft.status).toBe(200);
    const draftFile = save('draft.pdf', draft.body);
    expect(flat(await pdftext(draftFile, 1))).toMatch(/NOT APPROVED — not for certification/);
    expect((await pdfsig(draftFile)).stdout + (await pdfsig(draftFile)).stderr).toMatch(/does not contain any signatures/);

    await engineer.post(`/api/revisions/${id}/submit`);
    const reviewer = await server.signIn('reviewer');
    const approved = await reviewer.post(`/api/revisions/${id}/decision`).send({ decision: 'approve', comment: 'Checked against the BOM.' });
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
    const sig = await pdfsig(file);
    expect(sig.stdout).toContain('Signature is Valid.');
    expect(sig.stdout).toContain('Total document signed');
    expect((await qpdfCheck(file)).code).toBe(0);
    const text = flat(await pdftext(file));
    expect(text).toContain('Marta Kowalczyk');
    expect(text).toContain(evidence.body.sha256);
    expect(text).not.toMatch(/NOT APPROVED/);
  });

  it('when a seeded approval has no stored PDF yet, then the first download signs and stores it', async () => {
    const viewer = await server.signIn('viewer');
    const seeded = await server.ctx.db('revision').where({ status: 'approved' }).whereNotExists(server.ctx.db('signed_dossier').whereRaw('signed_dossier.revision_id = revision.id')).first('id');
    const res = await download(viewer, `/api/revisions/${seeded.id}/dossier.pdf`);
    expect(res.status).toBe(200);
    expect((await pdfsig(save('seeded.pdf', res.body))).stdout).toContain('Signature is Valid.');
    expect(await server.ctx.db('signed_dossier').where({ revision_id: seeded.id }).first()).toBeTruthy();
  });
});
