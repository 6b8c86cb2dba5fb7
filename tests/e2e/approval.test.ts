// The approval dialog is a signature: it states the meaning ("I approve revision N of … as reviewer"),
// asks for the reviewer's password, shows the field error for a wrong one, and signs with the right one.
// At phone and wide widths.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoDesign, demoRequirement } from '../support/fixtures';
import { DEMO_PASSWORD, saveDraft } from '../support/test-server';
import { openBrowser, PHONE, WIDE, type Browser } from './browser';

let browser: Browser;
beforeAll(async () => {
  browser = await openBrowser();
});
afterAll(() => browser?.close());

/** An in-review revision by the demo engineer whose calculation meets every check. */
async function awaitingReview(title: string): Promise<{ id: number; product: string }> {
  const engineer = await browser.server.signIn('engineer');
  const product = (await engineer.get('/api/products')).body[0] as { id: number; name: string };
  const dossier = (await engineer.post('/api/dossiers').send({ productId: product.id, title, requirement: demoRequirement })).body;
  const id = dossier.revisions[0].id as number;
  await saveDraft(engineer, id, { design: demoDesign });
  expect((await engineer.post(`/api/revisions/${id}/submit`)).status).toBe(200);
  return { id, product: product.name };
}

for (const [label, viewport] of [
  ['phone', PHONE],
  ['wide', WIDE],
] as const) {
  describe(`the approval dialog on a ${label} screen`, () => {
    it('states the meaning, refuses a wrong password on the field, and signs with the right one', async () => {
      const title = `Signature at ${label} width`;
      const { id, product } = await awaitingReview(title);
      const p = await browser.page(viewport);
      await p.signIn('reviewer');
      await p.page.goto(`${browser.server.url}/revisions/${id}`);
      await p.page.getByTestId('revision-tabs-review').click();
      await p.page.getByTestId('decision-comment').fill('Worst case checked against the parts list.');
      await p.page.getByTestId('approve').click();

      await p.page.getByTestId('approval-dialog').waitFor();
      expect(await p.page.getByTestId('approval-meaning').textContent()).toBe(`I approve revision 1 of “${title}” (${product}) as reviewer.`);
      // The whole dialog, its buttons included, fits the viewport.
      const box = (await p.page.getByTestId('approval-dialog').boundingBox())!;
      expect(box.x).toBeGreaterThanOrEqual(0);
      expect(box.x + box.width).toBeLessThanOrEqual(viewport.width);
      const confirm = (await p.page.getByTestId('approve-confirm').boundingBox())!;
      expect(confirm.y + confirm.height).toBeLessThanOrEqual(viewport.height);
      await p.shot(`approval-01-dialog-${label}`);

      await p.page.getByTestId('approve-password').fill('not my password');
      await p.page.getByTestId('approve-confirm').click();
      await expect.poll(() => p.page.getByTestId('approve-password-error').textContent()).toMatch(/The password is not correct/);
      await p.shot(`approval-02-wrong-password-${label}`);
      expect((await browser.server.ctx.db('revision').where({ id }).first('status')).status).toBe('in_review');

      await p.page.getByTestId('approve-password').fill(DEMO_PASSWORD);
      await p.page.getByTestId('approve-confirm').click();
      await expect.poll(() => p.page.getByTestId('decision').textContent(), { timeout: 20_000 }).toMatch(/Approved by Marta Kowalczyk/);
      expect(await p.page.getByTestId('approval-dialog').count()).toBe(0);
      expect(await p.page.getByTestId('decision-signature').textContent()).toBe('Signed by Marta Kowalczyk (reviewer): approved as reviewer');
      await p.page.getByTestId('decision').scrollIntoViewIfNeeded();
      await p.shot(`approval-03-signed-${label}`);

      // The wrong password's 401 (and the browser's console line about it) is the expected answer; nothing else may go wrong.
      expect(p.problems.filter((x) => x.includes('401')).length).toBe(2);
      expect(p.problems.some((x) => x.startsWith('HTTP 401') && x.includes(`/api/revisions/${id}/decision`))).toBe(true);
      expect(p.problems.filter((x) => !x.includes('401'))).toEqual([]);
      await p.close();
    });
  });
}

it('when the reviewer cancels the dialog, then nothing is decided', async () => {
  const { id } = await awaitingReview('Signature cancelled');
  const p = await browser.page(PHONE);
  await p.signIn('reviewer');
  await p.page.goto(`${browser.server.url}/revisions/${id}`);
  await p.page.getByTestId('revision-tabs-review').click();
  await p.page.getByTestId('approve').click();
  await p.page.getByTestId('approve-cancel').click();
  expect(await p.page.getByTestId('approval-dialog').count()).toBe(0);
  expect((await browser.server.ctx.db('revision').where({ id }).first('status')).status).toBe('in_review');
  expect(p.problems).toEqual([]);
  await p.close();
});
