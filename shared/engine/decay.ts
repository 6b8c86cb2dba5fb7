// Discharge laws of the three paths (docs/DOMAIN.md §3.1, §3.2, §3.8) and the alternative safe criteria.
import type { RequirementDraft } from '../schema/discharge';

export type DischargePath =
  | { kind: 'passive'; resistance: number; capacitance: number }
  | { kind: 'constant-current'; capacitance: number; current: number; delay: number }
  | { kind: 'switched-resistor'; resistance: number; capacitance: number; delay: number };

/** RC decay: V(t) = V0·e^(−t/τ). */
export function rcVoltage(v0: number, tau: number, t: number): number {
  return v0 * Math.exp(-t / tau);
}

/** Inverse of the RC decay: t = τ·ln(V0/V), 0 when V0 is already at or below V. */
export function rcTime(v0: number, threshold: number, tau: number): number {
  return v0 <= threshold ? 0 : tau * Math.log(v0 / threshold);
}

/** Largest total resistance that reaches `threshold` within `time`: R = t / (C·ln(V0/V)) (docs/DOMAIN.md §3.1). */
export function maxDischargeResistance(time: number, capacitance: number, v0: number, threshold: number): number {
  return v0 <= threshold ? Infinity : time / (capacitance * Math.log(v0 / threshold));
}

/** Smallest constant current that reaches `threshold` within `time`: I = C·ΔV / t. */
export function minDischargeCurrent(time: number, capacitance: number, v0: number, threshold: number): number {
  return v0 <= threshold ? 0 : (capacitance * (v0 - threshold)) / time;
}

/** Stored energy E = ½·C·V². */
export function storedEnergy(capacitance: number, voltage: number): number {
  return 0.5 * capacitance * voltage * voltage;
}

/** Stored charge Q = C·V. */
export function storedCharge(capacitance: number, voltage: number): number {
  return capacitance * voltage;
}

/** Voltage on `path` at time t after disconnection, starting from v0. */
export function pathVoltage(path: DischargePath, v0: number, t: number): number {
  switch (path.kind) {
    case 'passive':
      return rcVoltage(v0, path.resistance * path.capacitance, t);
    case 'constant-current':
      // Charge balance C·dV/dt = −I: a linear ramp after the delay; the sink stops at 0 V.
      return t <= path.delay ? v0 : Math.max(0, v0 - (path.current * (t - path.delay)) / path.capacitance);
    case 'switched-resistor':
      return t <= path.delay ? v0 : rcVoltage(v0, path.resistance * path.capacitance, t - path.delay);
  }
}

/** Time for `path` to bring v0 down to `threshold` (0 when already there). */
export function pathTime(path: DischargePath, v0: number, threshold: number): number {
  if (v0 <= threshold) return 0;
  switch (path.kind) {
    case 'passive':
      return rcTime(v0, threshold, path.resistance * path.capacitance);
    case 'constant-current':
      // t = C·(V0 − V)/I + delay (docs/DOMAIN.md §3.8).
      return path.delay + (path.capacitance * (v0 - threshold)) / path.current;
    case 'switched-resistor':
      return path.delay + rcTime(v0, threshold, path.resistance * path.capacitance);
  }
}

export type Criterion = 'voltage' | 'charge' | 'energy';

export interface SafeThreshold {
  /** Voltage at which the earliest allowed criterion is met. */
  voltage: number;
  criterion: Criterion;
  /** Threshold voltage of every criterion the requirement sets. */
  all: { criterion: Criterion; voltage: number }[];
}

/**
 * The voltage below which the part counts as safe. Charge and energy limits are alternatives to the
 * voltage (docs/DOMAIN.md §3.2): Q = C·V ≤ Qmax gives V = Qmax/C, E = ½CV² ≤ Emax gives V = √(2·Emax/C).
 * Decay is monotonic, so the earliest instant any criterion is met is the highest of these voltages.
 */
export function safeThreshold(
  capacitance: number,
  requirement: Pick<RequirementDraft, 'safeVoltage' | 'maxCharge' | 'maxEnergy'> & { safeVoltage: number },
): SafeThreshold {
  const all: { criterion: Criterion; voltage: number }[] = [{ criterion: 'voltage', voltage: requirement.safeVoltage }];
  if (requirement.maxCharge != null) all.push({ criterion: 'charge', voltage: requirement.maxCharge / capacitance });
  if (requirement.maxEnergy != null) {
    all.push({ criterion: 'energy', voltage: Math.sqrt((2 * requirement.maxEnergy) / capacitance) });
  }
  const best = all.reduce((a, b) => (b.voltage > a.voltage ? b : a));
  return { voltage: best.voltage, criterion: best.criterion, all };
}
