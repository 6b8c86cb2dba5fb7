// Viewers (external assessors, managers) see approved work only (docs/ARCHITECTURE.md §3): drafts, in-review and
// returned revisions, their evidence, diffs and draft PDFs answer them 404, and every list they get
// shows approved revisions only. The demo seed holds one dossier in each state.
import type supertest from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoDesign, demoRequirement } from '../support/fixtures';
import { DEMO_PASSWORD, saveDraft, startTestServer, type TestServer } from '../support/test-server';

let server: TestServer;
let viewer: supertest.Agent;
let engineer: supertest.Agent;
const seeded: Record<'approved' | 'draft' | 'in_review' | 'returned', { id: number; dossierId: number }> = {} as never;

beforeAll(async () => {
  server = await startTestServer();
  viewer = await server.signIn('viewer');
  engineer = await server.signIn('engineer');
  for (const status of ['approved', 'draft', 'in_review', 'returned'] as const) {
    const row = await server.ctx.db('revision').where({ status }).orderBy('id').first('id', 'dossier_id');
    seeded[status] = { id: row.id, dossierId: row.dossier_id };
  }
});
afterAll(() => server.close());

describe('a viewer and unfinished work', () => {
  for (const status of ['draft', 'in_review', 'returned'] as const) {
    it(`when a viewer opens a ${status} revision, its diff or its PDF, then each answers 404 as if it did not exist`, async () => {
      const { id } = seeded[status];
      for (const path of [`/api/revisions/${id}`, `/api/revisions/${id}/diff`, `/api/revisions/${id}/dossier.pdf`]) {
        const res = await viewer.get(path);
        expect(res.status, path).toBe(404);
      }
      // The team sees it.
      expect((await engineer.get(`/api/revisions/${id}`)).status).toBe(200);
    });
  }

  it("when a viewer asks for a draft's evidence file, then 404; once the revision is approved, the file is theirs to read", async () => {
    const products = (await engineer.get('/api/products')).body;
    const dossier = (
      await engineer.post('/api/dossiers').send({ productId: products[0].id, title: 'Evidence on the way to approval', requirement: demoRequirement })
    ).body;
    const id = dossier.revisions[0].id;
    await saveDraft(engineer, id, { design: demoDesign });
    const evidence = (
      await engineer.post(`/api/revisions/${id}/evidence`).field('kind', 'other').attach('file', Buffer.from('bench notes'), 'notes.txt')
    ).body;
    expect((await viewer.get(`/api/evidence/${evidence.id}/file`)).status).toBe(404);
    expect((await viewer.get(`/api/dossiers/${dossier.id}`)).status).toBe(404);

    await engineer.post(`/api/revisions/${id}/submit`);
    expect((await viewer.get(`/api/evidence/${evidence.id}/file`)).status).toBe(404);
    const reviewer = await server.signIn('reviewer');
    expect((await reviewer.post(`/api/revisions/${id}/decision`).send({ decision: 'approve', password: DEMO_PASSWORD })).status).toBe(200);
    expect((await viewer.get(`/api/evidence/${evidence.id}/file`)).status).toBe(200);
    expect((await viewer.get(`/api/revisions/${id}/dossier.pdf`)).status).toBe(200);
    expect((await viewer.get(`/api/dossiers/${dossier.id}`)).status).toBe(200);
  });
});

describe('what a viewer lists', () => {
  it('the dossier list holds only dossiers with an approved revision, and "latest" is the latest approved one', async () => {
    const list = (await viewer.get('/api/dossiers')).body.items as Array<{ id: number; latest: { id: number; status: string } }>;
    const ids = list.map((d) => d.id);
    expect(ids).toContain(seeded.approved.dossierId);
    expect(ids).not.toContain(seeded.in_review.dossierId);
    expect(ids).not.toContain(seeded.returned.dossierId);
    expect(list.every((d) => d.latest.status === 'approved')).toBe(true);
    // The seeded approved dossier also has a newer draft; the team's list shows that one as latest.
    expect(list.find((d) => d.id === seeded.approved.dossierId)!.latest.id).toBe(seeded.approved.id);
    const team = (await engineer.get('/api/dossiers')).body.items as Array<{ id: number; latest: { id: number } }>;
    expect(team.find((d) => d.id === seeded.approved.dossierId)!.latest.id).toBe(seeded.draft.id);
  });

  it('one dossier lists only its approved revisions; a revision names only approved siblings', async () => {
    const dossier = (await viewer.get(`/api/dossiers/${seeded.approved.dossierId}`)).body;
    expect(dossier.revisions.map((r: { status: string }) => r.status)).toEqual(['approved']);
    const revision = (await viewer.get(`/api/revisions/${seeded.approved.id}`)).body;
    expect(revision.siblings.map((s: { status: string }) => s.status)).toEqual(['approved']);
    expect((await viewer.get(`/api/dossiers/${seeded.in_review.dossierId}`)).status).toBe(404);
  });

  it('products count and list only the dossiers a viewer may open', async () => {
    const product = (await viewer.get('/api/products')).body as Array<{ id: number; dossierCount: number }>;
    const teamProducts = (await engineer.get('/api/products')).body as Array<{ id: number; dossierCount: number }>;
    const wren = await server.ctx.db('dossier').where({ id: seeded.in_review.dossierId }).first('product_id');
    expect(product.find((p) => p.id === wren.product_id)!.dossierCount).toBe(0);
    expect(teamProducts.find((p) => p.id === wren.product_id)!.dossierCount).toBeGreaterThan(0);
    expect((await viewer.get(`/api/products/${wren.product_id}`)).body.dossiers).toEqual([]);
  });

  it('the overview shows a viewer approved revisions only, even ones they once drafted as an engineer', async () => {
    const admin = await server.signIn('admin');
    const users = (await admin.get('/api/users')).body as Array<{ id: string; email: string }>;
    const former = users.find((u) => u.email === 'engineer2@fennel.test')!;
    const author = await server.signIn('engineer2');
    const products = (await author.get('/api/products')).body;
    await author.post('/api/dossiers').send({ productId: products[0].id, title: 'Drafted before a role change', requirement: demoRequirement });
    expect((await author.get('/api/overview')).body.myDrafts.items.length).toBeGreaterThan(0);

    await admin.patch(`/api/users/${former.id}`).send({ role: 'viewer' });
    const overview = (await author.get('/api/overview')).body as Record<string, { items: Array<{ status: string }>; total: number }>;
    expect(overview.myDrafts.items).toEqual([]);
    expect(overview.returnedToMe.items).toEqual([]);
    expect(overview.awaitingMyReview.items).toEqual([]);
    expect(overview.recentlyApproved.items.length).toBeGreaterThan(0);
    expect(overview.recentlyApproved.items.every((r) => r.status === 'approved')).toBe(true);
    // Paging a list the viewer may not see answers it empty too.
    expect((await author.get('/api/overview/myDrafts')).body).toEqual({ items: [], nextCursor: null, total: 0 });
    await admin.patch(`/api/users/${former.id}`).send({ role: 'engineer' });
  });

  it('a diff for a viewer compares approved revisions only: by default the previous approved one, never a returned one', async () => {
    const products = (await engineer.get('/api/products')).body;
    const reviewer = await server.signIn('reviewer');
    const dossier = (
      await engineer.post('/api/dossiers').send({ productId: products[0].id, title: 'Approved, returned, approved', requirement: demoRequirement })
    ).body;
    const r1 = dossier.revisions[0].id;
    await saveDraft(engineer, r1, { design: demoDesign });
    await engineer.post(`/api/revisions/${r1}/submit`);
    await reviewer.post(`/api/revisions/${r1}/decision`).send({ decision: 'approve', password: DEMO_PASSWORD });
    const r2 = (await engineer.post(`/api/dossiers/${dossier.id}/revisions`).send({ fromRevisionId: r1 })).body.id;
    await saveDraft(engineer, r2, { design: { ...demoDesign, bleeder: { ...demoDesign.bleeder, resistance: 90_000 } } });
    await engineer.post(`/api/revisions/${r2}/submit`);
    await reviewer.post(`/api/revisions/${r2}/decision`).send({ decision: 'return', comment: 'Keep 100 kΩ.' });
    const r3 = (await engineer.post(`/api/dossiers/${dossier.id}/revisions`).send({ fromRevisionId: r2 })).body.id;
    await saveDraft(engineer, r3, { design: { ...demoDesign, bleeder: { ...demoDesign.bleeder, resistance: 82_000 } } });
    await engineer.post(`/api/revisions/${r3}/submit`);
    expect((await reviewer.post(`/api/revisions/${r3}/decision`).send({ decision: 'approve', password: DEMO_PASSWORD })).status).toBe(200);

    const team = (await engineer.get(`/api/revisions/${r3}/diff`)).body;
    expect(team.against.number).toBe(2);
    const forViewer = await viewer.get(`/api/revisions/${r3}/diff`);
    expect(forViewer.status).toBe(200);
    expect(forViewer.body.against.number).toBe(1);
    expect(forViewer.body.inputs.find((c: { path: string }) => c.path === 'bleeder.resistance')).toMatchObject({ from: '100 kΩ', to: '82 kΩ' });
    expect((await viewer.get(`/api/revisions/${r3}/diff?against=${r2}`)).status).toBe(404);
  });
});
