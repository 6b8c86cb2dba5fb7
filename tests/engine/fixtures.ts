// Input builders for the engine tests. They hold inputs only (never expected results): each test sets
// the values its source gives and leaves the rest ideal (no tolerance, no TCR, no drift).
import type { Design, Requirement } from '../../shared/schema/discharge';

export interface Simple {
  capacitance: number;
  voltage: number;
  safeVoltage: number;
  maxTime: number;
  resistance: number;
}

export function requirement(overrides: Partial<Requirement> = {}): Requirement {
  return { safeVoltage: 60, maxTime: 5, maxEnergy: null, maxCharge: null, fallbackMaxTime: null, condition: '', reference: '', ...overrides };
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
