// Network totals and component corners (docs/DOMAIN.md §3.3–§3.5). SI units; °C.
import type { Ambient, Bleeder, Capacitors, Design } from '../schema/discharge';

/** Reference temperature of resistor TCR figures, °C. */
const TCR_REFERENCE_C = 25;

/** Resistors in series add (ΣR). */
export function seriesResistance(values: readonly number[]): number {
  return values.reduce((sum, r) => sum + r, 0);
}

/** Resistors in parallel: 1/Σ(1/R). */
export function parallelResistance(values: readonly number[]): number {
  return 1 / values.reduce((sum, r) => sum + 1 / r, 0);
}

/** Capacitors in series: 1/Σ(1/C). */
export function seriesCapacitance(values: readonly number[]): number {
  return 1 / values.reduce((sum, c) => sum + 1 / c, 0);
}

/** Capacitors in parallel add (ΣC). */
export function parallelCapacitance(values: readonly number[]): number {
  return values.reduce((sum, c) => sum + c, 0);
}

/** `parallel` equal strings of `series` equal resistors: R·n_series / n_parallel. */
export function resistorNetwork(unit: number, series: number, parallel: number): number {
  return (unit * series) / parallel;
}

/** `parallel` equal strings of `series` equal capacitors: C·n_parallel / n_series. */
export function capacitorNetwork(unit: number, series: number, parallel: number): number {
  return (unit * parallel) / series;
}

/** Rectified mains peak: √2 · V_rms · (1 + tolerance) (docs/DOMAIN.md §3.4). */
export function busFromMains(rms: number, tolerance: number): number {
  return Math.SQRT2 * rms * (1 + tolerance);
}

/** Linear TCR model: R(T) = R25 · (1 + TCR · (T − 25 °C)). */
export function tcrFactor(tcrPpmPerK: number, temperature: number): number {
  return 1 + tcrPpmPerK * 1e-6 * (temperature - TCR_REFERENCE_C);
}

/** Highest continuous voltage across a resistor: V = √(P·derating·R), from P = V²/R. */
export function maxContinuousVoltage(resistance: number, powerRating: number, derating = 1): number {
  return Math.sqrt(powerRating * derating * resistance);
}

/** How one resistor's value was pushed to a corner, for the one-line explanations. */
export interface ResistorCorner {
  /** Multiplier on the nominal resistance. */
  factor: number;
  /** Signed tolerance applied (+0.01 or −0.01). */
  tolerance: number;
  /** TCR multiplier and the ambient temperature that gives it. */
  tcr: number;
  temperature: number;
  /** Life drift applied (only on the slow corner). */
  drift: number;
}

/**
 * Highest resistance over tolerance, ambient range and life drift (docs/DOMAIN.md §3.3):
 * (1+tol) · max(TCR factor at T_max, at T_min) · (1+drift).
 */
export function resistorMaxCorner(bleeder: Pick<Bleeder, 'tolerance' | 'tcrPpmPerK' | 'drift'>, ambient: Ambient): ResistorCorner {
  const hot = tcrFactor(bleeder.tcrPpmPerK, ambient.max);
  const cold = tcrFactor(bleeder.tcrPpmPerK, ambient.min);
  const tcr = Math.max(hot, cold);
  const temperature = hot >= cold ? ambient.max : ambient.min;
  return {
    factor: (1 + bleeder.tolerance) * tcr * (1 + bleeder.drift),
    tolerance: bleeder.tolerance,
    tcr,
    temperature,
    drift: bleeder.drift,
  };
}

/**
 * Lowest resistance for the dissipation check (docs/DOMAIN.md §3.3): (1−tol) · min(TCR factor at T_max, at T_min);
 * drift is ignored here because it is specified as an increase.
 */
export function resistorMinCorner(bleeder: Pick<Bleeder, 'tolerance' | 'tcrPpmPerK'>, ambient: Ambient): ResistorCorner {
  const hot = tcrFactor(bleeder.tcrPpmPerK, ambient.max);
  const cold = tcrFactor(bleeder.tcrPpmPerK, ambient.min);
  const tcr = Math.min(hot, cold);
  const temperature = hot <= cold ? ambient.max : ambient.min;
  return { factor: (1 - bleeder.tolerance) * tcr, tolerance: -bleeder.tolerance, tcr, temperature, drift: 0 };
}

/** Capacitance per unit at the high corner: C·(1 + tol+). */
export function capacitorMaxUnit(capacitors: Pick<Capacitors, 'capacitance' | 'tolerancePlus'>): number {
  return capacitors.capacitance * (1 + capacitors.tolerancePlus);
}

/** Capacitance per unit at the low corner, ageing included: C·(1 − tol−)·(1 − ageing). */
export function capacitorMinUnit(capacitors: Pick<Capacitors, 'capacitance' | 'toleranceMinus' | 'ageing'>): number {
  return capacitors.capacitance * (1 - capacitors.toleranceMinus) * (1 - (capacitors.ageing ?? 0));
}

/** Network totals at every corner the checks and the measured-evidence band need. */
export interface NetworkCorners {
  resistance: { nominal: number; max: number; min: number };
  capacitance: { nominal: number; max: number; min: number };
  /** Resistance of one resistor at the corners. */
  resistorUnit: { nominal: number; max: number; min: number };
  maxCorner: ResistorCorner;
  minCorner: ResistorCorner;
}

export function networkCorners(design: Pick<Design, 'bleeder' | 'capacitors' | 'ambient'>): NetworkCorners {
  const { bleeder, capacitors, ambient } = design;
  const maxCorner = resistorMaxCorner(bleeder, ambient);
  const minCorner = resistorMinCorner(bleeder, ambient);
  const r = (unit: number) => resistorNetwork(unit, bleeder.series, bleeder.parallel);
  const c = (unit: number) => capacitorNetwork(unit, capacitors.series, capacitors.parallel);
  const unit = {
    nominal: bleeder.resistance,
    max: bleeder.resistance * maxCorner.factor,
    min: bleeder.resistance * minCorner.factor,
  };
  return {
    resistance: { nominal: r(unit.nominal), max: r(unit.max), min: r(unit.min) },
    capacitance: {
      nominal: c(capacitors.capacitance),
      max: c(capacitorMaxUnit(capacitors)),
      min: c(capacitorMinUnit(capacitors)),
    },
    resistorUnit: unit,
    maxCorner,
    minCorner,
  };
}
