// Input builders for the engine tests. They hold inputs only (never expected results): each test sets
// the values its source gives and leaves the rest ideal (no tolerance, no TCR, no drift).
import fc from 'fast-check';
import type { Design, Requirement } from '../../shared/schema/discharge';

export interface Simple {
  capacitance: number;
  voltage: number;
  safeVoltage: number;
  maxTime: number;
  resistance: number;
}

export function requirement(overrides: Partial<Requirement> = {}): Requirement {
  return {
    safeVoltage: 60,
    maxTime: 5,
    maxEnergy: null,
    maxCharge: null,
    fallbackMaxTime: null,
    singleFault: false,
    condition: '',
    reference: '',
    ...overrides,
  };
}

/** One capacitor, one resistor, ideal parts, bus nominal = maximum. */
export function idealDesign(s: Pick<Simple, 'capacitance' | 'voltage' | 'resistance'>, overrides: Partial<Design> = {}): Design {
  return {
    bus: { nominalVoltage: s.voltage, maxVoltage: s.voltage },
    capacitors: { capacitance: s.capacitance, series: 1, parallel: 1, toleranceMinus: 0, tolerancePlus: 0 },
    bleeder: {
      resistance: s.resistance,
      series: 1,
      parallel: 1,
      tolerance: 0,
      tcrPpmPerK: 0,
      drift: 0,
      powerRating: 1e4,
      elementVoltage: 1e6,
      derating: 1,
    },
    ambient: { min: 25, max: 25 },
    active: null,
    ...overrides,
  };
}

export function idealInput(s: Simple, overrides: Partial<Design> = {}) {
  return {
    requirement: requirement({ safeVoltage: s.safeVoltage, maxTime: s.maxTime }),
    design: idealDesign(s, overrides),
  };
}

export const logUniform = (lo: number, hi: number) => fc.double({ min: Math.log10(lo), max: Math.log10(hi), noNaN: true }).map((e) => 10 ** e);

/** Random discharge networks for property and simulator tests: counts, tolerances, TCR, drift, ambient, bus. */
export const networkArb = (minBus: number) =>
  fc.record({
    capacitance: logUniform(1e-7, 5e-3),
    capSeries: fc.integer({ min: 1, max: 4 }),
    capParallel: fc.integer({ min: 1, max: 3 }),
    tolMinus: fc.double({ min: 0, max: 0.3, noNaN: true }),
    tolPlus: fc.double({ min: 0, max: 0.5, noNaN: true }),
    resistance: logUniform(1e3, 1e7),
    resSeries: fc.integer({ min: 1, max: 5 }),
    resParallel: fc.integer({ min: 1, max: 3 }),
    rTol: fc.double({ min: 0, max: 0.1, noNaN: true }),
    tcr: fc.double({ min: -300, max: 300, noNaN: true }),
    drift: fc.double({ min: 0, max: 0.05, noNaN: true }),
    tMin: fc.double({ min: -40, max: 25, noNaN: true }),
    tMax: fc.double({ min: 25, max: 125, noNaN: true }),
    vMax: fc.double({ min: minBus, max: 1500, noNaN: true }),
    nominalShare: fc.double({ min: 0.7, max: 1, noNaN: true }),
  });

export type NetworkDraw = ReturnType<typeof networkArb> extends fc.Arbitrary<infer T> ? T : never;

/** The design a network draw describes (ratings generous enough not to matter unless a test sets them). */
export function designOf(r: NetworkDraw, active: Design['active'] = null): Design {
  return {
    bus: { nominalVoltage: r.vMax * r.nominalShare, maxVoltage: r.vMax },
    capacitors: { capacitance: r.capacitance, series: r.capSeries, parallel: r.capParallel, toleranceMinus: r.tolMinus, tolerancePlus: r.tolPlus },
    bleeder: {
      resistance: r.resistance,
      series: r.resSeries,
      parallel: r.resParallel,
      tolerance: r.rTol,
      tcrPpmPerK: r.tcr,
      drift: r.drift,
      powerRating: 2,
      elementVoltage: 1000,
      derating: 0.5,
    },
    ambient: { min: r.tMin, max: r.tMax },
    active,
  };
}
