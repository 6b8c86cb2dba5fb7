// What a certification engineer relies on at a glance: changes that matter ask first and then say they
// took effect, a return's reason follows the work, the audit trail reads as sentences, frozen values are
// not editable-looking fields, and things are found by searching, comparing and carrying over.
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { uploadCapture } from '../support/captures';
import { demoDesign, demoRequirement } from '../support/fixtures';
import { saveDraft } from '../support/test-server';
import { openBrowser, PHONE, WIDE, type Browser } from './browser';
import { expectTidy } from './layout-checks';

let browser: Browser;
beforeAll(async () => {
  browser = await openBrowser();
});
afterAll(() => browser?.close());

const text = (page: Page, testID: string) => page.getByTestId(testID).textContent();

/** A dossier of the demo engineer made through the API, its revision 1 holding the demo design. */
async function dossierWithDraft(title: string) {
  const engineer = await browser.server.signIn('engineer');
  const products = (await engineer.get('/api/products')).body;
  const dossier = (await engineer.post('/api/dossiers').send({ productId: products[0].id, title, requirement: demoRequirement })).body;
  const first = dossier.revisions[0].id as number;
  await saveDraft(engineer, first, { design: demoDesign });
  return { engineer, dossierId: dossier.id as number, first };
}

// Stories of several screens each; on a loaded machine one takes minutes.
describe('screens a certification engineer trusts', { timeout: 180_000 }, () => {
  it('when an engineer opens New dossier on a phone, then the limit is empty, presets are one tap away and labelled, messages leave once answered, products are searched, and Cancel goes back', async () => {
    // Hundreds of products: the picker must still find one by a few letters.
    const engineer = await browser.server.ctx.db('user').where({ email: 'engineer@fennel.test' }).first('id');
    const now = new Date().toISOString();
    await browser.server.ctx.db('product').insert(
      Array.from({ length: 300 }, (_, i) => ({
        name: `Bench unit ${String(i + 1).padStart(3, '0')}`,
        model_number: `BU-${1000 + i}`,
        description: '',
        created_by: engineer.id,
        created_at: now,
      })),
    );
    const p = await browser.page(PHONE);
    await p.signIn('engineer');
    await p.page.goto(`${browser.server.url}/dossiers`);
    await p.page.getByTestId('new-dossier').click();
    await p.page.getByTestId('new-dossier-screen').waitFor();

    expect(await p.page.getByTestId('dossier-req-safeVoltage').inputValue()).toBe('');
    expect(await p.page.getByTestId('dossier-req-maxTime').inputValue()).toBe('');
    expect(await text(p.page, 'dossier-product-count')).toMatch(/^302 products; the first 8 by name are listed/);
    expect(await p.page.locator('[data-testid^="dossier-product-"][role="radio"]').count()).toBe(9);
    await expectTidy(p, 'trust-new-dossier-phone', { inputs: true });

    // Nothing filled in: every missing entry is named.
    await p.page.getByTestId('create-dossier').click();
    await p.page.getByTestId('new-dossier-errors').waitFor();
    expect(await text(p.page, 'dossier-title-error')).toMatch(/Enter a title/);
    expect(await text(p.page, 'dossier-req-safeVoltage-error')).toMatch(/Safe voltage is required/);
    await p.page.getByTestId('dossier-title').scrollIntoViewIfNeeded();
    await expectTidy(p, 'trust-new-dossier-errors-phone', { inputs: true, errors: true });

    // Answered one by one, each message leaves at once.
    await p.page.getByTestId('dossier-title').fill('Service access after shutdown');
    await expect.poll(() => p.page.getByTestId('dossier-title-error').count()).toBe(0);
    await p.page.getByTestId('dossier-product-search').fill('bu-1207');
    await expect.poll(() => text(p.page, 'dossier-product-count')).toBe('1 of 302 products.');
    await p.page.getByTestId('dossier-product-search').fill('wren');
    await expect.poll(() => text(p.page, 'dossier-product-count')).toBe('1 of 302 products.');
    const wren = await browser.server.ctx.db('product').where({ name: 'Wren 400 servo drive' }).first('id');
    await p.page.getByTestId(`dossier-product-${wren.id}`).click();
    await expect.poll(() => p.page.getByTestId('dossier-product-error').count()).toBe(0);
    await p.page.getByTestId('dossier-product-search').scrollIntoViewIfNeeded();
    await p.shot('trust-new-dossier-product-found-phone');

    // One tap applies a preset, which says it is typical and to be verified.
    await p.page.getByTestId('dossier-req-preset-machinery-cut-off').click();
    expect(await p.page.getByTestId('dossier-req-safeVoltage').inputValue()).toBe('60 V');
    expect(await p.page.getByTestId('dossier-req-maxTime').inputValue()).toBe('5 s');
    expect(await text(p.page, 'dossier-req-preset-note')).toContain('Typical value — verify against the current edition of the standard');
    await expect.poll(() => p.page.getByTestId('new-dossier-errors').count()).toBe(0);
    await p.page.getByTestId('dossier-req-preset-note').scrollIntoViewIfNeeded();
    await p.shot('trust-new-dossier-preset-phone');

    // Cancel leaves without creating anything.
    const before = await browser.server.ctx.db('dossier').count({ n: '*' }).first();
    await p.page.getByTestId('new-dossier-cancel').click();
    await p.page.getByTestId('dossiers-screen').waitFor();
    expect(await browser.server.ctx.db('dossier').count({ n: '*' }).first()).toEqual(before);
    expect(p.problems).toEqual([]);
    await p.close();
  });

  it('when an engineer removes evidence on a phone, then a dialog says what will happen, Cancel keeps the file, and the removal is confirmed on screen; two captures overlay in two colours', async () => {
    const { first } = await dossierWithDraft('Evidence removal story');
    const p = await browser.page(PHONE);
    await p.signIn('engineer');
    await p.page.goto(`${browser.server.url}/revisions/${first}?tab=evidence`);
    await p.page.getByTestId('evidence-tab').waitFor();
    await uploadCapture(p.page, 'bench-a.csv', 1.3);
    await uploadCapture(p.page, 'bench-b.csv', 1.2);
    // One analysis card per capture (its own notes carry testIDs that start the same way).
    await expect
      .poll(() =>
        p.page
          .locator('[data-testid^="analysis-"]')
          .evaluateAll((els) => els.filter((e) => /^analysis-\d+$/.test(e.getAttribute('data-testid') ?? '')).length),
      )
      .toBe(2);

    const legend = p.page.getByTestId('decay-chart').locator('[data-testid^="decay-chart-legend-measured-"] line');
    const colours = await legend.evaluateAll((lines) => lines.map((l) => l.getAttribute('stroke')));
    expect(colours).toHaveLength(2);
    expect(colours[0]).not.toBe(colours[1]);
    const plotted = await p.page
      .getByTestId('decay-chart')
      .locator('svg path[stroke-opacity]')
      .evaluateAll((paths) => paths.map((x) => x.getAttribute('stroke')));
    expect(plotted).toEqual(colours);
    await p.page.getByTestId('evidence-overlay').scrollIntoViewIfNeeded();
    await p.shot('trust-two-captures-phone');

    const rows = await browser.server.ctx.db('evidence').where({ revision_id: first }).orderBy('id').select('id', 'original_name');
    await p.page.getByTestId(`remove-evidence-${rows[0].id}`).click();
    const dialog = p.page.getByTestId('remove-evidence-dialog');
    await dialog.waitFor();
    expect(await dialog.textContent()).toContain('Remove “bench-a.csv” from revision 1?');
    expect(await dialog.textContent()).toContain('its measured check leaves the results');
    await expectTidy(p, 'trust-remove-dialog-phone');
    await p.page.getByTestId('remove-evidence-dialog-cancel').click();
    await expect.poll(() => p.page.getByTestId('remove-evidence-dialog').count()).toBe(0);
    expect(await browser.server.ctx.db('evidence').where({ revision_id: first }).count({ n: '*' }).first()).toEqual({ n: 2 });

    await p.page.getByTestId(`remove-evidence-${rows[0].id}`).click();
    await p.page.getByTestId('remove-evidence-dialog-confirm').click();
    await expect
      .poll(() => text(p.page, 'evidence-removed'))
      .toBe('✓ Removed “bench-a.csv” from revision 1; its results were recomputed without it.');
    expect(await browser.server.ctx.db('evidence').where({ revision_id: first }).pluck('original_name')).toEqual(['bench-b.csv']);
    await p.page.getByTestId('evidence-removed').scrollIntoViewIfNeeded();
    await p.shot('trust-evidence-removed-phone');
    expect(p.problems).toEqual([]);
    await p.close();
  });

  it('when an admin changes a role and disables an account, then each asks first, Cancel changes nothing, and the row says what took effect', async () => {
    const p = await browser.page(WIDE);
    await p.signIn('admin');
    await p.page.goto(`${browser.server.url}/team`);
    const email = 'engineer2@fennel.test';
    const row = p.page.getByTestId(`team-row-${email}`);
    await row.waitFor();
    const roleOf = async () => (await browser.server.ctx.db('user').where({ email }).first('role')).role;

    await p.page.getByTestId(`role-${email}-reviewer`).click();
    const dialog = p.page.getByTestId('team-change-dialog');
    await dialog.waitFor();
    expect(await dialog.textContent()).toMatch(/Make .+ a reviewer\?/);
    expect(await dialog.textContent()).toContain('approve or return revisions that someone else authored');
    await p.shot('trust-role-dialog-wide');
    await p.page.getByTestId('team-change-dialog-cancel').click();
    expect(await roleOf()).toBe('engineer');

    await p.page.getByTestId(`role-${email}-reviewer`).click();
    await p.page.getByTestId('team-change-dialog-confirm').click();
    await expect.poll(() => row.getByTestId('team-notice').textContent()).toMatch(/is now a reviewer\.$/);
    expect(await roleOf()).toBe('reviewer');
    await expect.poll(() => row.getByTestId(`role-${email}-reviewer`).textContent()).toBe('● Reviewer');

    await p.page.getByTestId(`toggle-${email}`).click();
    expect(await p.page.getByTestId('team-change-dialog').textContent()).toContain('signed out at once');
    await p.page.getByTestId('team-change-dialog-confirm').click();
    await expect.poll(() => row.getByTestId('team-notice').textContent()).toMatch(/is disabled and their sessions have ended/);
    expect((await browser.server.ctx.db('user').where({ email }).first('disabled_at')).disabled_at).not.toBeNull();
    expect(await row.textContent()).toContain('Disabled');
    await p.shot('trust-account-disabled-wide');
    await expectTidy(p, 'trust-team-wide', { inputs: true });

    // Put the demo account back for the stories after this one.
    await p.page.getByTestId(`toggle-${email}`).click();
    await expect.poll(() => row.getByTestId('team-notice').textContent()).toMatch(/enabled again/);
    await p.page.getByTestId(`role-${email}-engineer`).click();
    await p.page.getByTestId('team-change-dialog-confirm').click();
    await expect.poll(() => roleOf()).toBe('engineer');
    expect(p.problems).toEqual([]);
    await p.close();
  });

  for (const [name, size] of [
    ['phone', PHONE],
    ['wide', WIDE],
  ] as const) {
    it(`when a returned revision is answered on a ${name}, then the reason shows on the Overview and on the new draft, and any two revisions compare`, async () => {
      const { engineer, dossierId, first } = await dossierWithDraft(`Return reason story (${name})`);
      const reviewer = await browser.server.signIn('reviewer');
      const reason = 'Show the worst case at 85 °C with the second-source part.';
      await engineer.post(`/api/revisions/${first}/submit`).expect(200);
      await reviewer.post(`/api/revisions/${first}/decision`).send({ decision: 'return', comment: reason }).expect(200);

      const p = await browser.page(size);
      await p.signIn('engineer');
      await p.page.getByTestId(`returned-to-me-item-${first}-reason`).waitFor();
      expect(await text(p.page, `returned-to-me-item-${first}-reason`)).toBe(`Returned to you: “${reason}” (Marta Kowalczyk, revision 1)`);
      await p.page.getByTestId(`returned-to-me-item-${first}`).scrollIntoViewIfNeeded();
      await expectTidy(p, `trust-overview-returned-${name}`);

      await p.page.goto(`${browser.server.url}/dossiers/${dossierId}`);
      await p.page.getByTestId('start-revision').click();
      await p.page.getByTestId('return-note').waitFor();
      expect(await text(p.page, 'return-note-comment')).toBe(`“${reason}”`);
      expect(await text(p.page, 'return-note')).toContain('Revision 1 was returned to you by Marta Kowalczyk');
      const second = Number(/revisions\/(\d+)/.exec(p.page.url())![1]);
      await p.page.getByTestId('rev-bleeder-resistance').fill('82k');
      await expect.poll(() => text(p.page, 'save-state'), { timeout: 15_000 }).toMatch(/^Saved .+ [A-Z]{2,5} ✓$/);
      await expectTidy(p, `trust-draft-answers-return-${name}`, { inputs: true });

      // A third revision, to compare with either earlier one.
      await engineer.post(`/api/revisions/${second}/submit`).expect(200);
      await reviewer.post(`/api/revisions/${second}/decision`).send({ decision: 'return', comment: 'One more corner.' }).expect(200);
      const third = (await engineer.post(`/api/dossiers/${dossierId}/revisions`).send({}).expect(201)).body.id as number;
      expect((await saveDraft(engineer, third, { design: { ...demoDesign, bleeder: { ...demoDesign.bleeder, resistance: 68_000 } } })).status).toBe(
        200,
      );

      await p.page.goto(`${browser.server.url}/revisions/${third}?tab=changes`);
      await p.page.getByTestId('changes').waitFor();
      expect(await text(p.page, 'changes-direction')).toContain('From revision 2 to revision 3');
      expect(await text(p.page, 'change-bleeder.resistance')).toMatch(/82 kΩ → 68 kΩ/);
      await p.page.getByTestId(`changes-against-${first}`).click();
      await expect.poll(() => text(p.page, 'changes-direction')).toContain('From revision 1 to revision 3');
      expect(await text(p.page, 'change-bleeder.resistance')).toMatch(/100 kΩ → 68 kΩ/);
      await expectTidy(p, `trust-compare-1-3-${name}`);

      // From the oldest revision, a later one reads from old to new as well.
      await p.page.goto(`${browser.server.url}/revisions/${first}?tab=changes`);
      await p.page.getByTestId(`changes-against-${third}`).click();
      await expect.poll(() => text(p.page, 'changes-direction')).toContain('From revision 1 to revision 3');
      // Both sides are picked: revisions 1 and 2 compare from revision 3's page too; the same one twice asks for two.
      await p.page.goto(`${browser.server.url}/revisions/${third}?tab=changes`);
      await p.page.getByTestId(`changes-this-${first}`).click();
      await p.page.getByTestId(`changes-against-${second}`).click();
      await expect.poll(() => text(p.page, 'changes-direction')).toContain('From revision 1 to revision 2');
      expect(await text(p.page, 'change-bleeder.resistance')).toMatch(/100 kΩ → 82 kΩ/);
      await expectTidy(p, `trust-compare-1-2-${name}`);
      await p.page.getByTestId(`changes-against-${first}`).click();
      await p.page.getByTestId('changes-same').waitFor();
      expect(p.problems).toEqual([]);
      await p.close();
    });
  }

  it('when a reviewer reads a long audit trail on a phone, then every event is there as a sentence, a page at a time', async () => {
    const { engineer, dossierId, first } = await dossierWithDraft('Long audit trail');
    // 30 saves: with the dossier and revision created and the first save, 33 events.
    for (let i = 0; i < 30; i += 1) expect((await saveDraft(engineer, first, { notes: `Note ${i + 1}` })).status).toBe(200);
    const p = await browser.page(PHONE);
    await p.signIn('reviewer');
    await p.page.goto(`${browser.server.url}/dossiers/${dossierId}`);
    await p.page.getByTestId('audit-trail').waitFor();
    expect(await text(p.page, 'audit-count')).toBe('33 events, newest first; showing 20.');
    const events = p.page.locator('[data-testid^="audit-event-"]');
    expect(await events.count()).toBe(20);
    expect(await events.first().textContent()).toMatch(/^Jonas Lindqvist saved the notes of revision 1; the calculation meets every check\./);
    await p.page.getByTestId('audit-more').click();
    await expect.poll(() => events.count()).toBe(33);
    expect(await text(p.page, 'audit-count')).toBe('33 events, newest first; showing 33.');
    expect(await p.page.getByTestId('audit-more').count()).toBe(0);
    expect(await events.last().textContent()).toMatch(/^Jonas Lindqvist created the dossier “Long audit trail”\./);
    for (const line of await events.allTextContents()) expect(line).not.toMatch(/\b(revision|evidence|dossier|user)\.[a-z_]+\b/);
    await events.last().scrollIntoViewIfNeeded();
    await expectTidy(p, 'trust-audit-trail-phone');
    expect(p.problems).toEqual([]);
    await p.close();
  });

  it('when an engineer sizes a snubber and adds it to a draft, then it lands in the draft’s snubber list and is saved in one step', async () => {
    const { first } = await dossierWithDraft('Snubber carried over');
    const p = await browser.page(WIDE);
    await p.signIn('engineer');
    await p.page.goto(`${browser.server.url}/snubber`);
    await p.page.getByTestId('sizing-f0').fill('20 MHz');
    await p.page.getByTestId('sizing-cAdd').fill('300 pF');
    await p.page.getByTestId('sizing-f1').fill('10 MHz');
    // docs/DOMAIN.md §4 E12 (constructed): L_par 633 nH, C_par 100 pF; nearest parts 82 Ω (E24) and 330 pF (E12).
    await expect.poll(() => p.page.getByTestId('result-r-e24-value').textContent()).toBe('82 Ω');
    await p.page.getByTestId(`sizing-add-to-${first}`).scrollIntoViewIfNeeded();
    await p.shot('trust-snubber-to-draft-wide');
    await p.page.getByTestId(`sizing-add-to-${first}`).click();
    await p.page.getByTestId('rev-snubber-handed').waitFor();
    expect(await text(p.page, 'rev-snubber-handed')).toMatch(/Added SN1 from the sizing helper/);
    await expect.poll(() => text(p.page, 'save-state'), { timeout: 15_000 }).toMatch(/^Saved/);
    const saved = JSON.parse((await browser.server.ctx.db('revision').where({ id: first }).first('design')).design);
    expect(saved.snubbers).toHaveLength(1);
    expect(saved.snubbers[0]).toMatchObject({ kind: 'rc', name: 'SN1', resistance: 82, capacitance: 330e-12 });
    expect(saved.snubbers[0].parasiticInductance).toBeCloseTo(633e-9, 9);
    expect(saved.snubbers[0].parasiticCapacitance).toBeCloseTo(100e-12, 15);
    expect(await p.page.getByTestId('rev-snubbers-0-resistance').inputValue()).toBe('82 Ω');
    // Opening the draft again does not add it twice.
    await p.page.reload();
    await p.page.getByTestId('design-tab').waitFor();
    expect(await p.page.getByTestId('rev-snubber-handed').count()).toBe(0);
    expect(await p.page.locator('[data-testid="rev-snubbers-1"]').count()).toBe(0);
    expect(p.problems).toEqual([]);
    await p.close();
  });

  it('when anyone opens an approved revision, then its inputs read as recorded values with nothing to type into', async () => {
    const approved = await browser.server.ctx.db('revision').where({ status: 'approved' }).orderBy('id').first('id');
    for (const [name, size] of [
      ['phone', PHONE],
      ['wide', WIDE],
    ] as const) {
      const p = await browser.page(size);
      await p.signIn('viewer');
      await p.page.goto(`${browser.server.url}/revisions/${approved.id}`);
      await p.page.getByTestId('design-tab').waitFor();
      expect(await p.page.getByTestId('design-tab').locator('input, textarea').count()).toBe(0);
      expect(await text(p.page, 'rev-bleeder-resistance')).toBe('47 kΩ');
      expect(await text(p.page, 'rev-active-mode')).toBe('None');
      expect(await p.page.getByTestId('caution-line').count()).toBe(1);
      await p.page.getByTestId('rev-bleeder-resistance').scrollIntoViewIfNeeded();
      await expectTidy(p, `trust-frozen-values-${name}`);
      expect(p.problems).toEqual([]);
      await p.close();
    }
  });
});
