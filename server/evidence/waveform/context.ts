// What every step of the analysis shares: the whole-file summary, the way back to the bytes for a finer
// look at a short stretch (a "zoom"), and small helpers over bucketed series.
import type { CaptureLayout } from './layout';
import { readPass } from './samples';
import type { ByteSource } from './source';
import { Summary, firstAtOrAfter, slice, type Series } from './summary';

/** Buckets of a zoomed re-read. */
export const ZOOM_BUCKETS = 1 << 12;

export type Polarity = 'positive' | 'negative';

export interface Context {
  /** The scan stream (encoding.ts): the file itself, or its UTF-16 transcoded. */
  source: ByteSource;
  layout: CaptureLayout;
  /** Columns read on every pass: the voltage channel, then the marker channel when there is one. */
  columns: number[];
  /** Factor for each column: unit × the entered scale × the rail's sign for the voltage, 1 for the marker. */
  scales: number[];
  /** The whole file, with values in the rail's own sense once the polarity is known. */
  summary: Series;
  /** Samples per summary bucket. */
  bucketSize: number;
  tStart: number;
  tEnd: number;
  /** Mean sample interval, s. */
  dt: number;
  polarity: Polarity;
  notes: string[];
  /** Remarks that need the engineer's attention; each is in `notes` too. */
  warnings: string[];
}

export function warn(ctx: Context, text: string): void {
  ctx.warnings.push(text);
  ctx.notes.push(text);
}

/** The samples with time in [ta, tb], summarised at the finest resolution `capacity` buckets allow. */
export async function zoom(ctx: Context, ta: number, tb: number, capacity = ZOOM_BUCKETS): Promise<Series> {
  const s = ctx.summary;
  if (ctx.bucketSize === 1) {
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
export function movingAverage(s: Series, span: number): Float64Array {
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

export function interpolateTime(t1: number, v1: number, t2: number, v2: number, level: number): number {
  return v2 === v1 ? t2 : t1 + ((level - v1) * (t2 - t1)) / (v2 - v1);
}

/** Last bucket in from..before (exclusive) whose value is above `level`; from − 1 when none. */
export function lastAbove(s: Series, values: Float64Array, from: number, level: number, before = s.count): number {
  let i = before - 1;
  while (i >= from && !(values[i] > level)) i--;
  return i;
}

export function round(x: number): string {
  return Number(x.toPrecision(4)).toString();
}
