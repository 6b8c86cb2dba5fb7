// A capture made by ngspice's transient analysis of a known RC bleeder, read back as evidence: the
// fitted τ and the crossing must agree with R·C and τ·ln(V0/Vsafe) and with ngspice's own measurement.
import { describe, expect, test } from 'vitest';
import { analyseCaptureText } from '../../server/evidence/waveform/reader';
import { spiceCapture } from './spice-capture';

// [S2] bleeder worked example (docs/DOMAIN.md §4 E1): 1.32 µF, 220 kΩ, 360 V → τ = 0.290 s, 60 V after 0.520 s.
const e1 = { v0: 360, capacitance: 1.32e-6, resistance: 220e3, open: 0.1, stop: 1.6, step: 2e-4 };
const tau = e1.resistance * e1.capacitance;
const crossing = tau * Math.log(360 / 60);

describe('ngspice transient of the [S2] bleeder example as a capture', () => {
  test('analytic values of the example', () => {
    expect(tau).toBeCloseTo(0.2904, 4); // [S2] 0.290 s
    expect(crossing).toBeCloseTo(0.52, 3); // [S2] 0.520 s
  });

  test('t0 from the relay marker: τ and crossing within 1 % of R·C and τ·ln(V0/Vsafe), and of ngspice', async () => {
    const capture = await spiceCapture(e1, 60);
    expect(Math.abs(capture.measuredCrossing - crossing)).toBeLessThan(0.001 * crossing);
    const result = await analyseCaptureText(capture.text, { safeVoltage: 60, maxTime: 0.75, channel: 'Bus', markerChannel: 'Relay' });
    expect(result.t0Source).toBe('marker');
    expect(Math.abs(result.t0 - e1.open)).toBeLessThan(1e-4);
    expect(result.fit).toBe('good');
    expect(Math.abs((result.tau ?? NaN) - tau)).toBeLessThan(0.01 * tau);
    expect(Math.abs((result.timeToSafe ?? NaN) - crossing)).toBeLessThan(0.01 * crossing);
    expect(Math.abs((result.timeToSafe ?? NaN) - capture.measuredCrossing)).toBeLessThan(0.01 * crossing);
    expect(Math.abs(result.v0 - 360)).toBeLessThan(0.5);
    expect(result.rSquared).toBeGreaterThan(0.9999);
    // 0.75 s after opening: 360·e^(−0.75/τ)
    expect(Math.abs((result.vAtLimit ?? NaN) - 360 * Math.exp(-0.75 / tau))).toBeLessThan(0.01 * 360 * Math.exp(-0.75 / tau));
  });

  test('t0 detected from the decay alone agrees too (non-uniform time steps, no marker)', async () => {
    const capture = await spiceCapture(e1, 60);
    const result = await analyseCaptureText(capture.text, { safeVoltage: 60, channel: 'Bus (V)' });
    expect(result.t0Source).toBe('detected');
    expect(Math.abs(result.t0 - e1.open)).toBeLessThan(0.001 * tau);
    expect(Math.abs((result.tau ?? NaN) - tau)).toBeLessThan(0.01 * tau);
    expect(Math.abs((result.timeToSafe ?? NaN) - crossing)).toBeLessThan(0.01 * crossing);
  });
});
