// Invented demo inputs for workflow tests (they exercise the workflow, not the engine's numbers).
export const demoRequirement = {
  safeVoltage: 60,
  maxTime: 5,
  maxEnergy: null,
  condition: 'after mains disconnection, cover removable without tool',
  reference: 'user clause text (demo)',
};

// A film-capacitor link that meets 60 V in 5 s with two 100 kΩ bleeders (worst case about 3.3 s).
export const demoDesign = {
  bus: { nominalVoltage: 565, maxVoltage: 622 },
  capacitors: { capacitance: 3.3e-6, series: 1, parallel: 2, toleranceMinus: 0.05, tolerancePlus: 0.05 },
  bleeder: {
    resistance: 1.0e5,
    series: 2,
    parallel: 1,
    tolerance: 0.01,
    tcrPpmPerK: 100,
    drift: 0,
    powerRating: 3,
    elementVoltage: 500,
    derating: 0.5,
  },
  ambient: { min: -25, max: 85 },
  active: null,
};

/** The same link with 1 kΩ bleeders: fast, but far over the resistors' power rating. */
export const failingDesign = { ...demoDesign, bleeder: { ...demoDesign.bleeder, resistance: 1_000 } };
