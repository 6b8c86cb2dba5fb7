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
export function dischargeCurve(nominal: Scenario, worst: Scenario, timeLimit: number): CurvePoint[] {
  const end = 1.25 * Math.max(timeLimit, nominal.timeToSafe, worst.timeToSafe);
  const marks = [
    tauInstant(nominal),
    tauInstant(worst),
    nominal.timeToSafe,
    worst.timeToSafe,
    timeLimit,
  ].filter((t): t is number => t !== undefined && t > 0 && t < end);
  const grid = Array.from({ length: GRID_POINTS }, (_, i) => (end * i) / (GRID_POINTS - 1));
  const times = [...new Set([...grid, ...marks])].sort((a, b) => a - b);
  return times.map((t) => ({
    t,
    v: pathVoltage(nominal.main, nominal.initialVoltage, t),
    vWorst: pathVoltage(worst.main, worst.initialVoltage, t),
  }));
}
