// Invented demo inputs for workflow tests (they exercise the workflow, not the engine's numbers).
export const demoRequirement = {
  safeVoltage: 60,
  maxTime: 5,
  maxEnergy: null,
  condition: 'after mains disconnection, cover removable without tool',
  reference: 'user clause text (demo)',
};

export const demoDesign = {
  bus: { nominalVoltage: 565, maxVoltage: 622 },
  capacitors: { capacitance: 4.7e-4, series: 1, parallel: 2, toleranceMinus: 0.2, tolerancePlus: 0.2 },
  bleeder: { resistance: 1.0e5, series: 2, parallel: 1, tolerance: 0.01, tcrPpmPerK: 100, drift: 0, powerRating: 2, elementVoltage: 500, derating: 0.5 },
  ambient: { min: -25, max: 85 },
  active: null,
};
