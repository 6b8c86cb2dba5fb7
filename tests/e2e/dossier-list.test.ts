// The Dossiers screen pages: the first 50 newest first, "More" for the next page; the Overview and
// Reviews screens read the paged lists too.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoDesign, demoRequirement } from '../support/fixtures';
import { saveDraft } from '../support/test-server';
import { openBrowser, PHONE, WIDE, type Browser } from './browser';

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
