// The Dossiers screen pages: the first 50 newest first, "More" for the next page; the Overview and
// Reviews screens read the paged lists too.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoDesign, demoRequirement } from '../support/fixtures';
import { saveDraft } from '../support/test-server';
import { openBrowser, PHONE, WIDE, type Browser } from './browser';
import { expectTidy } from './layout-checks';

let browser: Browser;
beforeAll(async () => {
  browser = await openBrowser();
  const engineer = await browser.server.signIn('engineer');
  const productId = (await engineer.get('/api/products')).body[0].id;
  for (let i = 1; i <= 52; i += 1) {
    const res = await engineer
      .post('/api/dossiers')
      .send({ productId, title: `Bench unit ${String(i).padStart(2, '0')}`, requirement: demoRequirement });
    if (i === 52) {
      await saveDraft(engineer, res.body.revisions[0].id, { design: demoDesign });
      await engineer.post(`/api/revisions/${res.body.revisions[0].id}/submit`);
    }
  }
});
afterAll(() => browser?.close());

describe('paged lists in the browser', () => {
  for (const [name, viewport, row] of [
    ['wide', WIDE, 'dossier-row'],
    ['phone', PHONE, 'dossier-card'],
  ] as const) {
    it(`finds dossiers by search, product and status on a ${name}, as the server's filtered list answers`, async () => {
      const engineer = await browser.server.signIn('engineer');
      const total = async (query: string) => (await engineer.get(`/api/dossiers?${query}`).expect(200)).body.total as number;
      const p = await browser.page(viewport);
      await p.signIn('engineer');
      await p.page.goto(`${browser.server.url}/dossiers`);
      await p.page.getByTestId('dossier-search').waitFor();
      expect(await p.page.getByTestId('dossier-search').getAttribute('placeholder')).toBe('Search dossiers');

      await p.page.getByTestId('dossier-search').fill('bench unit 07');
      const only = (await browser.server.ctx.db('dossier').where({ title: 'Bench unit 07' }).first('id')) as { id: number };
      await expect.poll(() => p.page.getByTestId('dossiers-more-count').textContent()).toBe('Showing 1 of 1');
      await p.page.getByTestId(`${row}-${only.id}`).waitFor();
      await expectTidy(p, `dossier-search-${name}`, { inputs: true });

      await p.page.getByTestId('dossier-search').fill('no dossier is called this');
      await p.page.getByTestId('dossiers-none').waitFor();
      expect(await p.page.getByTestId('dossiers-none').textContent()).toContain('No dossier matches “no dossier is called this”');

      await p.page.getByTestId('dossier-search').fill('');
      await p.page.getByTestId('dossier-filter-toggle').click();
      await p.page.getByTestId('dossier-filter-status-in_review').click();
      const inReview = await total('status=in_review');
      expect(inReview).toBeGreaterThan(0);
      await expect.poll(() => p.page.getByTestId('dossiers-more-count').textContent()).toBe(`Showing ${inReview} of ${inReview}`);
      expect(await p.page.getByTestId('dossier-filter-summary').textContent()).toBe('Showing dossiers with the latest revision awaiting review.');

      const products = (await engineer.get('/api/products')).body as Array<{ id: number; name: string }>;
      const last = products[products.length - 1];
      await p.page.getByTestId('dossier-filter-status-any').click();
      await p.page.getByTestId('dossier-filter-product-search').fill(last.name);
      await p.page.getByTestId(`dossier-filter-product-${last.id}`).click();
      // Exactly the server's rows for the product, in its order (not merely a count that could match an older list).
      const ofProduct = (await engineer.get(`/api/dossiers?productId=${last.id}`).expect(200)).body.items.map(
        (d: { id: number }) => `${row}-${d.id}`,
      );
      expect(ofProduct.length).toBeGreaterThan(0);
      await expect
        .poll(() => p.page.locator(`[data-testid^="${row}-"]`).evaluateAll((els) => els.map((e) => e.getAttribute('data-testid'))))
        .toEqual(ofProduct);
      await expectTidy(p, `dossier-filters-${name}`, { inputs: true });
      await p.page.getByTestId('dossier-filter-clear').click();
      const all = await total('');
      await expect.poll(() => p.page.getByTestId('dossiers-more-count').textContent()).toBe(`Showing 50 of ${all}`);
      expect(p.problems).toEqual([]);
      await p.close();
    });
  }

  it('shows the newest 50 dossiers and loads the rest with More, on a wide screen and a phone', async () => {
    const ids: number[] = await browser.server.ctx.db('dossier').orderBy('id', 'desc').pluck('id');
    for (const [viewport, row] of [
      [WIDE, 'dossier-row'],
      [PHONE, 'dossier-card'],
    ] as const) {
      const p = await browser.page(viewport);
      // An engineer sees every dossier (a viewer only those with approved work).
      await p.signIn('engineer');
      await p.page.goto(`${browser.server.url}/dossiers`);
      await p.page.getByTestId(`${row}-${ids[0]}`).waitFor();
      expect(await p.page.getByTestId('dossiers-more-count').textContent()).toBe(`Showing 50 of ${ids.length}`);
      expect(await p.page.getByTestId(`${row}-${ids[50]}`).count()).toBe(0);
      await p.shot(`dossier-list-page-1-${viewport === WIDE ? 'wide' : 'phone'}`);
      await p.page.getByTestId('dossiers-more').click();
      await p.page.getByTestId(`${row}-${ids[ids.length - 1]}`).waitFor();
      expect(await p.page.getByTestId('dossiers-more-count').textContent()).toBe(`Showing ${ids.length} of ${ids.length}`);
      expect(await p.page.getByTestId('dossiers-more').count()).toBe(0);
      expect(p.problems).toEqual([]);
      await p.close();
    }
  });

  it('shows the Overview totals and the review queue from the paged answers', async () => {
    const p = await browser.page(WIDE);
    await p.signIn('reviewer');
    const waiting = await browser.server.ctx.db('revision').where({ status: 'in_review' }).orderBy('submitted_at').pluck('id');
    await expect.poll(() => p.page.getByTestId('overview-screen').textContent()).toContain(`Awaiting my review (${waiting.length})`);
    await p.page.getByTestId(`awaiting-review-item-${waiting[0]}`).waitFor();
    await p.page.getByTestId('nav-reviews').click();
    await p.page.getByTestId(`review-item-${waiting[waiting.length - 1]}`).waitFor();
    expect(await p.page.getByTestId('reviews-more-count').textContent()).toBe(`Showing ${waiting.length} of ${waiting.length}`);
    expect(p.problems).toEqual([]);
  });
});
