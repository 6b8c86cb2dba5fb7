// Laws the snubber engine must obey for any input, checked with fast-check (seeded, so a failure replays).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { clampOperatingPoint, ringingOf, sizeFromRinging, snubberChecks, stepResponse } from '../../shared/engine/snubber';
import type { RcdTurnoffSnubber, RcSnubber } from '../../shared/schema/snubber';

const SEED = 20240607;
const run = <T extends [unknown, ...unknown[]]>(property: fc.IProperty<T>) => fc.assert(property, { seed: SEED, numRuns: 200 });

/** A positive number spread evenly over decades between lo and hi. */
const logScale = (lo: number, hi: number) => fc.double({ min: Math.log10(lo), max: Math.log10(hi), noNaN: true }).map((e) => 10 ** e);

const relative = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('sizing from ringing round-trips', () => {
  it('L_par with C_par rings at f0, and with C_par + C_add at f1 (f = 1/(2π√(LC)))', () => {
    run(
      fc.property(logScale(1e4, 1e9), fc.double({ min: 0.05, max: 0.98, noNaN: true }), logScale(1e-13, 1e-5), (f0, ratio, cAdd) => {
        const f1 = f0 * ratio;
        const s = sizeFromRinging({ f0, cAdd, f1 });
        const ring = (c: number) => 1 / (2 * Math.PI * Math.sqrt(s.lPar * c));
        expect(relative(ring(s.cPar), f0)).toBeLessThan(1e-9);
        expect(relative(ring(s.cPar + cAdd), f1)).toBeLessThan(1e-9);
        expect(relative(s.resistance ** 2 * s.cPar, s.lPar)).toBeLessThan(1e-9);
      }),
    );
  });

  it('the E-series parts are within one series step of the computed values', () => {
    run(
      fc.property(logScale(1e4, 1e9), fc.double({ min: 0.05, max: 0.98, noNaN: true }), logScale(1e-13, 1e-5), (f0, ratio, cAdd) => {
        const s = sizeFromRinging({ f0, cAdd, f1: f0 * ratio });
        // Nearest on a log scale is at most half the widest gap between neighbours in the IEC 60063
        // tables: 1.3 → 1.5 in E24, 1.2 → 1.5 in E12.
        expect(Math.abs(Math.log(s.resistanceE24 / s.resistance))).toBeLessThan(Math.log(1.5 / 1.3) / 2 + 1e-9);
        expect(Math.abs(Math.log(s.capacitanceE12 / s.capacitance))).toBeLessThan(Math.log(1.5 / 1.2) / 2 + 1e-9);
      }),
    );
  });
});

describe('damping of an RC snubber across the parasitic tank', () => {
  // The R = √(L/C_par) rule is meant for a snubber capacitor a few times C_par; far beyond ~10× the
  // optimum resistance drifts down towards √(L/C_snub), so the law is stated over 2…10 × C_par.
  const tank = fc.record({
    L: logScale(1e-9, 1e-5),
    Cp: logScale(1e-12, 1e-8),
    n: fc.double({ min: 2, max: 10, noNaN: true }),
  });

  it('ζ and the decay rate are both higher at R = Z0 than at 0.3·Z0 and at 3·Z0', () => {
    run(
      fc.property(tank, ({ L, Cp, n }) => {
        const z0 = Math.sqrt(L / Cp);
        const at = (k: number) => ringingOf({ inductance: L, nodeCapacitance: Cp, snubber: { resistance: k * z0, capacitance: n * Cp } });
        const [low, mid, high] = [at(0.3), at(1), at(3)];
        expect(mid.dampingRatio).toBeGreaterThan(low.dampingRatio);
        expect(mid.dampingRatio).toBeGreaterThan(high.dampingRatio);
        const rate = (r: typeof mid) => 1 / (r.decayTimeConstant ?? Infinity);
        expect(rate(mid)).toBeGreaterThan(rate(low));
        expect(rate(mid)).toBeGreaterThan(rate(high));
      }),
    );
  });

  it('without the node capacitance ζ is the series R-L-C value (R/2)·√(C/L)', () => {
    run(
      fc.property(logScale(1e-9, 1e-5), logScale(1e-12, 1e-7), logScale(0.1, 1e4), (L, C, R) => {
        const zeta = (R / 2) * Math.sqrt(C / L);
        // Overdamped (ζ > 1): ringingOf reports the second-order ζ from its two real poles.
        const r = ringingOf({ inductance: L, nodeCapacitance: 0, snubber: { resistance: R, capacitance: C } });
        expect(relative(r.dampingRatio, zeta)).toBeLessThan(1e-6);
      }),
    );
  });

  it('the step response starts at 0 and settles at the step (residues sum consistently)', () => {
    run(
      fc.property(tank, fc.double({ min: 0.1, max: 10, noNaN: true }), ({ L, Cp, n }, k) => {
        const circuit = {
          inductance: L,
          nodeCapacitance: Cp,
          snubber: { resistance: k * Math.sqrt(L / Cp), capacitance: n * Cp },
        };
        const v = stepResponse(circuit);
        const slowest = Math.max(...ringingOf(circuit).poles.map((p) => -1 / p.re));
        expect(Math.abs(v(0))).toBeLessThan(1e-6);
        expect(Math.abs(v(60 * slowest) - 1)).toBeLessThan(1e-6);
      }),
    );
  });
});

describe('dissipation scales with f_sw and with V²', () => {
  const rc: RcSnubber = {
    name: 'S1',
    location: '',
    kind: 'rc',
    resistance: 47,
    capacitance: 1e-9,
    capacitanceTolerance: 0.1,
    powerRating: 1,
    derating: 0.5,
    capacitorVoltageRating: 1000,
    switchingVoltage: 100,
    overshoot: 0.2,
    switchingFrequency: 100e3,
    accessible: false,
  };
  const turnoff: RcdTurnoffSnubber = { ...rc, kind: 'rcd-turnoff' };
  const power = (s: RcSnubber | RcdTurnoffSnubber) => snubberChecks(s).find((c) => c.id === 'snubber-power')?.value ?? NaN;

  for (const base of [rc, turnoff]) {
    it(`${base.kind}: P(k·f_sw) = k·P(f_sw) and P(k·V) = k²·P(V)`, () => {
      run(
        fc.property(logScale(1, 1e4), logScale(1e3, 1e6), logScale(1e-12, 1e-6), fc.double({ min: 0.1, max: 10, noNaN: true }), (v, f, c, k) => {
          const s = { ...base, switchingVoltage: v, switchingFrequency: f, capacitance: c };
          expect(relative(power({ ...s, switchingFrequency: k * f }), k * power(s))).toBeLessThan(1e-12);
          expect(relative(power({ ...s, switchingVoltage: k * v }), k * k * power(s))).toBeLessThan(1e-12);
        }),
      );
    });
  }
});

describe('RCD clamp energy balance (formula from memory)', () => {
  it('R = V_c²/P, with P = ½·L·I²·f·V_c/(V_c − V_refl), settles the clamp back at V_c', () => {
    run(
      fc.property(
        logScale(1e-7, 1e-4),
        logScale(0.01, 50),
        logScale(1e3, 1e6),
        logScale(10, 1000),
        fc.double({ min: 1.05, max: 5, noNaN: true }),
        (L, I, f, vr, m) => {
          const vc = m * vr;
          const p = 0.5 * L * I * I * f * (vc / (vc - vr));
          const op = clampOperatingPoint({
            resistance: (vc * vc) / p,
            switchingFrequency: f,
            leakageInductance: L,
            peakCurrent: I,
            reflectedVoltage: vr,
          });
          expect(relative(op.clampVoltage, vc)).toBeLessThan(1e-9);
          expect(relative(op.power, p)).toBeLessThan(1e-9);
        },
      ),
    );
  });
});
