// Curve fitting on bucketed samples (docs/DOMAIN.md §5.2 step 3): a log-linear least-squares start, refined
// by Levenberg–Marquardt on V = A·e^(−(t−tRef)/τ) + B. Written here rather than taken from a package
// because the fit works on bucket means weighted by their sample counts and needs the residual over the
// raw samples, which a generic point-list fitter cannot give; three parameters need only a 3×3 solve.
import type { Series } from './summary';

export interface ExponentialFit {
  /** Amplitude at tRef, V. */
  amplitude: number;
  tau: number;
  offset: number;
  tRef: number;
  /** Over the raw samples of the window. */
  rSquared: number;
  residualRms: number;
  /** Wald–Wolfowitz runs statistic of the bucket residual signs; strongly negative = systematic misfit. */
  runsZ: number;
  converged: boolean;
  samples: number;
}

export interface Line {
  /** Value at t = 0 and slope, of v = intercept + slope·t. */
  intercept: number;
  slope: number;
}

/** Weighted least-squares line through bucket means `from`..`to` (exclusive); null with < 2 buckets. */
export function fitLine(s: Series, from: number, to: number): Line | null {
  let sw = 0;
  let st = 0;
  let sv = 0;
  for (let i = from; i < to; i++) {
    sw += s.n[i];
    st += s.n[i] * s.tm[i];
    sv += s.n[i] * s.vm[i];
  }
  if (to - from < 2 || sw === 0) return null;
  const tBar = st / sw;
  const vBar = sv / sw;
  let stt = 0;
  let stv = 0;
  for (let i = from; i < to; i++) {
    const dt = s.tm[i] - tBar;
    stt += s.n[i] * dt * dt + s.stt[i];
    stv += s.n[i] * dt * (s.vm[i] - vBar) + s.stv[i];
  }
  if (stt <= 0) return null;
  const slope = stv / stt;
  return { intercept: vBar - slope * tBar, slope };
}

/** Solves the 3×3 system m·x = r by Gaussian elimination with partial pivoting; null when singular. */
function solve3(m: number[], r: number[]): number[] | null {
  const a = [
    [m[0], m[1], m[2], r[0]],
    [m[3], m[4], m[5], r[1]],
    [m[6], m[7], m[8], r[2]],
  ];
  for (let c = 0; c < 3; c++) {
    let p = c;
    for (let i = c + 1; i < 3; i++) if (Math.abs(a[i][c]) > Math.abs(a[p][c])) p = i;
    if (!(Math.abs(a[p][c]) > 1e-300)) return null;
    [a[c], a[p]] = [a[p], a[c]];
    for (let i = c + 1; i < 3; i++) {
      const f = a[i][c] / a[c][c];
      for (let j = c; j < 4; j++) a[i][j] -= f * a[c][j];
    }
  }
  const x = [0, 0, 0];
  for (let i = 2; i >= 0; i--) {
    let v = a[i][3];
    for (let j = i + 1; j < 3; j++) v -= a[i][j] * x[j];
    x[i] = v / a[i][i];
  }
  return x;
}

/**
 * Fits V = A·e^(−(t−tRef)/τ) + B to the buckets of `s`. `offsetGuess` seeds B for the log-linear start.
 * Returns null when the data do not fall (no positive τ from the start fit) or are too few.
 */
export function fitExponential(s: Series, tRef: number, offsetGuess: number): ExponentialFit | null {
  const count = s.count;
  if (count < 4) return null;
  const span = s.tm[count - 1] - s.tm[0];
  if (!(span > 0)) return null;

  // Log-linear start: ln(v − B₀) = ln A − (t − tRef)/τ, weighted by n·(v − B₀)² so that the transformed
  // problem approximates the original least squares (weights undo the log's stretching of small values).
  let sw = 0;
  let sx = 0;
  let sy = 0;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < count; i++) {
    const d = s.vm[i] - offsetGuess;
    if (!(d > 0)) continue;
    const w = s.n[i] * d * d;
    const x = (s.tm[i] - tRef) / span;
    const y = Math.log(d);
    sw += w;
    sx += w * x;
    sy += w * y;
    sxx += w * x * x;
    sxy += w * x * y;
  }
  const det = sw * sxx - sx * sx;
  if (!(sw > 0) || !(det > 0)) return null;
  const slope0 = (sw * sxy - sx * sy) / det;
  if (!(slope0 < 0)) return null;
  let amp = Math.exp((sy - slope0 * sx) / sw);
  let kappa = -slope0;
  let offset = offsetGuess;

  // Levenberg–Marquardt in (A, κ, B) with u = (t − tRef)/span, so κ = span/τ is of order one.
  const sse = (a: number, k: number, b: number): number => {
    let total = 0;
    for (let i = 0; i < count; i++) {
      const r = s.vm[i] - (a * Math.exp(-k * ((s.tm[i] - tRef) / span)) + b);
      total += s.n[i] * r * r;
    }
    return total;
  };
  let current = sse(amp, kappa, offset);
  let lambda = 1e-3;
  let converged = false;
  for (let iter = 0; iter < 200; iter++) {
    const jtj = [0, 0, 0, 0, 0, 0, 0, 0, 0];
    const jtr = [0, 0, 0];
    for (let i = 0; i < count; i++) {
      const u = (s.tm[i] - tRef) / span;
      const e = Math.exp(-kappa * u);
      const j0 = e;
      const j1 = -amp * u * e;
      const r = s.vm[i] - (amp * e + offset);
      const w = s.n[i];
      jtj[0] += w * j0 * j0;
      jtj[1] += w * j0 * j1;
      jtj[2] += w * j0;
      jtj[4] += w * j1 * j1;
      jtj[5] += w * j1;
      jtj[8] += w;
      jtr[0] += w * j0 * r;
      jtr[1] += w * j1 * r;
      jtr[2] += w * r;
    }
    jtj[3] = jtj[1];
    jtj[6] = jtj[2];
    jtj[7] = jtj[5];
    let improved = false;
    for (let attempt = 0; attempt < 30; attempt++) {
      const damped = jtj.slice();
      damped[0] *= 1 + lambda;
      damped[4] *= 1 + lambda;
      damped[8] *= 1 + lambda;
      const step = solve3(damped, jtr);
      if (!step) {
        lambda *= 10;
        continue;
      }
      const a = amp + step[0];
      const k = kappa + step[1];
      const b = offset + step[2];
      const next = k > 0 ? sse(a, k, b) : Infinity;
      if (next < current) {
        const relative = current > 0 ? (current - next) / current : 0;
        amp = a;
        kappa = k;
        offset = b;
        current = next;
        lambda = Math.max(lambda / 3, 1e-12);
        improved = true;
        // A negligible gain or a negligible step counts as convergence only with little damping:
        // heavily damped steps are small whether or not the minimum is near.
        const scale = Math.abs(a) + Math.abs(b);
        const still = Math.abs(step[1]) <= 1e-9 * k && Math.abs(step[0]) <= 1e-9 * scale && Math.abs(step[2]) <= 1e-9 * scale;
        if ((relative < 1e-12 || still) && lambda < 1) converged = true;
        break;
      }
      lambda *= 4;
    }
    if (!improved) {
      // No step lowers the sum any more: a minimum to the precision of the arithmetic.
      converged = true;
      break;
    }
    if (converged) break;
  }
  if (!(amp > 0) || !(kappa > 0) || !Number.isFinite(offset)) {
    return {
      amplitude: amp,
      tau: kappa > 0 ? span / kappa : NaN,
      offset,
      tRef,
      rSquared: NaN,
      residualRms: NaN,
      runsZ: NaN,
      converged: false,
      samples: 0,
    };
  }
  const tau = span / kappa;

  // Residual over the raw samples from the bucket moments: within a bucket the curve is taken as its
  // tangent at the bucket's mean time (second order in the bucket width, which is ≪ τ), plus the
  // curvature's effect on the bucket mean.
  let samples = 0;
  let vSum = 0;
  for (let i = 0; i < count; i++) {
    samples += s.n[i];
    vSum += s.n[i] * s.vm[i];
  }
  const vBar = vSum / samples;
  let ssRes = 0;
  let ssTot = 0;
  let positive = 0;
  let negative = 0;
  let runs = 0;
  let lastSign = 0;
  for (let i = 0; i < count; i++) {
    const e = amp * Math.exp(-(s.tm[i] - tRef) / tau);
    const slope = -e / tau;
    const curvature = e / (tau * tau);
    const n = s.n[i];
    const mean = e + offset + (0.5 * curvature * s.stt[i]) / n;
    const r = s.vm[i] - mean;
    ssRes += Math.max(0, s.svv[i] - 2 * slope * s.stv[i] + slope * slope * s.stt[i]) + n * r * r;
    ssTot += s.svv[i] + n * (s.vm[i] - vBar) ** 2;
    const sign = r > 0 ? 1 : r < 0 ? -1 : 0;
    if (sign === 0) continue;
    if (sign > 0) positive++;
    else negative++;
    if (sign !== lastSign) runs++;
    lastSign = sign;
  }
  const total = positive + negative;
  let runsZ = 0;
  if (positive > 0 && negative > 0 && total > 2) {
    const mu = (2 * positive * negative) / total + 1;
    const variance = (2 * positive * negative * (2 * positive * negative - total)) / (total * total * (total - 1));
    runsZ = variance > 0 ? (runs - mu) / Math.sqrt(variance) : 0;
  }
  return {
    amplitude: amp,
    tau,
    offset,
    tRef,
    rSquared: ssTot > 0 ? 1 - ssRes / ssTot : NaN,
    residualRms: Math.sqrt(ssRes / samples),
    runsZ,
    converged,
    samples,
  };
}
