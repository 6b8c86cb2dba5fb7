// findT0: the disconnect instant and the level the decay starts from — the user's t0, else the marker
// channel's edge, else where the voltage leaves its pre-trigger level — and the rail's polarity, read
// from the level before the disconnect. A negative rail is turned round here, so every later step sees a
// positive decay and measures |v|.
import type { AnalysisOptions, WaveformAnalysis } from '../../../shared/schema/waveform';
import { WaveformError } from './errors';
import { fitLine, type ExponentialFit } from './fit';
import { interpolateTime, movingAverage, round, zoom, ZOOM_BUCKETS, type Context, type Polarity } from './context';
import { mirrored, type Series } from './summary';

export interface Start {
  t0: number;
  source: WaveformAnalysis['t0Source'];
  /** Pre-trigger level, V (in the rail's sense); null when t0 was given or the capture starts already falling. */
  plateau: number | null;
  /** Level at t0, V (in the rail's sense). */
  v0: number;
}

type Found = Omit<Start, 'v0'>;

export async function findT0(ctx: Context, options: AnalysisOptions, marker: string | null): Promise<Start> {
  const given = await givenT0(ctx, options, marker);
  ctx.polarity = await readPolarity(ctx, given?.t0 ?? null);
  if (ctx.polarity === 'negative') {
    ctx.summary = mirrored(ctx.summary);
    ctx.scales[0] = -ctx.scales[0];
  }
  const found = given ?? (await detectStart(ctx));
  const v0 = found.plateau ?? (await levelAt(ctx, found.t0));
  if (ctx.polarity === 'negative') {
    ctx.notes.push(
      `Negative rail: the voltage before the disconnect is −${round(v0)} V. Its magnitude |v| is analysed, and V0, the trace, the fit and the voltage at the time limit are given as magnitudes.`,
    );
  }
  return { ...found, v0 };
}

/** t0 from the options or from the marker channel's edge; null when neither gives one. */
async function givenT0(ctx: Context, options: AnalysisOptions, marker: string | null): Promise<Found | null> {
  if (options.t0 !== undefined) {
    if (options.t0 < ctx.tStart || options.t0 > ctx.tEnd) {
      throw new WaveformError('T0_OUT_OF_RANGE', `t0 = ${options.t0} s lies outside the capture (${ctx.tStart} s to ${ctx.tEnd} s).`);
    }
    ctx.notes.push('t0 was given with the evidence.');
    return { t0: options.t0, source: 'option', plateau: null };
  }
  if (marker === null) return null;
  const edge = await markerEdge(ctx, marker);
  return edge === null ? null : { t0: edge, source: 'marker', plateau: null };
}

/**
 * The rail's sign: that of the level just before a known disconnect when it is clearly away from zero,
 * else that of the level of largest magnitude in the capture — the plateau before the disconnect of a
 * discharge — smoothed over 1 % of the record so that a spike or ringing cannot decide it.
 */
async function readPolarity(ctx: Context, t0: number | null): Promise<Polarity> {
  const smooth = movingAverage(ctx.summary, (ctx.tEnd - ctx.tStart) / 100);
  let hi = -Infinity;
  let lo = Infinity;
  for (const v of smooth) {
    hi = Math.max(hi, v);
    lo = Math.min(lo, v);
  }
  if (t0 !== null) {
    const level = await levelAt(ctx, t0);
    if (Math.abs(level) > 0.05 * Math.max(Math.abs(hi), Math.abs(lo))) return level < 0 ? 'negative' : 'positive';
  }
  return -lo > hi ? 'negative' : 'positive';
}

/**
 * With a good exponential, a detected decay starts where the fitted curve meets the pre-trigger level,
 * which is sharper than the knee of the bucketed trace.
 */
export function refineT0(ctx: Context, start: Start, fit: ExponentialFit | null, good: boolean): number {
  if (start.source !== 'detected' || start.plateau === null) return start.t0;
  const plateau = start.plateau;
  let t0 = start.t0;
  if (fit && good && plateau > fit.offset) {
    const refined = fit.tRef - fit.tau * Math.log((plateau - fit.offset) / fit.amplitude);
    if (Math.abs(refined - t0) <= 0.2 * fit.tau && refined >= ctx.tStart) t0 = refined;
  }
  ctx.notes.push(`t0 detected where the voltage leaves its pre-trigger level of ${round(plateau)} V.`);
  return t0;
}

/** Edge of the marker channel: first crossing of the level midway between its extremes. */
async function markerEdge(ctx: Context, name: string): Promise<number | null> {
  const s = ctx.summary;
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < s.count; i++) {
    lo = Math.min(lo, s.mmin[i]);
    hi = Math.max(hi, s.mmax[i]);
  }
  if (!(hi - lo > 1e-9 * Math.max(1, Math.abs(hi), Math.abs(lo)))) {
    ctx.notes.push(`Marker channel "${name}" is constant (no edge); t0 is detected from the decay instead.`);
    return null;
  }
  const level = (lo + hi) / 2;
  // First bucket whose range reaches the other side of the level (bucket 0 itself when it holds the edge).
  const startsHigh = s.mm[0] > level;
  let b = 0;
  while (b < s.count && (startsHigh ? s.mmin[b] > level : s.mmax[b] < level)) b++;
  // Sample resolution for the two buckets around the edge (capped: beyond ~10⁸ rows, pairs of samples).
  const capacity = Math.min(1 << 16, Math.max(ZOOM_BUCKETS, 4 * ctx.bucketSize));
  const z = await zoom(ctx, s.tfirst[Math.max(0, b - 1)], s.tlast[Math.min(b, s.count - 1)], capacity);
  const high = z.mm[0] > level;
  for (let k = 1; k < z.count; k++) {
    if (z.mm[k] > level !== high) {
      ctx.notes.push(`t0 is the edge of marker channel "${name}" (crossing ${round(level)} midway between its levels).`);
      return interpolateTime(z.tm[k - 1], z.mm[k - 1], z.tm[k], z.mm[k], level);
    }
  }
  ctx.notes.push(`Marker channel "${name}" has no clean edge; t0 is detected from the decay instead.`);
  return null;
}

/**
 * Best hinge between a flat level and a straight fall over buckets a..z of `s` (least squares with
 * v = P + g·max(0, t − t_h), t_h at a bucket time); returns h.
 */
function hinge(s: Series, a: number, z: number): number {
  const ref = s.tm[a];
  let n = 0;
  let v1 = 0;
  for (let i = a; i <= z; i++) {
    n += s.n[i];
    v1 += s.n[i] * s.vm[i];
  }
  // Suffix sums over buckets after h, built from the end.
  let sn = 0;
  let st = 0;
  let stt = 0;
  let sv = 0;
  let stv = 0;
  let best = a;
  let bestScore = -Infinity;
  for (let h = z; h >= a; h--) {
    const x = s.tm[h] - ref;
    const sx = st - x * sn;
    const sxx = stt - 2 * x * st + x * x * sn;
    const sxv = stv - x * sv;
    const det = n * sxx - sx * sx;
    if (det > 0) {
      // Explained sum of squares of the two-parameter fit; the largest means the smallest residual.
      const p = (sxx * v1 - sx * sxv) / det;
      const g = (n * sxv - sx * v1) / det;
      const score = p * v1 + g * sxv;
      if (score >= bestScore) {
        bestScore = score;
        best = h;
      }
    }
    const t = s.tm[h] - ref;
    sn += s.n[h];
    st += s.n[h] * t;
    stt += s.n[h] * t * t;
    sv += s.n[h] * s.vm[h];
    stv += s.n[h] * t * s.vm[h];
  }
  return best;
}

/** Where the decay begins: the end of the pre-trigger level before the sustained fall. */
async function detectStart(ctx: Context): Promise<Found> {
  const s = ctx.summary;
  let peak = 0;
  for (let i = 1; i < s.count; i++) if (s.vm[i] > s.vm[peak]) peak = i;
  let low = Infinity;
  for (let i = peak; i < s.count; i++) low = Math.min(low, s.vm[i]);
  const swing = s.vm[peak] - low;
  // A fall smaller than 5 % of the level is noise or drift, not a discharge.
  if (!(swing > 0.05 * Math.max(Math.abs(s.vm[peak]), Math.abs(low)))) {
    ctx.notes.push('No fall was found in the capture; t0 is its first sample.');
    return { t0: ctx.tStart, source: 'start', plateau: null };
  }
  const halfLevel = s.vm[peak] - 0.5 * swing;
  let last = s.count - 1;
  while (last > peak && s.vm[last] < halfLevel) last--;
  const z = Math.min(last + 1, s.count - 1);
  let a = peak;
  while (a > 0 && s.vm[a - 1] >= s.vm[peak] - 0.1 * swing) a--;
  let series: Series = s;
  let h = hinge(s, a, z);
  let end = z;
  if (h - a >= 2 && z - h < 16 && ctx.bucketSize > 1) {
    // The fall spans few buckets: locate the knee again on a finer re-read around it.
    const from = s.tm[Math.max(a, h - 16)];
    series = await zoom(ctx, from, s.tlast[z]);
    end = series.count - 1;
    while (end > 0 && series.vm[end - 1] < halfLevel) end--;
    h = hinge(series, 0, end);
  }
  if (series === s ? h - a < 2 : h < 2) {
    ctx.notes.push('The capture starts while the voltage is already falling (no pre-trigger level); t0 is its first sample.');
    return { t0: ctx.tStart, source: 'start', plateau: null };
  }
  // The fall starts where the smoothed trace last leaves a band of four noise deviations below the
  // plateau; a line through the next few band widths of fall, extended back to the plateau, places the
  // start. Close to the knee any smooth fall (exponential, constant current or power) is nearly
  // straight, so the result hardly depends on the shape. The plateau is first taken from the earlier
  // half of the stretch before the hinge (a slowly starting fall can pull the hinge late), then again
  // from everything before the exit found with it.
  const smooth = movingAverage(series, 16 * ctx.dt);
  const perPoint = Math.max(16, series.n[Math.max(0, h - 1)]);
  const exitBelow = (level: { mean: number; sigma: number }) => {
    const band = Math.max((4 * level.sigma) / Math.sqrt(perPoint), 1e-3 * swing);
    let exit = end;
    while (exit > 0 && smooth[exit] < level.mean - band) exit--;
    return { exit, band };
  };
  const before = (t: number) => {
    let upTo = a;
    while (upTo < s.count && s.tlast[upTo] < t) upTo++;
    // Coarse buckets wholly before t, less one, when there are any; else the finer series.
    if (upTo - 1 > a) return levelStats(s, a, upTo - 1);
    let fine = 0;
    while (fine < series.count && series.tlast[fine] < t) fine++;
    return levelStats(series, 0, Math.max(1, fine - 1));
  };
  const first = before(s.tm[a] + (series.tm[h] - s.tm[a]) / 2);
  const level = before(series.tm[exitBelow(first).exit]);
  const { exit, band } = exitBelow(level);
  let stop = exit + 1;
  while (stop <= end && smooth[stop] >= level.mean - 5 * band) stop++;
  const line = fitLine(series, exit + 1, Math.min(end + 1, Math.max(stop, exit + 4)));
  const t0 = line && line.slope < 0 ? (level.mean - line.intercept) / line.slope : series.tm[exit];
  return { t0: Math.min(Math.max(t0, s.tfirst[a]), series.tm[end]), source: 'detected', plateau: level.mean };
}

/** Mean and standard deviation of the samples in buckets from..to (exclusive). */
function levelStats(s: Series, from: number, to: number): { mean: number; sigma: number } {
  let weight = 0;
  let sum = 0;
  for (let i = from; i < to; i++) {
    weight += s.n[i];
    sum += s.n[i] * s.vm[i];
  }
  const mean = sum / weight;
  let squares = 0;
  for (let i = from; i < to; i++) squares += s.svv[i] + s.n[i] * (s.vm[i] - mean) ** 2;
  return { mean, sigma: Math.sqrt(squares / weight) };
}

/**
 * Voltage at t: the mean of the samples just before t when there are enough (the level the decay starts
 * from), else a line through the samples around t, evaluated at t.
 */
async function levelAt(ctx: Context, t: number): Promise<number> {
  const span = Math.max(32 * ctx.dt, (ctx.tEnd - ctx.tStart) / 4000);
  const z = await zoom(ctx, t - span, t + span);
  let weight = 0;
  let sum = 0;
  for (let i = 0; i < z.count && z.tm[i] <= t; i++) {
    weight += z.n[i];
    sum += z.n[i] * z.vm[i];
  }
  if (weight >= 8) return sum / weight;
  const line = fitLine(z, 0, z.count);
  return line ? line.intercept + line.slope * t : z.vm[0];
}
