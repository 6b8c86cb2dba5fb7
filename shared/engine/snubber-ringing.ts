// The ringing of a switching node: a voltage step drives the loop inductance L (with its loss R_s) into
// the node capacitance C_p, optionally damped by an RC snubber (R in series with C_s) across the node.
// Solved analytically: the poles of the node transfer function and the residue sum of its step response.
import { polynomialRoot } from 'mathjs';

export interface RingingCircuit {
  /** Loop (parasitic) inductance, H. */
  readonly inductance: number;
  /** Capacitance at the node without the snubber, F; 0 when unknown. */
  readonly nodeCapacitance: number;
  /** Resistance in series with the loop inductance, Ω; 0 (lossless) when unknown. */
  readonly seriesResistance?: number;
  /** RC snubber across the node; absent for the bare circuit. */
  readonly snubber?: { readonly resistance: number; readonly capacitance: number };
}

interface ComplexNumber {
  re: number;
  im: number;
}

export interface Ringing {
  /** Natural frequencies of the circuit, rad/s. */
  poles: ComplexNumber[];
  /**
   * Damping ratio of the ringing mode (−Re p / |p| of the complex pair); ≥ 1 when no mode rings, taken
   * from the two slowest real poles as for a second-order system.
   */
  dampingRatio: number;
  /** Time constant of the envelope of the ringing (or of the slowest pole when nothing rings), s; null when lossless. */
  decayTimeConstant: number | null;
  /** Damped ring frequency, Hz; null when no mode rings. */
  ringFrequency: number | null;
  /** First highest point of the response to a 1 V step (final value 1); null when it never overshoots. */
  peak: { t: number; v: number } | null;
  /** Overshoot above the final value, as a fraction of the step. */
  overshoot: number;
}

interface Polynomial {
  /** Coefficients, constant first, in normalised time (s·T). */
  coefficients: number[];
}

// Complex arithmetic for the residue sum: mathjs's Complex type declares no operators, so these four
// keep the sum typed without casts.
const add = (a: ComplexNumber, b: ComplexNumber): ComplexNumber => ({ re: a.re + b.re, im: a.im + b.im });
const mul = (a: ComplexNumber, b: ComplexNumber): ComplexNumber => ({
  re: a.re * b.re - a.im * b.im,
  im: a.re * b.im + a.im * b.re,
});
const div = (a: ComplexNumber, b: ComplexNumber): ComplexNumber => {
  const d = b.re * b.re + b.im * b.im;
  return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d };
};
const exp = (a: ComplexNumber): ComplexNumber => {
  const m = Math.exp(a.re);
  return { re: m * Math.cos(a.im), im: m * Math.sin(a.im) };
};

function evaluate(p: Polynomial, x: ComplexNumber): ComplexNumber {
  let acc: ComplexNumber = { re: 0, im: 0 };
  for (let k = p.coefficients.length - 1; k >= 0; k -= 1) acc = add(mul(acc, x), { re: p.coefficients[k], im: 0 });
  return acc;
}

function derivative(p: Polynomial): Polynomial {
  return { coefficients: p.coefficients.slice(1).map((c, k) => c * (k + 1)) };
}

function roots(p: Polynomial): ComplexNumber[] {
  const [c0, c1, c2, c3] = p.coefficients;
  const found = p.coefficients.length === 4 ? polynomialRoot(c0, c1, c2, c3) : polynomialRoot(c0, c1, c2);
  return found.map((r) => (typeof r === 'number' ? { re: r, im: 0 } : { re: r.re, im: r.im }));
}

interface Model {
  /** Time scale T, s: normalised time is t / T. */
  scale: number;
  poles: ComplexNumber[];
  /** Residues of V(x)/x at each pole, so v(t) = 1 + Σ r·e^(p·t/T). */
  residues: ComplexNumber[];
}

function buildModel(circuit: RingingCircuit): Model {
  const L = circuit.inductance;
  const Cp = circuit.nodeCapacitance;
  const Rs = circuit.seriesResistance ?? 0;
  const R = circuit.snubber?.resistance ?? 0;
  const Cs = circuit.snubber?.capacitance ?? 0;
  if (!(L > 0) || !(Cp >= 0) || !(Cs >= 0) || !(Cp + Cs > 0) || !(Rs >= 0) || !(R >= 0)) {
    throw new RangeError('Ringing circuit needs L > 0, some capacitance, and non-negative R, C');
  }
  // Normalising time by √(L·C_total) keeps the cubic's coefficients near 1, where its closed-form roots are accurate.
  const T = Math.sqrt(L * (Cp + Cs));
  // Node law: H(s) = (1 + sRC_s) / [(1 + sRC_s) + (R_s + sL)·(sC_p(1 + sRC_s) + sC_s)] (series RLC loop, Kirchhoff).
  const a = [1, R * Cs + Rs * (Cp + Cs), L * (Cp + Cs) + Rs * Cp * R * Cs, L * Cp * R * Cs];
  const scaled = a.map((c, k) => c / T ** k);
  const denominator: Polynomial = { coefficients: scaled[3] > 0 ? scaled : scaled.slice(0, 3) };
  const numerator: Polynomial = { coefficients: [1, (R * Cs) / T] };
  const degree = denominator.coefficients.length - 1;
  let poles = roots(denominator);
  if (poles.length < degree) {
    // A repeated pole (exactly critical damping) breaks the residue sum; a relative 1e-9 nudge of the
    // damping term separates it and changes the response by a like amount.
    denominator.coefficients[1] *= 1 + 1e-9;
    poles = roots(denominator);
  }
  const dD = derivative(denominator);
  const residues = poles.map((p) => div(evaluate(numerator, p), mul(p, evaluate(dD, p))));
  return { scale: T, poles, residues };
}

/** Node voltage per volt of step at normalised time x (≥ 0), and its derivative. */
function responseAt(model: Model, x: number): { v: number; dv: number } {
  let v = 1;
  let dv = 0;
  model.poles.forEach((p, i) => {
    const term = mul(model.residues[i], exp({ re: p.re * x, im: p.im * x }));
    v += term.re;
    dv += mul(term, p).re;
  });
  return { v, dv };
}

const isRinging = (p: ComplexNumber) => Math.abs(p.im) > 1e-9 * Math.hypot(p.re, p.im);

/** Step response of the node to a step of 1 V: v(t) in volts, t in seconds. */
export function stepResponse(circuit: RingingCircuit): (t: number) => number {
  const model = buildModel(circuit);
  return (t: number) => (t < 0 ? 0 : responseAt(model, t / model.scale).v);
}

/** Poles, damping, decay and first peak of the node's response to a voltage step. */
export function ringingOf(circuit: RingingCircuit): Ringing {
  const model = buildModel(circuit);
  const T = model.scale;
  const ringingPole = model.poles.find((p) => isRinging(p) && p.im > 0);
  const realPoles = model.poles.filter((p) => !isRinging(p)).sort((x, y) => Math.abs(x.re) - Math.abs(y.re));

  let dampingRatio: number;
  let decay: number | null;
  if (ringingPole) {
    // Second-order pole pair p = −ζω_n ± jω_n√(1−ζ²): ζ = −Re p / |p|. A passive circuit has Re p ≤ 0;
    // max() only turns the −0 of a lossless loop into 0.
    dampingRatio = Math.max(0, -ringingPole.re / Math.hypot(ringingPole.re, ringingPole.im));
    decay = ringingPole.re < 0 ? -1 / ringingPole.re : null;
  } else {
    // Two real poles a, b of a second-order system: ζ = (a + b) / (2√(ab)).
    const [a, b] = realPoles.map((p) => Math.abs(p.re));
    dampingRatio = (a + b) / (2 * Math.sqrt(a * b));
    decay = 1 / a;
  }

  const slowest = Math.max(...model.poles.map((p) => (p.re < 0 ? -1 / p.re : Infinity)));
  const period = ringingPole ? (2 * Math.PI) / ringingPole.im : null;
  const window = period === null ? 6 * slowest : Math.min(6 * slowest, 50 * period);
  const steps = Math.min(4000, period === null ? 2000 : Math.ceil((window / period) * 64));
  const dx = window / steps;

  let peak: { t: number; v: number } | null = null;
  let previous = responseAt(model, 0);
  for (let k = 1; k <= steps; k += 1) {
    const current = responseAt(model, k * dx);
    if (previous.dv > 0 && current.dv <= 0) {
      // Bisection on dv/dt = 0 inside the bracket where the slope changes sign.
      let lo = (k - 1) * dx;
      let hi = k * dx;
      for (let i = 0; i < 60; i += 1) {
        const mid = (lo + hi) / 2;
        if (responseAt(model, mid).dv > 0) lo = mid;
        else hi = mid;
      }
      const x = (lo + hi) / 2;
      const v = responseAt(model, x).v;
      // Equal peaks (a lossless circuit) keep the first one.
      if (v > 1 && (peak === null || v > peak.v * (1 + 1e-12))) peak = { t: x * T, v };
    }
    previous = current;
  }

  return {
    poles: model.poles.map((p) => ({ re: p.re / T, im: p.im / T })),
    dampingRatio,
    decayTimeConstant: decay === null ? null : decay * T,
    ringFrequency: ringingPole ? ringingPole.im / T / (2 * Math.PI) : null,
    peak,
    overshoot: peak ? peak.v - 1 : 0,
  };
}

export interface RingingCurvesInput {
  /** Parasitic loop inductance, H. */
  readonly lPar: number;
  /** Parasitic node capacitance, F. */
  readonly cPar: number;
  /** Snubber resistance, Ω. */
  readonly resistance: number;
  /** Snubber capacitance, F. */
  readonly capacitance: number;
  /** Step amplitude, V (1 gives curves per volt). */
  readonly voltage?: number;
  /** Loop loss, Ω; 0 shows the bare circuit ringing on undamped. */
  readonly seriesResistance?: number;
  /** Length of the plot in periods of the bare ring frequency. */
  readonly periods?: number;
  /** Points per curve. */
  readonly points?: number;
}

export interface RingingCurves {
  before: { t: number; v: number }[];
  after: { t: number; v: number }[];
  beforeRinging: Ringing;
  afterRinging: Ringing;
}

/** Step response of the switching node without and with the RC snubber, on one time axis, for a plot. */
export function ringingCurves(input: RingingCurvesInput): RingingCurves {
  const voltage = input.voltage ?? 1;
  const periods = input.periods ?? 6;
  const points = Math.max(2, Math.round(input.points ?? 240));
  const bare: RingingCircuit = {
    inductance: input.lPar,
    nodeCapacitance: input.cPar,
    seriesResistance: input.seriesResistance ?? 0,
  };
  const snubbed: RingingCircuit = {
    ...bare,
    snubber: { resistance: input.resistance, capacitance: input.capacitance },
  };
  // Bare LC: f0 = 1 / (2π√(L·C)).
  const duration = periods * 2 * Math.PI * Math.sqrt(input.lPar * input.cPar);
  const sample = (f: (t: number) => number) =>
    Array.from({ length: points }, (_, i) => {
      const t = (duration * i) / (points - 1);
      return { t, v: voltage * f(t) };
    });
  return {
    before: sample(stepResponse(bare)),
    after: sample(stepResponse(snubbed)),
    beforeRinging: ringingOf(bare),
    afterRinging: ringingOf(snubbed),
  };
}
