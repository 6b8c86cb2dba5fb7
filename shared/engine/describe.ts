// One-line explanations: which corner, which criterion, which limit decided a check.
import type { Design, Requirement } from '../schema/discharge';
import { formatPercent, formatQuantity } from '../units';
import type { SafeThreshold } from './decay';
import type { ResistorCorner } from './network';
import type { Scenario } from './scenario';

export const q = formatQuantity;

/** "+1 %", "−0.5 %" (true minus sign). */
function signedPercent(fraction: number): string {
  return `${fraction < 0 ? '−' : '+'}${formatPercent(Math.abs(fraction))}`;
}

/** "R +1 % tol, +0.6 % TCR at 85 °C, +2 % drift" — the resistor part of a corner. */
export function describeResistorCorner(corner: ResistorCorner): string {
  const parts: string[] = [];
  if (corner.tolerance !== 0) parts.push(`${signedPercent(corner.tolerance)} tol`);
  if (corner.tcr !== 1) parts.push(`${signedPercent(corner.tcr - 1)} TCR at ${String(corner.temperature).replace('-', '−')} °C`);
  if (corner.drift !== 0) parts.push(`${signedPercent(corner.drift)} drift`);
  return parts.length ? `R ${parts.join(', ')}` : 'R nominal';
}

/** "C +20 %" or "C nominal". */
function describeCapacitorCorner(design: Design, corner: Scenario['corner']): string {
  const tol = design.capacitors.tolerancePlus;
  return corner === 'worst' && tol > 0 ? `C ${signedPercent(tol)}` : 'C nominal';
}

/** Which criterion sets the safe threshold, e.g. "the 45 µC charge limit (10.2 V on 4.4 µF)". */
export function describeThreshold(threshold: SafeThreshold, requirement: Requirement, capacitance: number): string {
  switch (threshold.criterion) {
    case 'voltage':
      return `the ${q(threshold.voltage, 'V')} safe voltage`;
    case 'charge':
      return `the ${q(requirement.maxCharge ?? 0, 'C')} charge limit (${q(threshold.voltage, 'V')} on ${q(capacitance, 'F')})`;
    case 'energy':
      return `the ${q(requirement.maxEnergy ?? 0, 'J')} energy limit (${q(threshold.voltage, 'V')} on ${q(capacitance, 'F')})`;
  }
}

/** The corner of a scenario in one phrase: "worst case: R +1 % tol, …, C +20 %, V0 622 V". */
export function describeScenario(s: Scenario, design: Design): string {
  const label = s.corner === 'worst' ? 'worst case' : 'nominal';
  const path =
    s.main.kind === 'passive'
      ? `${describeResistorCorner(s.resistorCorner)}, `
      : s.main.kind === 'constant-current'
        ? `${q(s.main.current, 'A')} constant current after a ${q(s.main.delay, 's')} delay (bleeders not credited), `
        : `${q(s.main.resistance, 'Ω')} switched in after ${q(s.main.delay, 's')} (bleeders not credited), `;
  return `${label}: ${path}${describeCapacitorCorner(design, s.corner)}, V0 ${q(s.initialVoltage, 'V')}`;
}
