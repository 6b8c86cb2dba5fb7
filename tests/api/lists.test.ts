// Paged lists: the dossier list, the review queue and the Overview lists answer { items, nextCursor,
// total }, filtered and ordered in SQL, with cursors that stay put when new rows arrive.
import type supertest from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoDesign, demoRequirement, failingDesign } from '../support/fixtures';
import { saveDraft, startTestServer, type TestServer } from '../support/test-server';

interface Page<T> {
  items: T[];
  nextCursor: string | null;
  total: number;
}
interface DossierItem {
  id: number;
  title: string;
  productId: number;
  latest: { id: number; status: string; verdict: string } | null;
}

let server: TestServer;
let engineer: supertest.Agent;
let reviewer: supertest.Agent;
let products: Array<{ id: number; name: string; modelNumber: string }>;

async function createDossier(
  title: string,
  productId = products[0].id,
  requirement: object = demoRequirement,
): Promise<{ id: number; draftId: number }> {
  const res = await engineer.post('/api/dossiers').send({ productId, title, requirement });
  expect(res.status).toBe(201);
  return { id: res.body.id, draftId: res.body.revisions[0].id };
}

/** Follows nextCursor to the end and returns every item in the order the pages gave them. */
async function walk<T>(agent: supertest.Agent, path: string, limit: number): Promise<{ items: T[]; pages: number; totals: number[] }> {
  const items: T[] = [];
  const totals: number[] = [];
  let cursor: string | null = null;
  let pages = 0;
  do {
    const sep = path.includes('?') ? '&' : '?';
    const res = await agent.get(`${path}${sep}limit=${limit}${cursor ? `&cursor=${cursor}` : ''}`);
    expect(res.status).toBe(200);
    const page = res.body as Page<T>;
    expect(page.items.length).toBeLessThanOrEqual(limit);
    items.push(...page.items);
    totals.push(page.total);
    cursor = page.nextCursor;
    pages += 1;
  } while (cursor);
  return { items, pages, totals };
}

beforeAll(async () => {
  server = await startTestServer();
  engineer = await server.signIn('engineer');
  reviewer = await server.signIn('reviewer');
  products = (await engineer.get('/api/products')).body;
  for (let i = 1; i <= 7; i += 1) await createDossier(`Paging dossier ${i}`);
});
afterAll(() => server.close());

describe('GET /api/dossiers pages', () => {
  it('answers the first 50 newest first with the total when no limit is given', async () => {
    const res = await engineer.get('/api/dossiers');
    expect(res.status).toBe(200);
    const page = res.body as Page<DossierItem>;
    const count = await server.ctx.db('dossier').count({ n: '*' }).first();
    expect(page.total).toBe(Number(count!.n));
    expect(page.items.length).toBe(Math.min(50, page.total));
    const ids = page.items.map((d) => d.id);
    expect(ids).toEqual([...ids].sort((a, b) => b - a));
    expect(page.nextCursor).toBe(page.total > 50 ? expect.any(String) : null);
  });

  it('walks every dossier exactly once, page after page, newest first', async () => {
    const all = await server.ctx.db('dossier').orderBy('id', 'desc').pluck('id');
    const { items, pages } = await walk<DossierItem>(engineer, '/api/dossiers', 3);
    expect(items.map((d) => d.id)).toEqual(all);
    expect(pages).toBe(Math.ceil(all.length / 3));
  });

  it('keeps its place when dossiers are created between pages: nothing repeated, nothing skipped', async () => {
    const before = (await engineer.get('/api/dossiers?limit=4')).body as Page<DossierItem>;
    const newer = await createDossier('Created while paging');
    const next = (await engineer.get(`/api/dossiers?limit=4&cursor=${before.nextCursor}`)).body as Page<DossierItem>;
    expect(next.items[0].id).toBeLessThan(before.items[3].id);
    const expected = await server.ctx.db('dossier').where('id', '<', before.items[3].id).orderBy('id', 'desc').limit(4).pluck('id');
    expect(next.items.map((d) => d.id)).toEqual(expected);
    expect(next.items.map((d) => d.id)).not.toContain(newer.id);
    expect(next.total).toBe(before.total + 1);
    const fresh = (await engineer.get('/api/dossiers?limit=4')).body as Page<DossierItem>;
    expect(fresh.items[0].id).toBe(newer.id);
  });

  it('takes limits 1 and 200 and refuses 0, 201 and a fraction with 400 naming the limit', async () => {
    expect((await engineer.get('/api/dossiers?limit=1')).body.items).toHaveLength(1);
    expect((await engineer.get('/api/dossiers?limit=200')).status).toBe(200);
    for (const bad of ['0', '201', '2.5', 'ten']) {
      const res = await engineer.get(`/api/dossiers?limit=${bad}`);
      expect(res.status, `limit=${bad}`).toBe(400);
      expect(res.body.error.fields.map((f: { path: string }) => f.path)).toContain('limit');
    }
  });

  it('refuses a cursor it did not give out with 400 naming the cursor', async () => {
    for (const bad of ['not-a-cursor', Buffer.from('{"id":1}').toString('base64url'), Buffer.from('["x","y"]').toString('base64url')]) {
      const res = await engineer.get(`/api/dossiers?cursor=${bad}`);
      expect(res.status).toBe(400);
      expect(res.body.error.fields[0].path).toBe('cursor');
    }
  });

  it('filters by product, with the total of the filtered list', async () => {
    const other = products[1];
    const mine = await createDossier('Second-product dossier', other.id);
    const page = (await engineer.get(`/api/dossiers?productId=${other.id}`)).body as Page<DossierItem>;
    const expected = await server.ctx.db('dossier').where({ product_id: other.id }).orderBy('id', 'desc').pluck('id');
    expect(page.items.map((d) => d.id)).toEqual(expected);
    expect(page.items.map((d) => d.id)).toContain(mine.id);
    expect(page.total).toBe(expected.length);
    expect((await engineer.get('/api/dossiers?productId=0')).status).toBe(400);
  });

  it("filters by the status of each dossier's latest revision", async () => {
    const { id, draftId } = await createDossier('Submitted for the status filter');
    await saveDraft(engineer, draftId, { design: demoDesign });
    await engineer.post(`/api/revisions/${draftId}/submit`);
    const inReview = await walk<DossierItem>(engineer, '/api/dossiers?status=in_review', 2);
    expect(inReview.items.map((d) => d.id)).toContain(id);
    expect(inReview.items.every((d) => d.latest?.status === 'in_review')).toBe(true);
    expect(inReview.totals[0]).toBe(inReview.items.length);
    const drafts = (await engineer.get('/api/dossiers?status=draft&limit=200')).body as Page<DossierItem>;
    expect(drafts.items.map((d) => d.id)).not.toContain(id);
    expect((await engineer.get('/api/dossiers?status=frozen')).status).toBe(400);
  });

  it('matches q against the title, the product name, the model number and the requirement reference, ignoring case', async () => {
    const byTitle = await createDossier('Heatsink Bleeder QZX-title');
    const byReference = await createDossier('Plain title', products[0].id, { ...demoRequirement, reference: 'Clause 7.3 of plan QZX-ref' });
    const search = async (q: string) => (await engineer.get(`/api/dossiers?q=${encodeURIComponent(q)}&limit=200`)).body as Page<DossierItem>;
    expect((await search('qzx-TITLE')).items.map((d) => d.id)).toEqual([byTitle.id]);
    expect((await search('qzx-ref')).items.map((d) => d.id)).toEqual([byReference.id]);
    const byProduct = await search(products[1].name.slice(0, 8).toUpperCase());
    expect(byProduct.items.length).toBeGreaterThan(0);
    expect(byProduct.items.every((d) => d.productId === products[1].id)).toBe(true);
    const byModel = await search(products[1].modelNumber);
    expect(byModel.items.map((d) => d.id)).toEqual(byProduct.items.map((d) => d.id));
    // % and _ are the user's characters, not wildcards.
    expect((await search('%')).total).toBe(0);
    expect((await search('QZX')).total).toBe(2);
  });
});

describe('the review queue and the Overview lists page the same way', () => {
  it('pages the review queue oldest submission first, marking what this reviewer may decide', async () => {
    const submitted: number[] = [];
    for (let i = 0; i < 3; i += 1) {
      const { draftId } = await createDossier(`Queue ${i}`);
      await saveDraft(engineer, draftId, { design: i === 1 ? failingDesign : demoDesign });
      await engineer.post(`/api/revisions/${draftId}/submit`);
      submitted.push(draftId);
    }
    const { items, totals } = await walk<{ id: number; submittedAt: string; verdict: string; mayDecide: boolean }>(reviewer, '/api/reviews', 2);
    const expected = await server.ctx
      .db('revision')
      .where({ status: 'in_review' })
      .orderBy([{ column: 'submitted_at' }, { column: 'id' }])
      .select('id', 'verdict');
    expect(items.map((r) => r.id)).toEqual(expected.map((r) => r.id));
    expect(items.map((r) => r.verdict)).toEqual(expected.map((r) => r.verdict));
    expect(totals.every((t) => t === expected.length)).toBe(true);
    expect(items.filter((r) => submitted.includes(r.id)).map((r) => r.verdict)).toEqual(['meets', 'fails', 'meets']);
    expect(items.every((r) => r.mayDecide)).toBe(true);
    const admin = await server.signIn('admin');
    expect(((await admin.get('/api/reviews')).body as Page<{ mayDecide: boolean }>).items.some((r) => r.mayDecide)).toBe(false);
    expect((await reviewer.get('/api/reviews?limit=201')).status).toBe(400);
  });

  it('answers the first page of every Overview list and pages one list on its own', async () => {
    const overview = (await engineer.get('/api/overview?limit=2')).body as Record<string, Page<{ id: number; status: string }>>;
    const drafts = await server.ctx
      .db('revision')
      .join('user', 'user.id', 'revision.author_id')
      .where({ 'user.email': 'engineer@fennel.test', status: 'draft' })
      .count({ n: '*' })
      .first();
    expect(overview.myDrafts.total).toBe(Number(drafts!.n));
    expect(overview.myDrafts.items).toHaveLength(2);
    expect(overview.awaitingMyReview).toEqual({ items: [], nextCursor: null, total: 0 });
    const { items } = await walk<{ id: number; status: string }>(engineer, '/api/overview/myDrafts', 3);
    expect(items).toHaveLength(Number(drafts!.n));
    expect(new Set(items.map((r) => r.id)).size).toBe(items.length);
    expect(items.every((r) => r.status === 'draft')).toBe(true);
    const awaiting = (await reviewer.get('/api/overview')).body as Record<string, Page<unknown>>;
    const inReview = await server.ctx.db('revision').where({ status: 'in_review' }).count({ n: '*' }).first();
    expect(awaiting.awaitingMyReview.total).toBe(Number(inReview!.n));
    expect((await engineer.get('/api/overview/everything')).status).toBe(400);
  });
});
