// measureCrossings: when the voltage is within the safe level to stay, and the voltage at the time limit
// (docs/DOMAIN.md §5.2 step 2). Safe means |v| ≤ the safe level: the fall of the rail below it, and any
// excursion of the other sign beyond it (ringing through zero, a reversed bus), both have to be over.
import type { AnalysisOptions } from '../../../shared/schema/waveform';
import { interpolateTime, lastAbove, movingAverage, round, warn, zoom, type Context } from './context';
import { fitLine } from './fit';
import { firstAtOrAfter, mirrored, type Series } from './summary';

export interface Crossings {
  /** s after t0; null when the capture ends before the voltage is within the safe level to stay. */
  timeToSafe: number | null;
  /** Absent without a time limit; null when the capture ends before it. */
  vAtLimit?: number | null;
}

type Sense = 1 | -1;

/**
 * Smoothing span for the crossing of `level` near `rough`: 1/50 of the time it takes, and no more than
 * 1/25 of the local time scale level/|dV/dt| — a steep, curved end of a fall (constant power) needs a
 * shorter span than its duration suggests, or the curvature inside the span shifts the result.
 */
function crossingSpan(ctx: Context, s: Series, t0: number, rough: number, level: number): number {
  const elapsed = rough - t0;
  let span = elapsed / 50;
  const line = fitLine(s, firstAtOrAfter(s, rough - elapsed / 20), firstAtOrAfter(s, rough + elapsed / 20));
  if (line && line.slope < 0) span = Math.min(span, Math.abs(level / line.slope) / 25);
  return Math.max(span, 2 * ctx.dt);
}

/**
 * First time after t0 at which the smoothed voltage, times `sense`, falls below `level` and stays below
 * until the end of the capture (linear interpolation); null when it is still above at the end. Found on
 * the whole-file summary, then refined on a fine re-read around it.
 */
async function crossing(ctx: Context, t0: number, level: number, sense: Sense): Promise<number | null> {
  const view = (series: Series) => (sense === 1 ? series : mirrored(series));
  const s = view(ctx.summary);
  const i0 = firstAtOrAfter(s, t0);
  const rough = lastAbove(s, s.vm, i0, level);
  const span = crossingSpan(ctx, s, t0, rough >= i0 ? s.tm[rough] : t0, level);
  const smooth = movingAverage(s, span);
  const b = lastAbove(s, smooth, i0, level);
  if (b < i0) return t0;
  if (b === s.count - 1) return null;
  const coarse = Math.max(t0, interpolateTime(s.tm[b], smooth[b], s.tm[b + 1], smooth[b + 1], level));
  const z = view(await zoom(ctx, s.tfirst[b] - 3 * span, s.tlast[b + 1] + 3 * span));
  const fine = movingAverage(z, span);
  const j = lastAbove(z, fine, firstAtOrAfter(z, t0), level);
  if (j < 0 || j === z.count - 1) return coarse;
  const last = interpolateTime(z.tm[j], fine[j], z.tm[j + 1], fine[j + 1], level);
  // The last smoothed excursion above the level is biased late by the noise; a straight line through
  // the samples within two spans either side of it crosses the level at the unbiased place, which is
  // taken whenever it falls inside that stretch (curvature over it shifts the result by < 0.1 %).
  const line = fitLine(z, firstAtOrAfter(z, last - 2 * span), firstAtOrAfter(z, last + 2 * span));
  const local = line && line.slope < 0 ? (level - line.intercept) / line.slope : NaN;
  return Math.max(t0, Math.abs(local - last) <= 2 * span ? local : last);
}

/** Voltage at time t, averaged over the same span the crossing uses. */
async function smoothedAt(ctx: Context, t: number, span: number): Promise<number> {
  const z = await zoom(ctx, t - span / 2, t + span / 2);
  let weight = 0;
  let sum = 0;
  for (let i = 0; i < z.count; i++) {
    weight += z.n[i];
    sum += z.n[i] * z.vm[i];
  }
  return weight > 0 ? sum / weight : NaN;
}

export async function measureCrossings(ctx: Context, t0: number, options: AnalysisOptions): Promise<Crossings> {
  const { safeVoltage, maxTime } = options;
  // A capture that is safe throughout proves no discharge: more often it is the wrong channel, unit or
  // scale (probe-side volts read as bus volts) than a bus that was never charged.
  let peak = -Infinity;
  for (let i = 0; i < ctx.summary.count; i++) peak = Math.max(peak, ctx.summary.vm[i]);
  if (peak <= safeVoltage) {
    warn(
      ctx,
      `The voltage never rises above ${safeVoltage} V in the capture, so it shows no discharge from a hazardous level. Check the channel, its unit and the voltage scale.`,
    );
  }
  const fall = await crossing(ctx, t0, safeVoltage, 1);
  const swing = await crossing(ctx, t0, safeVoltage, -1);
  const crossAt = fall === null || swing === null ? null : Math.max(fall, swing);
  const beyond = `${ctx.polarity === 'positive' ? '−' : '+'}${safeVoltage} V`;
  if (swing === null) {
    warn(ctx, `At the end of the capture the voltage is beyond ${beyond}, of the opposite sign to the rail: that is not safe either.`);
  } else if (fall !== null && swing > fall) {
    warn(
      ctx,
      `After t0 the voltage swings beyond ${beyond}, of the opposite sign to the rail; it stays within ±${safeVoltage} V only from ${round(swing - t0)} s after t0.`,
    );
  }
  if (fall === null) {
    ctx.notes.push(
      `The voltage does not fall below ${safeVoltage} V and stay there within the capture, which ends ${round(ctx.tEnd - t0)} s after t0.`,
    );
  }
  const result: Crossings = { timeToSafe: crossAt === null ? null : Math.max(0, crossAt - t0) };
  if (maxTime !== undefined) {
    const at = t0 + maxTime;
    if (at > ctx.tEnd) {
      result.vAtLimit = null;
      ctx.notes.push(`The capture ends ${round(ctx.tEnd - t0)} s after t0, before the time limit of ${maxTime} s.`);
    } else {
      result.vAtLimit = await smoothedAt(ctx, at, Math.max(maxTime / 50, 2 * ctx.dt));
    }
  }
  return result;
}
