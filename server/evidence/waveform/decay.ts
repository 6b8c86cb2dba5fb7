// fitDecay: V = A·e^(−(t−t0)/τ) + B over the window from the last pass through 90 % of the fall to the
// first pass through 10 % (docs/DOMAIN.md §5.2 step 3), and whether the fit is good enough to report τ.
import { interpolateTime, lastAbove, round, zoom, type Context } from './context';
import { fitExponential, type ExponentialFit } from './fit';
import { firstAtOrAfter, slice, type Series } from './summary';

/** Fewer summary buckets than this in the fit window → re-read the window at finer resolution. */
const FIT_MIN_BUCKETS = 512;

export interface DecayFit {
  fit: ExponentialFit | null;
  good: boolean;
  window: { from: number; to: number } | null;
}

/** Offset guess from the tail: its level when the capture has flattened out, else zero. */
function tailLevel(s: Series, i0: number, v0: number, t0: number): number {
  const points = s.count - i0;
  if (points < 20) return 0;
  const m = Math.max(1, Math.floor(points / 20));
  const mean = (from: number, to: number) => {
    let w = 0;
    let v = 0;
    let t = 0;
    for (let i = from; i < to; i++) {
      w += s.n[i];
      v += s.n[i] * s.vm[i];
      t += s.n[i] * s.tm[i];
    }
    return { v: v / w, t: t / w };
  };
  const early = mean(s.count - 2 * m, s.count - m);
  const late = mean(s.count - m, s.count);
  const tailSlope = Math.abs(late.v - early.v) / (late.t - early.t);
  const overallSlope = Math.abs(v0 - late.v) / (late.t - t0);
  return tailSlope < 0.02 * overallSlope ? late.v : 0;
}

function firstBelow(s: Series, from: number, level: number): number | null {
  for (let i = Math.max(from, 0); i < s.count; i++) {
    if (s.vm[i] <= level) {
      return i > from ? interpolateTime(s.tm[i - 1], s.vm[i - 1], s.tm[i], s.vm[i], level) : s.tm[i];
    }
  }
  return null;
}

/** Why the fit cannot stand for the trace; empty when it is good. */
function fitProblems(fit: ExponentialFit, v0: number, swing: number): string[] {
  const problems: string[] = [];
  if (!(fit.tau > 0) || !(fit.amplitude > 0)) problems.push('no decaying exponential fits the samples');
  else if (!fit.converged) problems.push('the fit does not settle on a time constant');
  if (Math.abs(fit.offset) > 0.2 * Math.abs(v0)) problems.push(`the fitted offset (${round(fit.offset)} V) is over 20 % of V0`);
  if (!(fit.rSquared >= 0.99)) problems.push(`R² is only ${fit.rSquared.toFixed(4)}`);
  if (fit.residualRms > 0.03 * swing) problems.push(`the residual (${round(fit.residualRms)} V rms) is over 3 % of the fall`);
  else if (fit.runsZ < -4 && fit.residualRms > 0.005 * swing) problems.push('the residuals are systematic, not noise');
  return problems;
}

export async function fitDecay(ctx: Context, t0: number, v0: number): Promise<DecayFit> {
  const s = ctx.summary;
  const i0 = firstAtOrAfter(s, t0);
  const base = tailLevel(s, i0, v0, t0);
  if (!(v0 > base)) {
    ctx.notes.push('The voltage does not fall after t0, so no time constant can be fitted.');
    return { fit: null, good: false, window: null };
  }
  const high = base + 0.9 * (v0 - base);
  const firstFall = firstBelow(s, i0, high);
  if (firstFall === null) {
    ctx.notes.push('The voltage never falls below 90 % of V0, so no time constant can be fitted.');
    return { fit: null, good: false, window: null };
  }
  let to = firstBelow(s, firstAtOrAfter(s, firstFall), base + 0.1 * (v0 - base));
  if (to === null) {
    to = ctx.tEnd;
    ctx.notes.push('The capture ends before the voltage falls to 10 % of V0; the fit window runs to its end.');
  }
  // The window opens where the voltage passes 90 % for the last time before 10 %, so that a switching
  // transient dipping below 90 % at the disconnect stays outside it.
  const last = lastAbove(s, s.vm, i0, high, firstAtOrAfter(s, to));
  const from = last >= i0 && last + 1 < s.count ? interpolateTime(s.tm[last], s.vm[last], s.tm[last + 1], s.vm[last + 1], high) : firstFall;
  const window = { from, to };
  const first = firstAtOrAfter(s, from);
  const end = firstAtOrAfter(s, to);
  const series = end - first < FIT_MIN_BUCKETS && ctx.bucketSize > 1 ? await zoom(ctx, from, to) : slice(s, first, end);
  const fit = fitExponential(series, from, base);
  if (!fit) {
    ctx.notes.push('The samples in the fit window do not decay; no time constant is reported.');
    return { fit: null, good: false, window };
  }
  const problems = fitProblems(fit, v0, v0 - base);
  if (problems.length) {
    ctx.notes.push(`Poor exponential fit: ${problems.join('; ')}. No time constant is reported; the crossing time is measured directly.`);
  }
  return { fit, good: problems.length === 0, window };
}
