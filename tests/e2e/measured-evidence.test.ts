// The numbers an assessor reads, in the browser: the single-fault checks on the Quick check and the
// revision screen, a capture referred to the maximum bus and corrected for the probe, and the Changes
// tab with each capture's checks under its file. Phone (390×844) and wide (1280×800).
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoDesign, demoRequirement } from '../support/fixtures';
import { saveDraft } from '../support/test-server';
import { openBrowser, PHONE, WIDE, type Browser } from './browser';

let browser: Browser;
beforeAll(async () => {
  browser = await openBrowser();
});
afterAll(() => browser?.close());

/** V0·e^(−t/τ) after a pre-trigger plateau (common practice: the shape of a bleeder discharge). */
function capture(v0: number, tau: number): Buffer {
  const rows = ['Time (s),CH1 (V)'];
  for (let i = 0; i < 3000; i++) {
    const t = -0.5 + i * 0.004;
    rows.push(`${t.toFixed(4)},${(t < 0 ? v0 : v0 * Math.exp(-t / tau)).toFixed(3)}`);
  }
  return Buffer.from(rows.join('\n'));
}

async function uploadThroughPage(page: Page, name: string, bytes: Buffer) {
  const chooser = page.waitForEvent('filechooser');
  await page.getByTestId('choose-file').click();
  await (await chooser).setFiles({ name, mimeType: 'text/csv', buffer: bytes });
}

// Two strings of 2 × 100 kΩ (nominal τ = 100 kΩ × 6.6 µF = 0.66 s), so one open resistor leaves a path.
const twoStrings = { ...demoDesign, bleeder: { ...demoDesign.bleeder, resistance: 100e3, parallel: 2 } };

describe('single-fault checks and referred captures in the browser', () => {
  for (const [name, size] of [
    ['phone', PHONE],
    ['wide', WIDE],
  ] as const) {
    it(`on the Quick check (${name}), asking for the single fault adds its checks, and each entry shows how it was read`, async () => {
      const p = await browser.page(size);
      await p.signIn('engineer');
      await p.page.getByTestId('nav-check').click();
      await p.page.getByTestId('quick-check-screen').waitFor();
      // Read as typed, beside the entry, before leaving the field.
      await p.page.getByTestId('design-capacitors-capacitance').fill('470uf');
      await expect.poll(() => p.page.getByTestId('design-capacitors-capacitance-reading').textContent()).toBe('read as 470 µF');
      await p.page.getByTestId('design-capacitors-capacitance').fill('2,200u');
      await expect
        .poll(() => p.page.getByTestId('design-capacitors-capacitance-error').textContent())
        .toBe('✕ 2,200u can be read two ways: write 2200u or 2.2u');
      await p.page.getByTestId('design-capacitors-capacitance').scrollIntoViewIfNeeded();
      await p.shot(`fault-quick-check-${name}-ambiguous`);
      await p.page.getByTestId('design-capacitors-capacitance').fill('3.3u');

      await p.page.getByTestId('requirement-singleFault-single-fault').click();
      await p.page.getByTestId('requirement-singleFaultMaxTime').fill('10 s');
      await expect.poll(() => p.page.getByTestId('requirement-singleFaultMaxTime-reading').textContent()).toBe('read as 10 s');
      await p.page.getByTestId('requirement-fault').scrollIntoViewIfNeeded();
      await p.shot(`fault-quick-check-${name}-toggle`);
      // The example has one string of two resistors: an open one leaves no path, so the verdict fails.
      await expect.poll(() => p.page.getByTestId('results-check-single-fault-time-status').textContent(), { timeout: 15_000 }).toBe('✕ Fail');
      expect(await p.page.getByTestId('results-check-single-fault-time-detail').textContent()).toMatch(/no discharge path remains/);
      await p.page.getByTestId('results-check-single-fault-power').waitFor();
      await p.page.getByTestId('results-check-single-fault-voltage').waitFor();
      expect(await p.page.getByTestId('results-check-stored-energy-status').textContent()).toBe('● For information');
      await p.page.getByTestId('results-check-single-fault-time').scrollIntoViewIfNeeded();
      await p.shot(`fault-quick-check-${name}-checks`);
      expect(p.problems).toEqual([]);
      await p.close();
    });
  }

  it('the revision screen shows a capture referred to the maximum bus and corrected for the probe, and the Changes tab groups checks under each file', async () => {
    // Arrange through the API: a dossier asking for the single fault, a design with two strings, revision 1 with a capture, submitted.
    const api = await browser.server.signIn('engineer');
    const products = (await api.get('/api/products')).body;
    const dossier = (
      await api
        .post('/api/dossiers')
        .send({ productId: products[0].id, title: 'Browser: referred capture', requirement: { ...demoRequirement, singleFault: true } })
    ).body;
    const first = dossier.revisions[0].id as number;
    await saveDraft(api, first, { design: twoStrings });
    const a = await api.post(`/api/revisions/${first}/evidence`).field('kind', 'waveform').attach('file', capture(622, 0.66), 'bench-rev1.csv');
    expect(a.status).toBe(201);
    expect((await api.post(`/api/revisions/${first}/submit`)).status).toBe(200);
    const second = (await api.post(`/api/dossiers/${dossier.id}/revisions`).send({ fromRevisionId: first })).body.id as number;
    // Revision 2: 120 kΩ parts (nominal τ = 120 kΩ × 6.6 µF = 0.792 s); the single-fault figures move with them.
    await saveDraft(api, second, { design: { ...twoStrings, bleeder: { ...twoStrings.bleeder, resistance: 120e3 } } });

    for (const [name, size] of [
      ['phone', PHONE],
      ['wide', WIDE],
    ] as const) {
      const p = await browser.page(size);
      await p.signIn('engineer');
      await p.page.goto(`${browser.server.url}/revisions/${second}`);
      await p.page.getByTestId('design-tab').waitFor();
      expect(await p.page.getByTestId('revision-single-fault').textContent()).toMatch(/Also under a single fault .* within 5 s/);

      if (name === 'phone') {
        // Act: a capture from 500 V (the bus maximum is 622 V) with the ×10 probe preset.
        await p.page.getByTestId('revision-tabs-evidence').click();
        await p.page.getByTestId('capture-probe-preset-10M').click();
        expect(await p.page.getByTestId('capture-probe-resistance').inputValue()).toBe('10 MΩ');
        await p.page.getByTestId('capture-probe').scrollIntoViewIfNeeded();
        await p.shot('fault-evidence-phone-probe');
        await uploadThroughPage(p.page, 'bench-500V.csv', capture(500, 0.79));
        const counted = p.page.locator('[data-testid$="-counted"]');
        await expect.poll(() => counted.count(), { timeout: 20_000 }).toBe(2);
        const uploaded = (await api.get(`/api/revisions/${second}`)).body.evidence.find(
          (e: { originalName: string }) => e.originalName === 'bench-500V.csv',
        );
        // RC decay law with the 10 MΩ probe taken out (C at its −5 % tolerance, 6.27 µF): τ_u = 1/(1/0.79 − 1/62.7) = 0.800 s; t = τ_u·ln(622/60) = 1.87 s.
        expect(await p.page.getByTestId(`analysis-${uploaded.id}-counted`).textContent()).toMatch(
          /^Counts as 1\.87 s from the 622 V maximum bus \(referred from 500 V\)\.$/,
        );
        expect(await p.page.getByTestId(`analysis-${uploaded.id}-probe`).textContent()).toMatch(/Instrument input 10 MΩ across the capacitor/);
        await p.page.getByTestId(`analysis-${uploaded.id}-counted`).scrollIntoViewIfNeeded();
        await p.shot('fault-evidence-phone-counted');
        await p.page.getByTestId('revision-tabs-design').click();
      }

      const rev = (await api.get(`/api/revisions/${second}`)).body;
      const b = rev.evidence.find((e: { originalName: string }) => e.originalName === 'bench-500V.csv');
      const id = `rev-check-measured-discharge:${b.sha256.slice(0, 12)}`;
      await p.page.getByTestId(id).scrollIntoViewIfNeeded();
      expect(await p.page.getByTestId(`${id}-detail`).textContent()).toMatch(/referred to the 622 V maximum bus by the RC decay law/);
      expect(await p.page.getByTestId(`${id}-detail`).textContent()).toMatch(/instrument loading corrected for 10 MΩ/);
      await p.shot(`fault-revision-${name}-referred`);
      await p.page.getByTestId('rev-check-single-fault-time').scrollIntoViewIfNeeded();
      expect(await p.page.getByTestId('rev-check-single-fault-time-status').textContent()).toBe('✓ Pass');
      await p.shot(`fault-revision-${name}-single-fault`);

      // Changes: the single-fault time moved with the resistors; each capture's checks sit under its file.
      await p.page.getByTestId('revision-tabs-changes').click();
      await p.page.getByTestId('changes').waitFor();
      expect(await p.page.getByTestId('check-changes-design').getByTestId('check-change-single-fault-time').textContent()).toMatch(
        /Value changed.*Single fault: discharge time with one bleeder resistor open/,
      );
      const group = p.page.getByTestId(`check-changes-file-${b.sha256.slice(0, 12)}`);
      expect(await group.textContent()).toMatch(/^From bench-500V\.csv/);
      expect(await group.getByTestId(`check-change-measured-discharge:${b.sha256.slice(0, 12)}`).textContent()).toMatch(/New check/);
      // The carried capture pairs with itself: its τ (0.66 s) now lies below the 120 kΩ band, never "removed" and "added".
      const carried = p.page.getByTestId(`check-changes-file-${a.body.sha256.slice(0, 12)}`);
      expect(await carried.textContent()).toMatch(/^From bench-rev1\.csv/);
      expect(await carried.getByTestId(`check-change-measured-tau:${a.body.sha256.slice(0, 12)}`).textContent()).toMatch(/Now fails/);
      expect(await carried.textContent()).not.toMatch(/New check|Check removed/);
      await p.page.getByTestId('changes-checks').scrollIntoViewIfNeeded();
      await p.shot(`fault-changes-${name}`);
      expect(p.problems).toEqual([]);
      await p.close();
    }
  });
});
