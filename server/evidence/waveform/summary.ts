// A bounded summary of a whole capture, built in one pass: consecutive samples are grouped into at most
// `capacity` buckets of 2^k samples; when the buckets run out, neighbours merge pairwise and the bucket
// size doubles. Each bucket keeps the moments needed later (means, centred second moments of t and v and
// their co-moment, so a line or curve can be fitted and its residual known without the samples), the
// min/max with their times (for the plotted trace) and the byte offset of its first line (so a short
// stretch can be re-read at full resolution). Memory is capacity × 19 doubles, whatever the file size.

/** Closed buckets of a summary, as parallel arrays of length `count`. */
export interface Series {
  count: number;
  /** Samples per bucket (the last may hold fewer). */
  n: Float64Array;
  /** Mean time and mean value, s and V. */
  tm: Float64Array;
  vm: Float64Array;
  /** Σ(t − t̄)², Σ(v − v̄)², Σ(t − t̄)(v − v̄). */
  stt: Float64Array;
  svv: Float64Array;
  stv: Float64Array;
  vmin: Float64Array;
  tmin: Float64Array;
  vmax: Float64Array;
  tmax: Float64Array;
  tfirst: Float64Array;
  tlast: Float64Array;
  /** Marker channel mean, min and max (zero when there is no marker). */
  mm: Float64Array;
  mmin: Float64Array;
  mmax: Float64Array;
  /** Byte offset and data-row index of the bucket's first sample. */
  offset: Float64Array;
  row: Float64Array;
}

const FIELDS = [
  'n',
  'tm',
  'vm',
  'stt',
  'svv',
  'stv',
  'vmin',
  'tmin',
  'vmax',
  'tmax',
  'tfirst',
  'tlast',
  'mm',
  'mmin',
  'mmax',
  'offset',
  'row',
] as const;

export class Summary implements Series {
  count = 0;
  /** Samples per full bucket. */
  size = 1;
  n!: Float64Array;
  tm!: Float64Array;
  vm!: Float64Array;
  stt!: Float64Array;
  svv!: Float64Array;
  stv!: Float64Array;
  vmin!: Float64Array;
  tmin!: Float64Array;
  vmax!: Float64Array;
  tmax!: Float64Array;
  tfirst!: Float64Array;
  tlast!: Float64Array;
  mm!: Float64Array;
  mmin!: Float64Array;
  mmax!: Float64Array;
  offset!: Float64Array;
  row!: Float64Array;

  // The open bucket, in a typed array so that saving it allocates nothing: count, first time and value,
  // sums of t and v shifted by the first sample (which keeps the centred moments exact enough when t is
  // far from zero), min/max with their times, last time, marker sum/min/max, first offset and row.
  private readonly open = new Float64Array(18);

  constructor(readonly capacity: number) {
    for (const f of FIELDS) this[f] = new Float64Array(capacity);
  }

  /**
   * Adds samples `from`..`to` (exclusive) of a row-major batch: time `data[r·stride]`, value
   * `data[r·stride + 1]`, marker `data[r·stride + 2]` when `withMarker` (else 0), and the byte offset and
   * row index of each sample's line. The open bucket is held in locals while its stretch of samples is
   * summed with no per-sample bucket checks: on 10⁷ samples that is measurably faster than updating
   * fields sample by sample.
   */
  pushBatch(data: Float64Array, stride: number, withMarker: boolean, offsets: Float64Array, rows: Float64Array, from: number, to: number): void {
    const open = this.open;
    for (let r = from; r < to;) {
      let k = open[0];
      let t0 = open[1];
      let v0 = open[2];
      let st = open[3];
      let sv = open[4];
      let s2t = open[5];
      let s2v = open[6];
      let stvSum = open[7];
      let lo = open[8];
      let tLo = open[9];
      let hi = open[10];
      let tHi = open[11];
      let msum = open[13];
      let mlo = open[14];
      let mhi = open[15];
      let off0 = open[16];
      let row0 = open[17];
      if (k === 0) {
        t0 = data[r * stride];
        v0 = data[r * stride + 1];
        st = sv = s2t = s2v = stvSum = msum = 0;
        lo = hi = v0;
        tLo = tHi = t0;
        mlo = mhi = withMarker ? data[r * stride + 2] : 0;
        off0 = offsets[r];
        row0 = rows[r];
      }
      const end = Math.min(to, r + this.size - k);
      for (let at = r * stride; at < end * stride; at += stride) {
        const time = data[at];
        const v = data[at + 1];
        const dt = time - t0;
        const dv = v - v0;
        st += dt;
        sv += dv;
        s2t += dt * dt;
        s2v += dv * dv;
        stvSum += dt * dv;
        if (v < lo) {
          lo = v;
          tLo = time;
        } else if (v > hi) {
          hi = v;
          tHi = time;
        }
      }
      if (withMarker) {
        for (let at = r * stride + 2; at < end * stride; at += stride) {
          const m = data[at];
          msum += m;
          if (m < mlo) mlo = m;
          else if (m > mhi) mhi = m;
        }
      }
      const tEnd = data[(end - 1) * stride];
      k += end - r;
      r = end;
      open[0] = k;
      open[1] = t0;
      open[2] = v0;
      open[3] = st;
      open[4] = sv;
      open[5] = s2t;
      open[6] = s2v;
      open[7] = stvSum;
      open[8] = lo;
      open[9] = tLo;
      open[10] = hi;
      open[11] = tHi;
      open[12] = tEnd;
      open[13] = msum;
      open[14] = mlo;
      open[15] = mhi;
      open[16] = off0;
      open[17] = row0;
      if (k === this.size) this.close();
    }
  }

  /** Closes the last, partly filled bucket; call once after the last sample. */
  finish(): this {
    if (this.open[0] > 0) this.close();
    return this;
  }

  private close(): void {
    if (this.count === this.capacity) this.halve();
    const i = this.count++;
    const open = this.open;
    const k = open[0];
    const t0 = open[1];
    const v0 = open[2];
    const st = open[3];
    const sv = open[4];
    const s2t = open[5];
    const s2v = open[6];
    const stvSum = open[7];
    const lo = open[8];
    const tLo = open[9];
    const hi = open[10];
    const tHi = open[11];
    const tEnd = open[12];
    const msum = open[13];
    const mlo = open[14];
    const mhi = open[15];
    const off0 = open[16];
    const row0 = open[17];
    this.n[i] = k;
    this.tm[i] = t0 + st / k;
    this.vm[i] = v0 + sv / k;
    this.stt[i] = Math.max(0, s2t - (st * st) / k);
    this.svv[i] = Math.max(0, s2v - (sv * sv) / k);
    this.stv[i] = stvSum - (st * sv) / k;
    this.vmin[i] = lo;
    this.tmin[i] = tLo;
    this.vmax[i] = hi;
    this.tmax[i] = tHi;
    this.tfirst[i] = t0;
    this.tlast[i] = tEnd;
    this.mm[i] = msum / k;
    this.mmin[i] = mlo;
    this.mmax[i] = mhi;
    this.offset[i] = off0;
    this.row[i] = row0;
    this.open[0] = 0;
  }

  /** Merges neighbouring buckets pairwise (Chan et al.'s combination of moments) and doubles the size. */
  private halve(): void {
    const half = this.count >> 1;
    for (let i = 0; i < half; i++) {
      const a = 2 * i;
      const b = a + 1;
      const na = this.n[a];
      const nb = this.n[b];
      const n = na + nb;
      const dt = this.tm[b] - this.tm[a];
      const dv = this.vm[b] - this.vm[a];
      const w = (na * nb) / n;
      this.tm[i] = this.tm[a] + (dt * nb) / n;
      this.vm[i] = this.vm[a] + (dv * nb) / n;
      this.stt[i] = this.stt[a] + this.stt[b] + dt * dt * w;
      this.svv[i] = this.svv[a] + this.svv[b] + dv * dv * w;
      this.stv[i] = this.stv[a] + this.stv[b] + dt * dv * w;
      this.n[i] = n;
      if (this.vmin[b] < this.vmin[a]) {
        this.vmin[i] = this.vmin[b];
        this.tmin[i] = this.tmin[b];
      } else {
        this.vmin[i] = this.vmin[a];
        this.tmin[i] = this.tmin[a];
      }
      if (this.vmax[b] > this.vmax[a]) {
        this.vmax[i] = this.vmax[b];
        this.tmax[i] = this.tmax[b];
      } else {
        this.vmax[i] = this.vmax[a];
        this.tmax[i] = this.tmax[a];
      }
      this.tfirst[i] = this.tfirst[a];
      this.tlast[i] = this.tlast[b];
      this.mm[i] = (this.mm[a] * na + this.mm[b] * nb) / n;
      this.mmin[i] = Math.min(this.mmin[a], this.mmin[b]);
      this.mmax[i] = Math.max(this.mmax[a], this.mmax[b]);
      this.offset[i] = this.offset[a];
      this.row[i] = this.row[a];
    }
    this.count = half;
    this.size *= 2;
  }
}

/** Buckets `from` (inclusive) to `to` (exclusive) of a series, as views. */
export function slice(s: Series, from: number, to: number): Series {
  const part = (a: Float64Array) => a.subarray(from, to);
  return {
    count: Math.max(0, to - from),
    n: part(s.n),
    tm: part(s.tm),
    vm: part(s.vm),
    stt: part(s.stt),
    svv: part(s.svv),
    stv: part(s.stv),
    vmin: part(s.vmin),
    tmin: part(s.tmin),
    vmax: part(s.vmax),
    tmax: part(s.tmax),
    tfirst: part(s.tfirst),
    tlast: part(s.tlast),
    mm: part(s.mm),
    mmin: part(s.mmin),
    mmax: part(s.mmax),
    offset: part(s.offset),
    row: part(s.row),
  };
}

/** The series of −v (the marker channel as it is): a rail of the other sign seen as a positive one. */
export function mirrored(s: Series): Series {
  const v = slice(s, 0, s.count);
  const negated = (a: Float64Array) => a.map((x) => -x);
  return { ...v, vm: negated(v.vm), stv: negated(v.stv), vmin: negated(v.vmax), tmin: v.tmax, vmax: negated(v.vmin), tmax: v.tmin };
}

/** Index of the first bucket whose mean time is ≥ t (count when none). */
export function firstAtOrAfter(s: Series, t: number): number {
  let lo = 0;
  let hi = s.count;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (s.tm[mid] < t) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
