// The whole review story on a phone: an engineer creates a dossier and a design, a reviewer returns it,
// revision 2 changes a resistor, the diff shows it, and the reviewer approves.
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { pdfsig } from '../pdf/poppler';
import { DEMO_PASSWORD } from '../support/test-server';
import { openBrowser, PHONE, WIDE, type Browser, type WatchedPage } from './browser';
import { uploadCapture } from '../support/captures';

let browser: Browser;
beforeAll(async () => {
  browser = await openBrowser();
});
afterAll(() => browser?.close());

async function fill(page: Page, testID: string, text: string) {
  const field = page.getByTestId(testID);
  await field.fill(text);
}

async function waitSaved(page: Page) {
  await expect.poll(() => page.getByTestId('save-state').textContent(), { timeout: 15_000 }).toMatch(/^Saved/);
}

async function openReviewTab(p: WatchedPage, revisionId: number) {
  await p.page.goto(`${browser.server.url}/revisions/${revisionId}`);
  await p.page.getByTestId('revision-tabs-review').click();
  await p.page.getByTestId('review-tab').waitFor();
}

describe('dossier review story at both widths', () => {
  for (const [width, size] of [
    ['phone', PHONE],
    ['wide', WIDE],
  ] as const) {
    // The approval signs and timestamps the dossier in the PDF worker, which this server starts for it.
    it(
      `create → evidence → submit → return with a reason → the reason on revision 2 → compare → approve with the password → signed PDF, on a ${width}`,
      { timeout: 240_000 },
      async () => {
        const engineer = await browser.page(size);
        await engineer.signIn('engineer');
        await engineer.page.getByTestId('nav-dossiers').click();
        await engineer.page.getByTestId('new-dossier').click();
        await engineer.page.getByTestId('new-dossier-screen').waitFor();
        const products = (await browser.server.ctx.db('product').select('id').orderBy('id')) as Array<{ id: number }>;
        await engineer.page.getByTestId(`dossier-product-${products[1].id}`).click();
        await fill(engineer.page, 'dossier-title', 'Browser story: DC-link at operator access');
        // The limit is the engineer's entry; nothing is filled in for them.
        expect(await engineer.page.getByTestId('dossier-req-safeVoltage').inputValue()).toBe('');
        await fill(engineer.page, 'dossier-req-safeVoltage', '60 V');
        await fill(engineer.page, 'dossier-req-maxTime', '5 s');
        await engineer.shot(`workflow-01-new-dossier-${width}`);
        await engineer.page.getByTestId('create-dossier').click();
        await engineer.page.getByTestId('revision-screen').waitFor();
        const revisionId = Number(/revisions\/(\d+)/.exec(engineer.page.url())![1]);

        const inputs: Array<[string, string]> = [
          ['rev-bus-nominalVoltage', '565 V'],
          ['rev-bus-maxVoltage', '622 V'],
          ['rev-capacitors-capacitance', '3.3u'],
          ['rev-capacitors-series', '1'],
          ['rev-capacitors-parallel', '2'],
          ['rev-capacitors-toleranceMinus', '5 %'],
          ['rev-capacitors-tolerancePlus', '5 %'],
          ['rev-bleeder-resistance', '100k'],
          ['rev-bleeder-series', '2'],
          ['rev-bleeder-parallel', '1'],
          ['rev-bleeder-tolerance', '1 %'],
          ['rev-bleeder-tcrPpmPerK', '100 ppm/K'],
          ['rev-bleeder-drift', '0 %'],
          ['rev-bleeder-powerRating', '3 W'],
          ['rev-bleeder-elementVoltage', '500 V'],
          ['rev-bleeder-derating', '50 %'],
          ['rev-ambient-min', '-25'],
          ['rev-ambient-max', '85'],
        ];
        for (const [id, text] of inputs) await fill(engineer.page, id, text);
        await fill(engineer.page, 'rev-notes', 'Two 100 kΩ in series across the bank.');
        await waitSaved(engineer.page);
        await expect.poll(() => engineer.page.getByTestId('rev-verdict-text').textContent()).toMatch(/Meets every check/);
        await engineer.shot(`workflow-02-design-${width}`);

        // A bench capture of the same link (nominal τ = 200 kΩ · 6.6 µF = 1.32 s).
        await engineer.page.getByTestId('revision-tabs-evidence').click();
        await uploadCapture(engineer.page, 'bench-rev1.csv', 1.3);
        await expect.poll(() => engineer.page.locator('[data-testid^="analysis-"]').first().textContent()).toMatch(/Fitted time constant 1\.3 s/);
        await engineer.page.getByTestId('evidence-overlay').scrollIntoViewIfNeeded();
        await engineer.shot(`workflow-02b-evidence-${width}`);

        await engineer.page.getByTestId('revision-tabs-review').click();
        await engineer.page.getByTestId('submit-revision').click();
        await expect.poll(() => engineer.page.getByTestId('review-status').textContent()).toMatch(/Awaiting review/);
        await engineer.shot(`workflow-03-submitted-${width}`);

        const reviewer = await browser.page(size);
        await reviewer.signIn('reviewer');
        await reviewer.page.getByTestId('nav-reviews').click();
        await reviewer.page.getByTestId(`review-item-${revisionId}`).click();
        await reviewer.page.getByTestId('review-tab').waitFor();
        await reviewer.page.getByTestId('return').click();
        await expect.poll(() => reviewer.page.getByTestId('decision-comment-error').textContent()).toMatch(/Say what must change/);
        await fill(reviewer.page, 'decision-comment', 'Show the margin with a 68 kΩ part as well.');
        await reviewer.page.getByTestId('return').click();
        await reviewer.page.getByTestId('decision').waitFor();
        await reviewer.shot(`workflow-04-returned-${width}`);

        await engineer.page.goto(`${browser.server.url}/`);
        await engineer.page.getByTestId(`returned-to-me-item-${revisionId}`).waitFor();
        await engineer.shot(`workflow-05-overview-returned-${width}`);
        await engineer.page.getByTestId(`returned-to-me-item-${revisionId}`).click();
        // The returned revision itself opens with the reason and the way to answer it.
        await expect
          .poll(() => engineer.page.getByTestId('returned-here-comment').textContent())
          .toBe('“Show the margin with a 68 kΩ part as well.”');
        await engineer.page.getByTestId('returned-here-dossier').click();
        await engineer.page.getByTestId('start-revision').click();
        await engineer.page.getByTestId('revision-screen').waitFor();
        await expect.poll(() => engineer.page.url()).not.toContain(`/revisions/${revisionId}`);
        const second = Number(/revisions\/(\d+)/.exec(engineer.page.url())![1]);
        // The draft that answers the return opens with the reviewer's reason.
        await expect.poll(() => engineer.page.getByTestId('return-note-comment').textContent()).toBe('“Show the margin with a 68 kΩ part as well.”');
        await fill(engineer.page, 'rev-bleeder-resistance', '68k');
        await waitSaved(engineer.page);
        // The old capture was of the 100 kΩ build: it no longer fits the predicted band, so it is replaced.
        await engineer.page.getByTestId('revision-tabs-evidence').click();
        await engineer.page.locator('[data-testid^="remove-evidence-"]').first().click();
        await engineer.page.getByTestId('remove-evidence-dialog-confirm').click();
        await engineer.page.getByTestId('evidence-removed').waitFor();
        await engineer.page.getByTestId('evidence-empty').waitFor();
        await uploadCapture(engineer.page, 'bench-rev2.csv', 0.9);
        await engineer.page.getByTestId('revision-tabs-changes').click();
        await expect.poll(() => engineer.page.getByTestId('change-bleeder.resistance').textContent()).toMatch(/100 kΩ → 68 kΩ\s+\(-32\.0 %\)/);
        await engineer.shot(`workflow-06-changes-${width}`);
        await engineer.page.getByTestId('revision-tabs-review').click();
        await engineer.page.getByTestId('submit-revision').click();
        await expect.poll(() => engineer.page.getByTestId('review-status').textContent()).toMatch(/Awaiting review/);

        await openReviewTab(reviewer, second);
        await fill(reviewer.page, 'decision-comment', 'Margin acceptable at the slow corner.');
        // Approving is a signature: the dialog asks for the reviewer's password.
        await reviewer.page.getByTestId('approve').click();
        await reviewer.page.getByTestId('approve-password').fill(DEMO_PASSWORD);
        await reviewer.page.getByTestId('approve-confirm').click();
        // Approving signs and timestamps the dossier first (in the server's PDF worker, which may be starting).
        await expect.poll(() => reviewer.page.getByTestId('decision').textContent(), { timeout: 60_000 }).toMatch(/Approved by Marta Kowalczyk/);
        await reviewer.shot(`workflow-07-approved-${width}`);

        // The assessor's copy: the export button downloads the signed PDF, which poppler's pdfsig validates.
        await engineer.page.goto(`${browser.server.url}/revisions/${second}`);
        await expect.poll(() => engineer.page.getByTestId('export-pdf').textContent()).toBe('Export signed PDF');
        const download = engineer.page.waitForEvent('download');
        await engineer.page.getByTestId('export-pdf').click();
        const file = join(browser.server.dataDir, `exported-${width}.pdf`);
        await (await download).saveAs(file);
        const sig = await pdfsig(file);
        expect(sig.stdout).toContain('Signature is Valid.');
        // PAdES: the signature covers the whole file as signed; only the security store is appended after it.
        expect(sig.stdout).toContain('Signature Type: ETSI.CAdES.detached');

        expect(engineer.problems).toEqual([]);
        expect(reviewer.problems).toEqual([]);
      },
    );
  }

  it('the revision page reads well on a wide screen', async () => {
    const p = await browser.page(WIDE);
    await p.signIn('engineer');
    const rev = await browser.server.ctx.db('revision').where({ status: 'draft' }).first('id');
    await p.page.goto(`${browser.server.url}/revisions/${rev.id}`);
    await p.page.getByTestId('design-tab').waitFor();
    await p.shot('workflow-08-revision-wide');
    await p.page.getByTestId('revision-tabs-changes').click();
    await p.page.getByTestId('changes').waitFor();
    await p.shot('workflow-09-changes-wide');
    await p.page.goto(`${browser.server.url}/dossiers`);
    await p.page.getByTestId('dossiers-screen').waitFor();
    await p.shot('workflow-10-dossiers-wide');
    expect(p.problems).toEqual([]);
  });
});
