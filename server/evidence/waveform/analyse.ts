// What a discharge capture proves (REFERENCE.md §5 "Analysis"): the disconnect instant t0, V0, the
// time until the voltage falls below the safe level and stays there, and the time constant of the decay.
//
// One full pass builds a bounded summary (summary.ts); every later step works on that summary, and
// where it needs finer detail than the summary's buckets it re-reads only the short byte range involved
// (a "zoom"). Memory stays bounded whatever the file size; the file is read about once.
import type { AnalysisOptions, ChannelRef, TracePoint, WaveformAnalysis } from '../../../shared/schema/waveform';
import { WaveformError } from './errors';
import { fitExponential, fitLine, type ExponentialFit } from './fit';
import { readLayout, type CaptureLayout } from './layout';
import { readPass } from './samples';
import type { ByteSource } from './source';
import { Summary, firstAtOrAfter, slice, type Series } from './summary';

/** Buckets of the whole-file summary (2^14: 2.5 MB, and fine enough to locate every feature). */
const SUMMARY_BUCKETS = 1 << 14;
/** Buckets of a zoomed re-read. */
const ZOOM_BUCKETS = 1 << 12;
/** Fewer summary buckets than this in the fit window → re-read the window at finer resolution. */
const FIT_MIN_BUCKETS = 512;
const MIN_SAMPLES = 10;
const TRACE_POINTS = 2000;

interface Context {
  source: ByteSource;
  layout: CaptureLayout;
  columns: number[];
  scales: number[];
  summary: Summary;
  tStart: number;
  tEnd: number;
  /** Mean sample interval, s. */
  dt: number;
  notes: string[];
}

function pickChannel(layout: CaptureLayout, ref: ChannelRef, what: string): number {
  if (typeof ref === 'number') {
    if (ref < layout.channelColumns.length) return ref;
    throw new WaveformError(
      'CHANNEL_NOT_FOUND',
      `The ${what} index ${ref} does not exist; the file has ${layout.channelColumns.length} channel(s): ${layout.channelNames.join(', ')}.`,
    );
  }
  const wanted = ref.trim().toLowerCase();
  const index = layout.channelColumns.findIndex((column, i) => {
    const info = layout.columns[column];
    return layout.channelNames[i].toLowerCase() === wanted || (info.header?.base ?? '').toLowerCase() === wanted;
  });
  if (index >= 0) return index;
  throw new WaveformError(
    'CHANNEL_NOT_FOUND',
    `The ${what} "${ref}" is not in the file; its channels are: ${layout.channelNames.join(', ')}.`,
  );
}

/** The samples with time in [ta, tb], summarised at the finest resolution `capacity` buckets allow. */
async function zoom(ctx: Context, ta: number, tb: number, capacity = ZOOM_BUCKETS): Promise<Series> {
  const s = ctx.summary;
  if (s.size === 1) {
    let to = firstAtOrAfter(s, tb);
    while (to < s.count && s.tm[to] <= tb) to++;
    return slice(s, firstAtOrAfter(s, ta), to);
  }
  let first = 0;
  let hi = s.count;
  while (first < hi) {
    const mid = (first + hi) >> 1;
    if (s.tlast[mid] < ta) first = mid + 1;
    else hi = mid;
  }
  let end = first;
  while (end < s.count && s.tfirst[end] <= tb) end++;
  const z = new Summary(capacity);
  if (first >= s.count) return z.finish();
  const marker = ctx.columns.length > 1;
  await readPass(
    ctx.source,
    ctx.layout,
    ctx.columns,
    ctx.scales,
    { from: s.offset[first], to: end < s.count ? s.offset[end] : ctx.source.size, firstRow: s.row[first] },
    (batch) => {
      const { data, stride, count } = batch;
      let from = 0;
      while (from < count && data[from * stride] < ta) from++;
      let to = from;
      while (to < count && data[to * stride] <= tb) to++;
      z.pushBatch(data, stride, marker, batch.offsets, batch.rows, from, to);
    },
  );
  return z.finish();
}

/** Centred moving average of the bucket means over a time span, weighted by sample counts. */
function movingAverage(s: Series, span: number): Float64Array {
  const out = new Float64Array(s.count);
  const half = span / 2;
  let lo = 0;
  let hi = 0;
  let weight = 0;
  let sum = 0;
  for (let i = 0; i < s.count; i++) {
    while (hi < s.count && s.tm[hi] <= s.tm[i] + half) {
      weight += s.n[hi];
      sum += s.n[hi] * s.vm[hi];
      hi++;
    }
    while (s.tm[lo] < s.tm[i] - half) {
      weight -= s.n[lo];
      sum -= s.n[lo] * s.vm[lo];
      lo++;
    }
    out[i] = sum / weight;
  }
  return out;
}

function interpolateTime(t1: number, v1: number, t2: number, v2: number, level: number): number {
  return v2 === v1 ? t2 : t1 + ((level - v1) * (t2 - t1)) / (v2 - v1);
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
  const capacity = Math.min(1 << 16, Math.max(ZOOM_BUCKETS, 4 * s.size));
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

interface Start {
  t0: number;
  /** Pre-trigger level, V; null when the capture starts already falling. */
  plateau: number | null;
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
async function detectStart(ctx: Context): Promise<Start> {
  const s = ctx.summary;
  let peak = 0;
  for (let i = 1; i < s.count; i++) if (s.vm[i] > s.vm[peak]) peak = i;
  let low = Infinity;
  for (let i = peak; i < s.count; i++) low = Math.min(low, s.vm[i]);
  const swing = s.vm[peak] - low;
  // A fall smaller than 5 % of the level is noise or drift, not a discharge.
  if (!(swing > 0.05 * Math.max(Math.abs(s.vm[peak]), Math.abs(low)))) {
    ctx.notes.push('No fall was found in the capture; t0 is its first sample.');
    return { t0: ctx.tStart, plateau: null };
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
  if (h - a >= 2 && z - h < 16 && s.size > 1) {
    // The fall spans few buckets: locate the knee again on a finer re-read around it.
    const from = s.tm[Math.max(a, h - 16)];
    series = await zoom(ctx, from, s.tlast[z]);
    end = series.count - 1;
    while (end > 0 && series.vm[end - 1] < halfLevel) end--;
    h = hinge(series, 0, end);
  }
  if (series === s ? h - a < 2 : h < 2) {
    ctx.notes.push('The capture starts while the voltage is already falling (no pre-trigger level); t0 is its first sample.');
    return { t0: ctx.tStart, plateau: null };
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
  return { t0: Math.min(Math.max(t0, s.tfirst[a]), series.tm[end]), plateau: level.mean };
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

/** Last bucket in from..before (exclusive) whose value is above `level`; from − 1 when none. */
function lastAbove(s: Series, values: Float64Array, from: number, level: number, before = s.count): number {
  let i = before - 1;
  while (i >= from && !(values[i] > level)) i--;
  return i;
}

/**
 * Smoothing span for the crossing of `level` near `rough`: 1/50 of the time it takes, and no more than
 * 1/25 of the local time scale level/|dV/dt| — a steep, curved end of a fall (constant power) needs a
 * shorter span than its duration suggests, or the curvature inside the span shifts the result.
 */
function crossingSpan(ctx: Context, t0: number, rough: number, level: number): number {
  const s = ctx.summary;
  const elapsed = rough - t0;
  let span = elapsed / 50;
  const line = fitLine(s, firstAtOrAfter(s, rough - elapsed / 20), firstAtOrAfter(s, rough + elapsed / 20));
  if (line && line.slope < 0) span = Math.min(span, Math.abs(level / line.slope) / 25);
  return Math.max(span, 2 * ctx.dt);
}

/**
 * First time after t0 at which the smoothed voltage falls below `level` and stays below until the end
 * of the capture (linear interpolation); null when it is still above at the end. Found on the whole-file
 * summary, then refined on a fine re-read around it.
 */
async function crossing(ctx: Context, t0: number, level: number): Promise<number | null> {
  const s = ctx.summary;
  const i0 = firstAtOrAfter(s, t0);
  const rough = lastAbove(s, s.vm, i0, level);
  const span = crossingSpan(ctx, t0, rough >= i0 ? s.tm[rough] : t0, level);
  const smooth = movingAverage(s, span);
  const b = lastAbove(s, smooth, i0, level);
  if (b < i0) return t0;
  if (b === s.count - 1) return null;
  const coarse = Math.max(t0, interpolateTime(s.tm[b], smooth[b], s.tm[b + 1], smooth[b + 1], level));
  const z = await zoom(ctx, s.tfirst[b] - 3 * span, s.tlast[b + 1] + 3 * span);
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

interface FitOutcome {
  fit: ExponentialFit | null;
  good: boolean;
  window: { from: number; to: number } | null;
}

async function fitDecay(ctx: Context, t0: number, v0: number): Promise<FitOutcome> {
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
  const from =
    last >= i0 && last + 1 < s.count
      ? interpolateTime(s.tm[last], s.vm[last], s.tm[last + 1], s.vm[last + 1], high)
      : firstFall;
  const window = { from, to };
  const first = firstAtOrAfter(s, from);
  const end = firstAtOrAfter(s, to);
  const series = end - first < FIT_MIN_BUCKETS && s.size > 1 ? await zoom(ctx, from, to) : slice(s, first, end);
  const fit = fitExponential(series, from, base);
  if (!fit) {
    ctx.notes.push('The samples in the fit window do not decay; no time constant is reported.');
    return { fit: null, good: false, window };
  }
  const swing = v0 - base;
  const problems: string[] = [];
  if (!(fit.tau > 0) || !(fit.amplitude > 0)) problems.push('no decaying exponential fits the samples');
  else if (!fit.converged) problems.push('the fit does not settle on a time constant');
  if (Math.abs(fit.offset) > 0.2 * Math.abs(v0)) problems.push(`the fitted offset (${round(fit.offset)} V) is over 20 % of V0`);
  if (!(fit.rSquared >= 0.99)) problems.push(`R² is only ${fit.rSquared.toFixed(4)}`);
  if (fit.residualRms > 0.03 * swing) problems.push(`the residual (${round(fit.residualRms)} V rms) is over 3 % of the fall`);
  else if (fit.runsZ < -4 && fit.residualRms > 0.005 * swing) problems.push('the residuals are systematic, not noise');
  if (problems.length) {
    ctx.notes.push(
      `Poor exponential fit: ${problems.join('; ')}. No time constant is reported; the crossing time is measured directly.`,
    );
  }
  return { fit, good: problems.length === 0, window };
}

function trace(s: Series): TracePoint[] {
  const points: TracePoint[] = [];
  if (s.count <= TRACE_POINTS && s.n.every((n) => n === 1)) {
    for (let i = 0; i < s.count; i++) points.push({ t: s.tm[i], v: s.vm[i] });
    return points;
  }
  const group = Math.ceil(s.count / (TRACE_POINTS / 2));
  for (let g = 0; g < s.count; g += group) {
    let lo = g;
    let hi = g;
    for (let i = g + 1; i < Math.min(g + group, s.count); i++) {
      if (s.vmin[i] < s.vmin[lo]) lo = i;
      if (s.vmax[i] > s.vmax[hi]) hi = i;
    }
    const a = { t: s.tmin[lo], v: s.vmin[lo] };
    const b = { t: s.tmax[hi], v: s.vmax[hi] };
    if (a.t === b.t) points.push(a);
    else if (a.t < b.t) points.push(a, b);
    else points.push(b, a);
  }
  return points;
}

function round(x: number): string {
  return Number(x.toPrecision(4)).toString();
}

export async function analyseSource(source: ByteSource, options: AnalysisOptions): Promise<WaveformAnalysis> {
  const layout = await readLayout(source);
  const notes = [...layout.notes];
  const channel = pickChannel(layout, options.channel ?? 0, 'channel');
  const marker = options.markerChannel === undefined ? null : pickChannel(layout, options.markerChannel, 'marker channel');
  if (marker === channel) {
    throw new WaveformError('CHANNEL_NOT_FOUND', 'The marker channel must be a different channel from the one analysed.');
  }
  const columns = [layout.channelColumns[channel]];
  const scales = [layout.channelScales[channel]];
  if (marker !== null) {
    columns.push(layout.channelColumns[marker]);
    scales.push(1);
  }

  const summary = new Summary(SUMMARY_BUCKETS);
  const withMarker = marker !== null;
  const pass = await readPass(source, layout, columns, scales, { from: layout.dataOffset, to: source.size, firstRow: 0 }, (batch) =>
    summary.pushBatch(batch.data, batch.stride, withMarker, batch.offsets, batch.rows, 0, batch.count),
  );
  summary.finish();
  if (pass.samples < MIN_SAMPLES) {
    throw new WaveformError(
      'TOO_FEW_SAMPLES',
      `Only ${pass.samples} usable sample(s) in the file (${pass.skipped} row(s) skipped); at least ${MIN_SAMPLES} are needed.`,
    );
  }
  const tStart = summary.tfirst[0];
  const tEnd = summary.tlast[summary.count - 1];
  const ctx: Context = {
    source,
    layout,
    columns,
    scales,
    summary,
    tStart,
    tEnd,
    dt: (tEnd - tStart) / Math.max(1, pass.samples - 1),
    notes,
  };
  const name = layout.channelNames[channel];
  if (scales[0] !== 1) notes.push(`"${name}" values were converted to volts (×${scales[0]}).`);
  if (layout.timeColumn !== null && layout.timeScale !== 1) notes.push(`Time values were converted to seconds (×${layout.timeScale}).`);
  if (pass.skipped > 0) {
    notes.push(`${pass.skipped} row(s) skipped: NaN, overflow or empty values, malformed rows or an incomplete last line.`);
  }
  if (pass.truncatedLastLine) notes.push('The last line of the file is incomplete (the export was cut off); it was left out.');
  if (pass.repeatedTimes > 0) {
    notes.push(
      `${pass.repeatedTimes} sample(s) repeat the previous time stamp: the export's time resolution is coarser than its sample interval.`,
    );
  }

  // t0: the user's value, else the marker's edge, else where the decay leaves the pre-trigger level.
  let t0: number | null = null;
  let t0Source: WaveformAnalysis['t0Source'] = 'detected';
  let plateau: number | null = null;
  if (options.t0 !== undefined) {
    if (options.t0 < tStart || options.t0 > tEnd) {
      throw new WaveformError('T0_OUT_OF_RANGE', `t0 = ${options.t0} s lies outside the capture (${tStart} s to ${tEnd} s).`);
    }
    t0 = options.t0;
    t0Source = 'option';
    notes.push('t0 was given with the evidence.');
  } else if (marker !== null) {
    t0 = await markerEdge(ctx, layout.channelNames[marker]);
    if (t0 !== null) t0Source = 'marker';
  }
  if (t0 === null) {
    const start = await detectStart(ctx);
    t0 = start.t0;
    plateau = start.plateau;
    t0Source = plateau === null ? 'start' : 'detected';
  }
  const v0 = plateau ?? (await levelAt(ctx, t0));

  const { fit, good, window } = await fitDecay(ctx, t0, v0);
  if (t0Source === 'detected' && plateau !== null) {
    // With a good exponential the decay starts where the fitted curve meets the pre-trigger level, which
    // is sharper than the knee of the bucketed trace.
    if (fit && good && plateau > fit.offset) {
      const refined = fit.tRef - fit.tau * Math.log((plateau - fit.offset) / fit.amplitude);
      if (Math.abs(refined - t0) <= 0.2 * fit.tau && refined >= tStart) t0 = refined;
    }
    notes.push(`t0 detected where the voltage leaves its pre-trigger level of ${round(plateau)} V.`);
  }

  const crossAt = await crossing(ctx, t0, options.safeVoltage);
  const timeToSafe = crossAt === null ? null : Math.max(0, crossAt - t0);
  if (crossAt === null) {
    notes.push(
      `The voltage does not fall below ${options.safeVoltage} V and stay there within the capture, which ends ${round(tEnd - t0)} s after t0.`,
    );
  }
  let vAtLimit: number | null | undefined;
  if (options.maxTime !== undefined) {
    const at = t0 + options.maxTime;
    if (at > tEnd) {
      vAtLimit = null;
      notes.push(`The capture ends ${round(tEnd - t0)} s after t0, before the time limit of ${options.maxTime} s.`);
    } else {
      vAtLimit = await smoothedAt(ctx, at, Math.max(options.maxTime / 50, 2 * ctx.dt));
    }
  }
  return {
    samples: pass.samples,
    skipped: pass.skipped,
    channel: name,
    channels: layout.channelNames,
    t0,
    t0Source,
    v0,
    safeVoltage: options.safeVoltage,
    timeToSafe,
    ...(vAtLimit === undefined ? {} : { vAtLimit }),
    tau: fit && good ? fit.tau : null,
    rSquared: fit && Number.isFinite(fit.rSquared) ? fit.rSquared : null,
    residualRms: fit && Number.isFinite(fit.residualRms) ? fit.residualRms : null,
    fitWindow: window,
    offset: fit && good ? fit.offset : null,
    fit: good ? 'good' : 'poor',
    trace: trace(summary),
    notes,
  };
}
