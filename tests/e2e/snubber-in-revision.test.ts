// A snubber entered in a draft revision: its checks appear under it while typing, and once saved they
// join the revision's results and verdict on the server.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openBrowser, PHONE, type Browser } from './browser';

let browser: Browser;
beforeAll(async () => {
  browser = await openBrowser();
});
afterAll(() => browser?.close());

describe('snubbers in a revision', () => {
  it('when an engineer enters an RC snubber on a phone, then its checks join the saved results', async () => {
    const p = await browser.page(PHONE);
    await p.signIn('engineer');
    const engineer = await browser.server.ctx.db('user').where({ email: 'engineer@fennel.test' }).first('id');
    const draft = await browser.server.ctx.db('revision').where({ status: 'draft', author_id: engineer.id }).first('id');
    await p.page.goto(`${browser.server.url}/revisions/${draft.id}`);
    await p.page.getByTestId('design-tab').waitFor();
    await p.page.getByTestId('rev-snubbers-add').click();
    // The constructed example of docs/DOMAIN.md §4 E12 with its suggested parts, at 48 V and 250 kHz.
    const fields: Array<[string, string]> = [
      ['name', 'R12/C7'],
      ['location', 'across Q3 drain–source'],
      ['resistance', '82'],
      ['capacitance', '330p'],
      ['capacitanceTolerance', '10 %'],
      ['powerRating', '0.5 W'],
      ['derating', '60 %'],
      ['capacitorVoltageRating', '100 V'],
      ['switchingVoltage', '48 V'],
      ['overshoot', '30 %'],
      ['switchingFrequency', '250k'],
      ['parasiticInductance', '633n'],
      ['parasiticCapacitance', '100p'],
    ];
    for (const [field, text] of fields) await p.page.getByTestId(`rev-snubbers-0-${field}`).fill(text);
    await p.page.getByTestId('rev-snubbers-0-check-snubber-power').waitFor();
    await expect.poll(() => p.page.getByTestId('save-state').textContent(), { timeout: 15_000 }).toMatch(/^Saved/);
    await p.page.getByTestId('rev-snubbers-0').scrollIntoViewIfNeeded();
    await p.shot('snubber-in-revision-phone');

    const saved = await browser.server.ctx.db('revision').where({ id: draft.id }).first('design', 'results');
    const design = JSON.parse(saved.design);
    expect(design.snubbers[0]).toMatchObject({ name: 'R12/C7', kind: 'rc', resistance: 82, capacitance: 330e-12 });
    const ids = (JSON.parse(saved.results).checks as Array<{ id: string }>).map((c) => c.id);
    expect(ids).toEqual(expect.arrayContaining(['snubber-power:0', 'snubber-voltage:0', 'snubber-damping:0']));
    await p.page.getByTestId('rev-check-snubber-power:0').waitFor();
    expect(p.problems).toEqual([]);
  });
});
