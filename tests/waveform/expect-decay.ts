// Checks of an analysis against the generator's truth (capture-generator.ts: the analytic RC law,
// V = V0·e^(−t/τ) + offset, common practice), shared by the layout tests; and the analysed capture of a
// trace that is not an exponential, shared by the measured-check tests.
import { expect } from 'vitest';
import { waveformAnalysisSchema, type WaveformAnalysis } from '../../shared/schema/waveform';
import { analyseCaptureText } from '../../server/evidence/waveform/reader';
import { captureText, sampleDecay, timeToLevel, type DecaySpec } from './capture-generator';

export const SAFE = 60;

export function expectWithin(actual: number | null | undefined, expected: number, fraction: number): void {
  expect(actual).not.toBeNull();
  expect(actual).toBeDefined();
  expect(Math.abs((actual as number) - expected)).toBeLessThanOrEqual(fraction * Math.abs(expected));
}

/** τ and crossing within 1 % of the generator's truth; V0 within 1 %; t0 within 1 % of τ. */
export function expectDecay(result: WaveformAnalysis, spec: DecaySpec): void {
  expect(waveformAnalysisSchema.parse(result)).toEqual(result);
  expect(result.fit).toBe('good');
  expectWithin(result.tau, spec.tau ?? NaN, 0.01);
  expectWithin(result.timeToSafe, timeToLevel(spec, SAFE), 0.01);
  expectWithin(result.v0, spec.v0 + (spec.offset ?? 0), 0.01);
  expect(Math.abs(result.t0 - spec.t0)).toBeLessThanOrEqual(0.01 * (spec.tau ?? NaN));
  expect(result.trace.length).toBeGreaterThan(100);
  expect(result.trace.length).toBeLessThanOrEqual(2000);
}

/**
 * A constant-current active discharge ([S10] scenario, docs/DOMAIN.md §4 E4: 600 µF at 0.2 A) captured
 * from `v0` with 0.1 s of pre-trigger and 0.5 V of noise, analysed against the 60 V safe level.
 */
export function analyseConstantCurrent(v0: number, seed: number): Promise<WaveformAnalysis> {
  const { time, volts } = sampleDecay({
    shape: 'constant-current',
    v0,
    slope: 0.2 / 600e-6,
    t0: 0,
    start: -0.1,
    interval: 1e-4,
    samples: 15001,
    noise: 0.5,
    seed,
  });
  return analyseCaptureText(
    captureText([
      { header: 'Time (s)', values: time },
      { header: 'CH1 (V)', values: volts },
    ]),
    { safeVoltage: SAFE },
  );
}
