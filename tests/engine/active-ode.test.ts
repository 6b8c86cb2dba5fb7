// Active discharge cross-checked with a general-purpose ODE solver (odex, Gragg–Bulirsch–Stoer): the
// capacitor equations C·dV/dt = −I (constant current) and C·dV/dt = −V/R (switched resistor), with the
// activation delay inside the right-hand side, integrated until the bus crosses the safe voltage.
import { createRequire } from 'node:module';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { computeDischarge } from '../../shared/engine';
import type { Active } from '../../shared/schema/discharge';
import { idealDesign, requirement } from './fixtures';

type Dense = (component: number, x: number) => number;
interface OdexSolver {
  denseOutput: boolean;
  absoluteTolerance: number;
  relativeTolerance: number;
  maxSteps: number;
  solve(
    f: (x: number, y: number[]) => number[],
    x0: number,
    y0: number[],
    xEnd: number,
    callback?: (n: number, xOld: number, x: number, y: number[], dense: Dense) => boolean | void,
  ): { y: number[]; outcome: number };
}
// odex's TypeScript sources fail strict checks, so it is loaded untyped and given the interface above.
const odex = createRequire(import.meta.url)('odex') as { Solver: new (n: number) => OdexSolver };

/** First time V falls to `threshold`, by integrating dV/dt and bisecting the dense output of the crossing step. */
function odeCrossing(dvdt: (t: number, v: number) => number, v0: number, threshold: number, horizon: number): number {
  const solver = new odex.Solver(1);
  solver.denseOutput = true;
  solver.absoluteTolerance = 1e-12;
  solver.relativeTolerance = 1e-12;
  solver.maxSteps = 100_000;
  let crossing = NaN;
  solver.solve(
    (t, y) => [dvdt(t, y[0])],
    0,
    [v0],
    horizon,
    (_n, tOld, t, y, dense) => {
      if (y[0] > threshold) return;
      let lo = tOld;
      let hi = t;
      for (let i = 0; i < 200 && hi - lo > 1e-15 * hi; i += 1) {
        const mid = (lo + hi) / 2;
        if (dense(0, mid) > threshold) lo = mid;
        else hi = mid;
      }
      crossing = (lo + hi) / 2;
      return false;
    },
  );
  return crossing;
}

const scenarioArb = fc.record({
  capacitance: fc.double({ min: 1e-5, max: 5e-3, noNaN: true }),
  tolPlus: fc.double({ min: 0, max: 0.3, noNaN: true }),
  voltage: fc.double({ min: 100, max: 1000, noNaN: true }),
  safeShare: fc.double({ min: 0.03, max: 0.5, noNaN: true }),
  delay: fc.double({ min: 0, max: 1, noNaN: true }),
  current: fc.double({ min: 0.05, max: 5, noNaN: true }),
  resistance: fc.double({ min: 50, max: 20e3, noNaN: true }),
});

interface Bank {
  capacitance: number;
  tolPlus: number;
  voltage: number;
  safeShare: number;
}

function run(s: Bank, active: NonNullable<Active>) {
  const design = idealDesign({ capacitance: s.capacitance, voltage: s.voltage, resistance: 1e6 }, { active });
  design.capacitors = { ...design.capacitors, tolerancePlus: s.tolPlus };
  const safeVoltage = s.voltage * s.safeShare;
  return { result: computeDischarge({ requirement: requirement({ safeVoltage, maxTime: 5 }), design }), safeVoltage };
}

describe('odex ODE solver agrees with the engine on active discharge (relative 1e-6)', () => {
  it('constant current: C·dV/dt = −I after the delay', () => {
    fc.assert(
      fc.property(scenarioArb, (s) => {
        const { result, safeVoltage } = run(s, { mode: 'constant-current', current: s.current, delay: s.delay });
        const c = s.capacitance * (1 + s.tolPlus);
        const engine = result.worstCase?.timeToSafe ?? NaN;
        const ode = odeCrossing((t) => (t < s.delay ? 0 : -s.current / c), s.voltage, safeVoltage, 2 * engine + 1);
        expect(Math.abs(ode - engine) / engine).toBeLessThan(1e-6);
      }),
      { seed: 7_311, numRuns: 30 },
    );
  });

  it('switched resistor: C·dV/dt = −V/R after the delay', () => {
    fc.assert(
      fc.property(scenarioArb, (s) => {
        const { result, safeVoltage } = run(s, {
          mode: 'switched-resistor',
          resistance: s.resistance,
          pulseEnergy: 1e6,
          delay: s.delay,
          powerRating: null,
        });
        const c = s.capacitance * (1 + s.tolPlus);
        const engine = result.worstCase?.timeToSafe ?? NaN;
        const ode = odeCrossing((t, v) => (t < s.delay ? 0 : -v / (s.resistance * c)), s.voltage, safeVoltage, 2 * engine + 1);
        expect(Math.abs(ode - engine) / engine).toBeLessThan(1e-6);
      }),
      { seed: 7_312, numRuns: 30 },
    );
  });

  it('the engine curve follows the ODE solution point by point (constant current, nominal corner)', () => {
    const s = { capacitance: 600e-6, tolPlus: 0.2, voltage: 450, safeShare: 60 / 450, delay: 0.3 };
    const { result } = run(s, { mode: 'constant-current', current: 0.2, delay: s.delay });
    const solver = new odex.Solver(1);
    solver.absoluteTolerance = 1e-12;
    solver.relativeTolerance = 1e-12;
    for (const point of result.curve.filter((p) => p.v > 1).slice(1, 60)) {
      const v = solver.solve((t) => [t < s.delay ? 0 : -0.2 / s.capacitance], 0, [s.voltage], point.t).y[0];
      expect(point.v).toBeCloseTo(v, 6);
    }
  });
});
