import { readFile } from 'node:fs/promises';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openBrowser, PHONE, WIDE, type Browser, type WatchedPage } from './browser';

let browser: Browser;
beforeAll(async () => {
  browser = await openBrowser();
});
afterAll(() => browser?.close());

/**
 * The worst-case time the screen should show for the opening example, worked by hand with the
 * textbook RC discharge t = R·C·ln(V0/Vsafe) ([S2], docs/DOMAIN.md §3.1) at the slow corner of
 * docs/DOMAIN.md §3.3: R = 2 × R·(1 + 1 %)·(1 + 100 ppm/K × (85 − 25) K), C = 2 × 3.3 µF × (1 + 5 %), V0 = 622 V.
 */
function worstCaseSeconds(resistorOhms: number): number {
  const r = 2 * resistorOhms * 1.01 * (1 + 100e-6 * (85 - 25));
  const c = 2 * 3.3e-6 * 1.05;
  return r * c * Math.log(622 / 60);
}

const threeDigits = (seconds: number) => `${Number(seconds.toPrecision(3))} s`;

async function settledOnServer(p: WatchedPage) {
  await expect.poll(() => p.page.getByTestId('quick-check-source').textContent(), { timeout: 10_000 }).toBe('✓ Checked by the server');
}

const verdictText = (p: WatchedPage) => p.page.getByTestId('results-verdict-text').textContent();

describe('Quick check in the browser', () => {
  for (const [name, size] of [
    ['phone', PHONE],
    ['wide', WIDE],
  ] as const) {
    it(`when an engineer opens Quick check on a ${name}, edits the bleeder and downloads the netlist, then the verdict, field errors and netlist follow`, async () => {
      // Arrange: signed in, on the screen, the example already checked.
      const p = await browser.page(size);
      await p.signIn('engineer');
      await p.page.getByTestId('nav-check').click();
      await p.page.getByTestId('quick-check-screen').waitFor();
      await settledOnServer(p);
      expect(await verdictText(p)).toBe('✓ Meets every check (3 of 3)');
      expect(await p.page.getByTestId('results-check-discharge-time-value').textContent()).toContain(
        `${threeDigits(worstCaseSeconds(100e3))} against a limit of 5 s`,
      );
      await p.page.getByTestId('results-chart').waitFor();
      await p.shot(`quick-check-${name}-top`);
      await p.page.getByTestId('results-verdict').scrollIntoViewIfNeeded();
      await p.shot(`quick-check-${name}-meets`);
      await p.page.getByTestId('results-chart').scrollIntoViewIfNeeded();
      await p.shot(`quick-check-${name}-chart`);
      await p.page.getByTestId('results-suggestion').scrollIntoViewIfNeeded();
      await p.shot(`quick-check-${name}-suggestion`);

      // Act: a resistor 22 times larger.
      const resistance = p.page.getByTestId('design-bleeder-resistance');
      await resistance.fill('2M2');
      // Assert: read as 2.2 MΩ, time now far past 5 s, the verdict says so in words and marks.
      await expect.poll(() => p.page.getByText('read as 2.2 MΩ').count()).toBe(1);
      await settledOnServer(p);
      expect(await verdictText(p)).toBe('✕ Fails: 1 of 3 checks');
      expect(await p.page.getByTestId('results-check-discharge-time-status').textContent()).toBe('✕ Fail');
      expect(await p.page.getByTestId('results-check-discharge-time-value').textContent()).toContain(threeDigits(worstCaseSeconds(2.2e6)));
      expect(await p.page.getByTestId('results-check-resistor-power-status').textContent()).toBe('✓ Pass');
      await resistance.scrollIntoViewIfNeeded();
      await p.shot(`quick-check-${name}-field-2M2`);
      await p.page.getByTestId('results-verdict').scrollIntoViewIfNeeded();
      await p.shot(`quick-check-${name}-fails`);

      // Act: nonsense. Assert: the field says what is wrong, and the verdict waits for the input.
      await resistance.fill('470 parsecs');
      await expect.poll(() => p.page.getByTestId('design-bleeder-resistance-error').textContent()).toMatch(/“parsecs” is not a unit of resistance/);
      await expect.poll(() => verdictText(p)).toBe('◷ Incomplete: no verdict yet');
      expect(await p.page.getByTestId('results-missing').textContent()).toContain('Bleeder network: Resistance per resistor');
      await resistance.scrollIntoViewIfNeeded();
      await p.shot(`quick-check-${name}-nonsense`);

      // Act: a valid value again, then download. Assert: the netlist of the worst case comes down.
      await resistance.fill('100k');
      await settledOnServer(p);
      expect(await verdictText(p)).toBe('✓ Meets every check (3 of 3)');
      const button = p.page.getByTestId('download-netlist');
      await button.scrollIntoViewIfNeeded();
      const [download] = await Promise.all([p.page.waitForEvent('download'), button.click()]);
      expect(download.suggestedFilename()).toBe('discharge-worst-case.cir');
      const netlist = await readFile(await download.path(), 'utf8');
      expect(netlist).toContain('.tran');
      expect(netlist).toContain('.meas tran t_safe WHEN v(bus)=60 FALL=1');
      // Worst-case resistor of the slow corner: 100 kΩ × 1.01 × 1.006.
      expect(netlist).toMatch(/^R1_1 bus r1_1 101606$/m);
      await p.shot(`quick-check-${name}-netlist`);

      expect(p.problems).toEqual([]);
      await p.close();
    });
  }

  it('when an engineer on a phone picks a preset, takes the bus from the mains and declares a constant-current circuit, then the form and the result follow', async () => {
    const p = await browser.page(PHONE);
    await p.signIn('engineer');
    await p.page.getByTestId('nav-check').click();
    await settledOnServer(p);

    // A stricter preset: the example's bleeder, 4.09 s worst case to 34 V by the same RC formula, is too slow for 1 s.
    await p.page.getByTestId('requirement-presets-toggle').click();
    await p.shot('quick-check-phone-presets');
    await p.page.getByTestId('requirement-preset-household-plug').click();
    expect(await p.page.getByTestId('requirement-safeVoltage').inputValue()).toBe('34 V');
    expect(await p.page.getByTestId('requirement-maxTime').inputValue()).toBe('1 s');
    expect(await p.page.getByTestId('requirement-preset-note').textContent()).toContain(
      'Typical value — verify against the current edition of the standard',
    );
    await settledOnServer(p);
    expect(await verdictText(p)).toBe('✕ Fails: 1 of 3 checks');
    expect(await p.page.getByTestId('quick-check-strip').textContent()).toContain('Discharge time (bleeders)');

    // 230 V mains +10 %: √2 × 253 V = 357.8 V (docs/DOMAIN.md §3.4, computed there from the +10 % practice of [S2]).
    await p.page.getByTestId('design-mains-open').click();
    await p.page.getByTestId('design-mains-rms').fill('230 V');
    await p.page.getByTestId('design-mains-tolerance').fill('10 %');
    expect(await p.page.getByTestId('design-mains-use').textContent()).toBe('Use 357.8 V as maximum bus');
    await p.page.getByTestId('design-mains-use').click();
    expect(await p.page.getByTestId('design-bus-maxVoltage').inputValue()).toBe('357.8 V');
    // The example's 565 V nominal now sits above the maximum: the form says so on the field.
    await expect.poll(() => p.page.getByTestId('design-bus-maxVoltage-error').textContent()).toMatch(/at least the nominal voltage/);
    await p.page.getByTestId('design-bus-maxVoltage').scrollIntoViewIfNeeded();
    await p.shot('quick-check-phone-bus-order');
    await p.page.getByTestId('design-bus-nominalVoltage').fill('325 V');
    await expect.poll(() => p.page.getByTestId('design-bus-maxVoltage-error').count()).toBe(0);

    // Constant current: incomplete until the current is given, then t = C·ΔV/I + delay (docs/DOMAIN.md §3.8).
    await p.page.getByTestId('design-active-mode-constant-current').click();
    await expect.poll(() => verdictText(p)).toBe('◷ Incomplete: no verdict yet');
    expect(await p.page.getByTestId('results-missing').textContent()).toContain('Active discharge: Discharge current');
    await p.page.getByTestId('design-active-current').fill('200 mA');
    await p.page.getByTestId('design-active-delay').fill('100 ms');
    await settledOnServer(p);
    expect(await verdictText(p)).toBe('✓ Meets every check (3 of 3)');
    const activeSeconds = (2 * 3.3e-6 * 1.05 * (357.8 - 34)) / 0.2 + 0.1;
    expect(await p.page.getByTestId('results-check-discharge-time-value').textContent()).toContain(
      `${Number((activeSeconds * 1e3).toPrecision(3))} ms`,
    );
    expect(await p.page.getByTestId('results-check-passive-fallback-time-status').textContent()).toBe('● For information');
    await p.page.getByTestId('design-active-current').scrollIntoViewIfNeeded();
    await p.shot('quick-check-phone-active');
    await p.page.getByTestId('results-chart').scrollIntoViewIfNeeded();
    await p.shot('quick-check-phone-active-chart');

    expect(p.problems).toEqual([]);
    await p.close();
  });
});
