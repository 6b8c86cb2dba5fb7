// A capture never reads as safe because of its sign. A negative rail is read from the level before the
// disconnect and measured as |v|; a swing of the other sign beyond the safe level is not safe either.
// Truth: the generator's analytic RC law (V = V0·e^(−t/τ) + offset, common practice) with its sign
// turned round, or an ngspice transient of a negative bus.
import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { analyseCaptureText } from '../../server/evidence/waveform/reader';
import { measuredDischargeCheck } from '../../shared/engine/measured';
import type { WaveformAnalysis } from '../../shared/schema/waveform';
import { captureText, gaussian, random, sampleDecay, timeToLevel, type DecaySpec } from './capture-generator';
import { expectDecay, expectWithin, SAFE } from './expect-decay';
import { spiceCapture } from './spice-capture';

const base: DecaySpec = { v0: 450, tau: 0.1, offset: 0, t0: 0, start: -0.05, interval: 1e-4, samples: 8001, noise: 1, seed: 71 };

/** The capture of `spec` with every value's sign turned round (a rail at −V0). */
function negativeCapture(spec: DecaySpec, extra: { relay?: boolean } = {}): string {
  const { time, volts } = sampleDecay(spec);
  const columns = [{ header: 'Time (s)', values: time }];
  if (extra.relay) columns.push({ header: 'Relay (V)', values: time.map((t) => (t < spec.t0 ? 5 : 0)) });
  columns.push({ header: 'DC- (V)', values: volts.map((v) => -v) });
  return captureText(columns);
}

/**
 * The measured check of a capture against a limit, τ band around the generator's τ (±10 %, invented for
 * the check's band only). The design's maximum bus is the capture's own |V0| (450 V), so the crossing is
 * used as measured; no probe resistance is given, so the bank's capacitance plays no part.
 */
function check(analysis: WaveformAnalysis, maxTime: number, tau: number) {
  const conditions = { safeVoltage: SAFE, maxTime, maxVoltage: 450, capacitanceMin: 1e-6 };
  return measuredDischargeCheck(analysis, conditions, { nominalTau: tau, worstCaseTau: 1.1 * tau, toleranceBand: 0.1 }, 'negative.csv')[0];
}

describe('negative rails', () => {
  test('a passing negative trace: −450 V, τ 0.1 s, below |60 V| after τ·ln(450/60) = 0.201 s against 0.5 s', async () => {
    const analysis = await analyseCaptureText(negativeCapture(base), { safeVoltage: SAFE, maxTime: 0.5 });
    expectDecay(analysis, base);
    expect(analysis.polarity).toBe('negative');
    expect(analysis.notes.join(' ')).toMatch(/Negative rail: the voltage before the disconnect is −450 V/);
    // 0.5 s = 5 τ: |v| = 450·e^−5
    expect(Math.abs((analysis.vAtLimit ?? NaN) - 450 * Math.exp(-5))).toBeLessThan(0.3);
    expect(analysis.trace.every((p) => p.v > -10)).toBe(true);
    const result = check(analysis, 0.5, 0.1);
    expect(result.pass).toBe(true);
    expect(result.detail).toMatch(/from -450 V \(negative rail, measured as \|v\|\)/);
    expectWithin(result.value, timeToLevel(base, SAFE), 0.01);
  });

  test('a failing negative trace: −450 V, τ 0.6 s, |60 V| only after 1.209 s against 0.75 s (it read "0 s" before)', async () => {
    const spec = { ...base, tau: 0.6, start: -0.2, interval: 5e-4, samples: 8001, seed: 72 };
    const analysis = await analyseCaptureText(negativeCapture(spec), { safeVoltage: SAFE, maxTime: 0.75 });
    expectDecay(analysis, spec);
    const result = check(analysis, 0.75, 0.6);
    expect(result.pass).toBe(false);
    expectWithin(result.value, 0.6 * Math.log(450 / 60), 0.01);
    expect(result.margin).toBeLessThan(0);
  });

  test('a negative bus held at −75 V by a leakage path never reads as safe', async () => {
    const spec = { ...base, v0: 250, offset: 75, samples: 6001, seed: 73 };
    const analysis = await analyseCaptureText(negativeCapture(spec), { safeVoltage: SAFE, maxTime: 0.5 });
    expect(analysis.polarity).toBe('negative');
    expect(analysis.timeToSafe).toBeNull();
    expect(check(analysis, 0.5, 0.1)).toMatchObject({ pass: false, value: null });
  });

  test('negative constant-current active discharge: the crossing is measured though the fit is poor ([S10] scenario, docs/DOMAIN.md §4 E4: 1.17 s)', async () => {
    const spec: DecaySpec = {
      shape: 'constant-current',
      v0: 450,
      slope: 0.2 / 600e-6,
      t0: 0,
      start: -0.2,
      interval: 2e-4,
      samples: 8001,
      noise: 1,
      seed: 74,
    };
    const analysis = await analyseCaptureText(negativeCapture(spec), { safeVoltage: SAFE });
    expect(analysis).toMatchObject({ polarity: 'negative', fit: 'poor', tau: null });
    expectWithin(analysis.timeToSafe, 1.17, 0.01);
  });

  test('the polarity is read at a marker edge and at a t0 given with the evidence', async () => {
    const spec = { ...base, t0: 0.0123, seed: 75 };
    const text = negativeCapture(spec, { relay: true });
    const marked = await analyseCaptureText(text, { safeVoltage: SAFE, channel: 'DC-', markerChannel: 'Relay' });
    expect(marked).toMatchObject({ polarity: 'negative', t0Source: 'marker' });
    expectDecay(marked, spec);
    const given = await analyseCaptureText(text, { safeVoltage: SAFE, channel: 'DC-', t0: spec.t0 });
    expect(given).toMatchObject({ polarity: 'negative', t0Source: 'option', t0: spec.t0 });
    expectWithin(given.timeToSafe, timeToLevel(spec, SAFE), 0.01);
  });

  test('an ngspice transient of the [S2] bleeder on a −360 V bus (docs/DOMAIN.md §4 E1): τ = R·C and the crossing ngspice measures', async () => {
    const e1 = { v0: -360, capacitance: 1.32e-6, resistance: 220e3, open: 0.1, stop: 1.6, step: 2e-4 };
    const capture = await spiceCapture(e1, SAFE);
    const analysis = await analyseCaptureText(capture.text, { safeVoltage: SAFE, channel: 'Bus', markerChannel: 'Relay' });
    expect(analysis.polarity).toBe('negative');
    expectWithin(analysis.v0, 360, 0.01);
    expectWithin(analysis.tau, e1.resistance * e1.capacitance, 0.01);
    expectWithin(analysis.timeToSafe, capture.measuredCrossing, 0.01);
    expectWithin(analysis.timeToSafe, e1.resistance * e1.capacitance * Math.log(360 / 60), 0.01);
  });

  test('property (fast-check, seeded): a rail and its mirror image give the same analysis, but for the polarity', async () => {
    const specArb = fc.record({
      v0: fc.double({ min: 100, max: 1000, noNaN: true }),
      tau: fc.double({ min: 0.02, max: 0.3, noNaN: true }),
      t0: fc.double({ min: 0, max: 0.05, noNaN: true }),
      noise: fc.double({ min: 0, max: 2, noNaN: true }),
      seed: fc.integer({ min: 1, max: 1000 }),
    });
    await fc.assert(
      fc.asyncProperty(specArb, async (s) => {
        const spec: DecaySpec = { ...s, start: -0.05, interval: 5e-4, samples: 3001 };
        const { time, volts } = sampleDecay(spec);
        const write = (values: number[]) =>
          captureText([
            { header: 'Time (s)', values: time },
            { header: 'CH1 (V)', values },
          ]);
        const positive = await analyseCaptureText(write(volts), { safeVoltage: SAFE, maxTime: 0.5 });
        const negative = await analyseCaptureText(write(volts.map((v) => -v)), { safeVoltage: SAFE, maxTime: 0.5 });
        expect(negative.polarity).toBe('negative');
        const { polarity: _p, notes: positiveNotes, ...same } = positive;
        const { polarity: _n, notes: negativeNotes, ...mirrored } = negative;
        expect(mirrored).toEqual(same);
        expect(negativeNotes.slice(1)).toEqual(positiveNotes);
      }),
      { seed: 20250518, numRuns: 12 },
    );
  });
});

describe('a swing of the other sign beyond the safe level is not safe', () => {
  // Two RC decays of opposite sign superposed (common practice): V = A·e^(−t/τ1) − B·e^(−t/τ2), plateau
  // A − B = 400 V. It falls through zero to −111 V and comes back.
  const law = (t: number) => (t <= 0 ? 400 : 600 * Math.exp(-t / 0.05) - 200 * Math.exp(-t / 0.4));
  /** Root of law(t) = level between a and b (bisection on the analytic law). */
  const root = (level: number, a: number, b: number) => {
    for (let i = 0; i < 200; i++) {
      const m = (a + b) / 2;
      if (law(m) - level > 0 === law(a) - level > 0) a = m;
      else b = m;
    }
    return (a + b) / 2;
  };
  const capture = (settle: number) => {
    const normal = gaussian(random(81));
    const time = Array.from({ length: 8001 }, (_, i) => -0.05 + i * 2e-4);
    const volts = time.map((t) => law(t) + (t > 0 ? settle : 0) + 0.5 * normal());
    return captureText([
      { header: 'Time (s)', values: time },
      { header: 'CH1 (V)', values: volts },
    ]);
  };

  test('the time to safe is when the swing comes back inside −60 V, not when the fall first passes +60 V', async () => {
    const tMin = Math.log(24) / 17.5; // dV/dt = 0: 12000·e^(−20t) = 500·e^(−2.5t)
    expect(law(tMin)).toBeLessThan(-110);
    const analysis = await analyseCaptureText(capture(0), { safeVoltage: SAFE });
    expect(analysis.polarity).toBe('positive');
    expectWithin(analysis.timeToSafe, root(-SAFE, tMin, 1.5), 0.01);
    expect(analysis.timeToSafe).toBeGreaterThan(2 * root(SAFE, 0, tMin));
    expect(analysis.warnings?.join(' ')).toMatch(/swings beyond −60 V, of the opposite sign to the rail/);
  });

  test('a trace that ends beyond −60 V has no time to safe', async () => {
    const analysis = await analyseCaptureText(capture(-60), { safeVoltage: SAFE, maxTime: 1 });
    expect(analysis.timeToSafe).toBeNull();
    expect(analysis.warnings?.join(' ')).toMatch(/At the end of the capture the voltage is beyond −60 V/);
  });
});
