// Bench-style measurements on a simulated ringing trace, independent of the engine: what an engineer
// reads off a scope (peaks, their spacing and envelope) and, where two decays overlap, Prony's method
// (linear prediction on evenly spaced samples) to separate the modes.
import { lusolve, polynomialRoot } from 'mathjs';

export interface Pole {
  re: number;
  im: number;
}

/** Local maxima of a sampled trace, each refined by a parabola through the sample and its neighbours. */
export function localMaxima(time: readonly number[], v: readonly number[]): { t: number; v: number }[] {
  const peaks: { t: number; v: number }[] = [];
  for (let i = 1; i < v.length - 1; i += 1) {
    if (v[i] > v[i - 1] && v[i] >= v[i + 1]) {
      const [t0, t1, t2] = [time[i - 1], time[i], time[i + 1]];
      const [y0, y1, y2] = [v[i - 1], v[i], v[i + 1]];
      // Vertex of the parabola through three points (uneven spacing allowed).
      const d01 = (y1 - y0) / (t1 - t0);
      const d12 = (y2 - y1) / (t2 - t1);
      const a = (d12 - d01) / (t2 - t0);
      const b = d01 - a * (t0 + t1);
      const c = y0 - a * t0 * t0 - b * t0;
      const t = a < 0 ? -b / (2 * a) : t1;
      peaks.push({ t, v: a < 0 ? a * t * t + b * t + c : y1 });
    }
  }
  return peaks;
}

/** Ring period from the spacing of the first and last of `peaks`, s. */
export function periodOf(peaks: readonly { t: number }[]): number {
  return (peaks[peaks.length - 1].t - peaks[0].t) / (peaks.length - 1);
}

/** Envelope time constant: least-squares slope of ln(peak − final) against time. */
export function envelopeTimeConstant(peaks: readonly { t: number; v: number }[], final: number): number {
  const xs = peaks.map((p) => p.t);
  const ys = peaks.map((p) => Math.log(p.v - final));
  const n = xs.length;
  const mx = xs.reduce((s, x) => s + x, 0) / n;
  const my = ys.reduce((s, y) => s + y, 0) / n;
  let sxy = 0;
  let sxx = 0;
  for (let i = 0; i < n; i += 1) {
    sxy += (xs[i] - mx) * (ys[i] - my);
    sxx += (xs[i] - mx) ** 2;
  }
  return -1 / (sxy / sxx);
}

/** Linear interpolation of the trace at evenly spaced instants t0, t0 + dt, … (n samples). */
export function resample(time: readonly number[], v: readonly number[], t0: number, dt: number, n: number): number[] {
  const out: number[] = [];
  let j = 0;
  for (let k = 0; k < n; k += 1) {
    const t = t0 + k * dt;
    while (j < time.length - 2 && time[j + 1] < t) j += 1;
    const f = (t - time[j]) / (time[j + 1] - time[j]);
    out.push(v[j] + f * (v[j + 1] - v[j]));
  }
  return out;
}

/**
 * Prony's method: fit y[k] = a1·y[k−1] + … + aM·y[k−M] by least squares; the roots z of
 * z^M − a1·z^(M−1) − … − aM are e^(s·dt) for the M natural frequencies s of the trace.
 */
export function pronyPoles(samples: readonly number[], dt: number, order: 2 | 3): Pole[] {
  const ata = Array.from({ length: order }, () => new Array<number>(order).fill(0));
  const atb = new Array<number>(order).fill(0);
  for (let k = order; k < samples.length; k += 1) {
    const row = Array.from({ length: order }, (_, j) => samples[k - 1 - j]);
    for (let i = 0; i < order; i += 1) {
      atb[i] += row[i] * samples[k];
      for (let j = 0; j < order; j += 1) ata[i][j] += row[i] * row[j];
    }
  }
  const a = (lusolve(ata, atb) as number[][]).map((r) => r[0]);
  const z = order === 2 ? polynomialRoot(-a[1], -a[0], 1) : polynomialRoot(-a[2], -a[1], -a[0], 1);
  return z.map((r) => {
    const c = typeof r === 'number' ? { re: r, im: 0 } : { re: r.re, im: r.im };
    return { re: Math.log(Math.hypot(c.re, c.im)) / dt, im: Math.atan2(c.im, c.re) / dt };
  });
}
