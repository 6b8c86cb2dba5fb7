// V(t) points for the decay chart: nominal and worst case on one time grid.
import type { CurvePoint } from '../schema/discharge';
import { pathVoltage } from './decay';
import type { Scenario } from './scenario';

export const CURVE_MAX_POINTS = 200;
/** Points on the even grid; the rest of the budget goes to the instants a reader looks for. */
const GRID_POINTS = CURVE_MAX_POINTS - 8;

/** The instant one time constant into the decay (after any activation delay), where V = V0/e. */
function tauInstant(s: Scenario): number | undefined {
  if (s.main.kind === 'passive') return s.tau;
  if (s.main.kind === 'switched-resistor') return s.main.delay + s.main.resistance * s.main.capacitance;
  return undefined;
}

/**
 * Curve points spanning past the time limit and both times to safe, with the exact instants of τ, of
 * each time to safe and of the limit included so the chart and the tests can read them without
 * interpolation.
 */
export function dischargeCurve(nominal: Scenario, worst: Scenario, timeLimit: number, resolution: CurveResolution = 'full'): CurvePoint[] {
  const end = 1.25 * Math.max(timeLimit, nominal.timeToSafe, worst.timeToSafe);
  const marks = [tauInstant(nominal), tauInstant(worst), nominal.timeToSafe, worst.timeToSafe, timeLimit].filter(
    (t): t is number => t !== undefined && t > 0 && t < end,
  );
  const times: number[] = [];
  for (let i = 0; i < GRID_POINTS; i += 1) times.push((end * i) / (GRID_POINTS - 1));
  for (const mark of marks) if (!times.includes(mark)) times.push(mark);
  times.sort((a, b) => a - b);
  // Plain loops: every live check draws this curve.
  const curve: CurvePoint[] = [];
  for (const t of times)
    curve.push({ t, v: pathVoltage(nominal.main, nominal.initialVoltage, t), vWorst: pathVoltage(worst.main, worst.initialVoltage, t) });
  if (resolution === 'full') return curve;
  const anchors = new Set(marks);
  return simplify(curve, anchors).map((p) => (anchors.has(p.t) ? p : { t: round(p.t), v: round(p.v), vWorst: round(p.vWorst) }));
}

/**
 * "full": every point, as stored with a revision. "chart": what a chart can show — points a straight
 * line through their neighbours would draw within CHART_TOLERANCE are dropped, the marked instants
 * stay exact, and the rest are rounded to 5 significant digits (far below a pixel).
 */
export type CurveResolution = 'full' | 'chart';

/** A thousandth of the curve's top voltage: a quarter of a pixel on the app's 260 px chart. */
export const CHART_TOLERANCE = 1e-3;

const round = (x: number) => Number(x.toPrecision(5));

/**
 * Ramer–Douglas–Peucker on the vertical distance of both series, split at the anchors so the
 * marked instants (τ, each time to safe, the limit) always remain points of the curve.
 */
function simplify(curve: CurvePoint[], anchors: ReadonlySet<number>): CurvePoint[] {
  const top = Math.max(...curve.map((p) => Math.max(p.v, p.vWorst)));
  const tolerance = CHART_TOLERANCE * top;
  const keep = new Uint8Array(curve.length);
  keep[0] = 1;
  keep[curve.length - 1] = 1;
  curve.forEach((p, i) => {
    if (anchors.has(p.t)) keep[i] = 1;
  });
  const deviation = (a: CurvePoint, b: CurvePoint, p: CurvePoint) => {
    const f = (p.t - a.t) / (b.t - a.t);
    return Math.max(Math.abs(a.v + f * (b.v - a.v) - p.v), Math.abs(a.vWorst + f * (b.vWorst - a.vWorst) - p.vWorst));
  };
  const split = (from: number, to: number) => {
    let worst = -1;
    let at = -1;
    for (let i = from + 1; i < to; i += 1) {
      const d = deviation(curve[from], curve[to], curve[i]);
      if (d > worst) [worst, at] = [d, i];
    }
    if (at < 0 || worst <= tolerance) return;
    keep[at] = 1;
    split(from, at);
    split(at, to);
  };
  let start = 0;
  for (let i = 1; i < curve.length; i += 1) {
    if (keep[i]) {
      split(start, i);
      start = i;
    }
  }
  return curve.filter((_, i) => keep[i]);
}
