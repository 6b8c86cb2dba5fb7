// Sizing an RC snubber from a ringing measurement, against the worked example of docs/DOMAIN.md §4 and
// the published rule of the measured-ringing method.
import { describe, expect, it } from 'vitest';
import { rcSnubberPower, ringingCurves, sizeFromRinging } from '../../shared/engine/snubber';
import { E12, E24, nearestPreferred } from '../../shared/engine/snubber-e-series';

/** |actual − expected| within half a unit of the last digit the source prints. */
const printed = (actual: number, expected: number, lastDigit: number) => expect(Math.abs(actual - expected)).toBeLessThanOrEqual(lastDigit / 2);

describe('docs/DOMAIN.md §4 E12 (constructed example, computed; no published source)', () => {
  const measured = { f0: 20e6, cAdd: 300e-12, f1: 10e6 };

  it('20 MHz → 10 MHz with 300 pF added: C_par = 100 pF, L_par = 633 nH, R = 79.6 Ω', () => {
    const s = sizeFromRinging(measured);
    printed(s.cPar * 1e12, 100, 1);
    printed(s.lPar * 1e9, 633, 1);
    printed(s.resistance, 79.6, 0.1);
  });

  it('with f1 = 12 MHz instead, C_par = 168.75 pF', () => {
    printed(sizeFromRinging({ ...measured, f1: 12e6 }).cPar * 1e12, 168.75, 0.01);
  });

  it('C_snub 3–4 × C_par is 300–400 pF, and at 48 V, 250 kHz the resistor takes 0.17–0.23 W', () => {
    const low = sizeFromRinging({ ...measured, multiple: 3, switchingVoltage: 48, switchingFrequency: 250e3 });
    const high = sizeFromRinging({ ...measured, multiple: 4, switchingVoltage: 48, switchingFrequency: 250e3 });
    printed(low.capacitance * 1e12, 300, 1);
    printed(high.capacitance * 1e12, 400, 1);
    printed(low.power ?? NaN, 0.17, 0.01);
    printed(high.power ?? NaN, 0.23, 0.01);
  });

  it('the buyable parts are the nearest IEC 60063 values: 82 Ω (E24) and 330 pF (E12) for 3 × C_par', () => {
    // E24 neighbours of 79.6 Ω are 75 and 82 (ratios 1.061 and 1.030); E12 neighbours of 300 pF are
    // 270 and 330 (1.111 and 1.100), both read off the IEC 60063 tables.
    const s = sizeFromRinging({ ...measured, multiple: 3 });
    expect(s.resistanceE24).toBe(82);
    expect(s.capacitanceE12).toBeCloseTo(330e-12, 20);
  });
});

describe('measured-ringing method, [S12] "RC Snubbing for the Lab"', () => {
  it('halving the ring frequency means the total capacitance quadrupled: the added C is three times the parasitic', () => {
    for (const cAdd of [47e-12, 1e-9, 22e-9]) {
      const s = sizeFromRinging({ f0: 8e6, cAdd, f1: 4e6 });
      expect(s.cPar / cAdd).toBeCloseTo(1 / 3, 12);
    }
  });

  it('before the snubber a lossless tank rings to twice the step; [S12] shows a 10 V step ringing to 19 V with a little loss', () => {
    const s = sizeFromRinging({ f0: 10e6, cAdd: 300e-12, f1: 5e6 });
    const curves = ringingCurves({ lPar: s.lPar, cPar: s.cPar, resistance: s.resistanceE24, capacitance: s.capacitanceE12, voltage: 10 });
    expect(curves.beforeRinging.peak?.v).toBeCloseTo(2, 9);
    const before = Math.max(...curves.before.map((p) => p.v));
    const after = Math.max(...curves.after.map((p) => p.v));
    expect(before).toBeGreaterThan(19);
    expect(before).toBeLessThanOrEqual(20 + 1e-9);
    // The plotted curve never exceeds the analytic first peak, and the snubbed curve stays below the bare one.
    expect(after).toBeLessThanOrEqual(10 * (curves.afterRinging.peak?.v ?? 1) + 1e-9);
    expect(after).toBeLessThan(before);
  });
});

describe('IEC 60063 preferred values', () => {
  it('rounds to a member of the series on a log scale, across decades', () => {
    // Geometric midpoint between 8.2 and 10 is 9.055: below it 8.2, above it 10 (E12).
    expect(nearestPreferred(9.0, E12)).toBe(8.2);
    expect(nearestPreferred(9.1, E12)).toBe(10);
    expect(nearestPreferred(0.96e-9, E12)).toBeCloseTo(1e-9, 20);
    expect(nearestPreferred(4.75e3, E24)).toBe(4.7e3);
    expect(nearestPreferred(4.95e3, E24)).toBe(5.1e3);
  });
});

describe('resistor dissipation of an RC snubber, C·V²·f_sw ([S13])', () => {
  it('a 1 nF snubber switched 400 V at 100 kHz loses 16 W', () => {
    // 1e-9 × 400² × 1e5 = 16 W, by hand.
    expect(rcSnubberPower(1e-9, 400, 100e3)).toBeCloseTo(16, 12);
  });
});
