// Balancing resistors across N series capacitors (docs/DOMAIN.md §3.7).
import type { Balancing } from '../schema/discharge';

/**
 * Largest resistor across each of N series capacitors that keeps every capacitor within its rating
 * when one capacitor leaks nothing and the others leak I_max: V_k = Vbus/N + (R/N)·(ΣI − N·I_k) gives
 * R ≤ (N·V_rate − V_bus) / ((N − 1)·I_max). The two-capacitor "circulating" form (N·V_rate − V_bus)/I_max
 * agrees only for N = 2 and is not conservative above. Non-positive when no resistor can balance the bank.
 */
export function balancingBound(count: number, balancing: Balancing, busVoltage: number): number {
  return (count * balancing.capacitorVoltageRating - busVoltage) / ((count - 1) * balancing.leakageCurrent);
}

/**
 * Highest voltage on any capacitor with resistor R across each, from V_k = Vbus/N + (R/N)·(ΣI − N·I_k)
 * with I_k = 0 and the other N − 1 capacitors at I_max.
 */
export function worstCapacitorVoltage(count: number, resistance: number, leakageCurrent: number, busVoltage: number): number {
  return busVoltage / count + (resistance / count) * (count - 1) * leakageCurrent;
}
