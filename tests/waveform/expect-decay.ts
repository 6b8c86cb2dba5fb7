// Checks of an analysis against the generator's truth (capture-generator.ts: the analytic RC law,
// V = V0·e^(−t/τ) + offset, common practice), shared by the layout tests.
import { expect } from 'vitest';
import { waveformAnalysisSchema, type WaveformAnalysis } from '../../shared/schema/waveform';
import { timeToLevel, type DecaySpec } from './capture-generator';

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
