// One corner of the discharge (nominal or worst case) with everything the checks, the curve and the
// netlist need, so that they all describe exactly the same circuit.
import type { Design, Requirement } from '../schema/discharge';
import { pathTime, type DischargePath, type SafeThreshold, safeThreshold } from './decay';
import { capacitorMaxUnit, networkCorners, type ResistorCorner } from './network';

export type Corner = 'nominal' | 'worst';

export interface Scenario {
  corner: Corner;
  /** One resistor of the bleeder at this corner, Ω. */
  resistorUnit: number;
  /** One capacitor of the bank at this corner, F. */
  capacitorUnit: number;
  /** Bleeder network total, Ω. */
  resistance: number;
  /** Bank total, F. */
  capacitance: number;
  initialVoltage: number;
  /** τ = R·C of the passive network. */
  tau: number;
  threshold: SafeThreshold;
  /** The declared discharge path: the active circuit when there is one, otherwise the bleeders. */
  main: DischargePath;
  passive: DischargePath;
  timeToSafe: number;
  passiveTimeToSafe: number;
  /** How the resistors were pushed to this corner (identity on the nominal corner). */
  resistorCorner: ResistorCorner;
}

export function scenario(requirement: Requirement, design: Design, corner: Corner): Scenario {
  const net = networkCorners(design);
  const worst = corner === 'worst';
  const resistance = worst ? net.resistance.max : net.resistance.nominal;
  const capacitance = worst ? net.capacitance.max : net.capacitance.nominal;
  // The slow corner takes the highest bus voltage; the nominal corner the nominal one.
  const initialVoltage = worst ? design.bus.maxVoltage : design.bus.nominalVoltage;
  const threshold = safeThreshold(capacitance, requirement);
  const passive: DischargePath = { kind: 'passive', resistance, capacitance };
  const active = design.active;
  const main: DischargePath =
    active === null
      ? passive
      : active.mode === 'constant-current'
        ? { kind: 'constant-current', capacitance, current: active.current, delay: active.delay }
        : { kind: 'switched-resistor', resistance: active.resistance, capacitance, delay: active.delay };
  return {
    corner,
    resistorUnit: worst ? net.resistorUnit.max : net.resistorUnit.nominal,
    capacitorUnit: worst ? capacitorMaxUnit(design.capacitors) : design.capacitors.capacitance,
    resistance,
    capacitance,
    initialVoltage,
    tau: resistance * capacitance,
    threshold,
    main,
    passive,
    timeToSafe: pathTime(main, initialVoltage, threshold.voltage),
    passiveTimeToSafe: pathTime(passive, initialVoltage, threshold.voltage),
    resistorCorner: worst ? net.maxCorner : { factor: 1, tolerance: 0, tcr: 1, temperature: 25, drift: 0 },
  };
}

/** Worst-case time to safe on the declared path: the figure the `discharge-time` check judges. */
export function worstCaseTime(requirement: Requirement, design: Design): number {
  return scenario(requirement, design, 'worst').timeToSafe;
}
