// Single-fault checks (docs/DOMAIN.md §7.3, §5.3): when the requirement asks for it, the
// discharge must also hold with one bleeder resistor open (its whole string lost) and the resistors
// must survive one resistor of a series string shorted.
import type { Check, Design, Requirement } from '../schema/discharge';
import { informationOnly, upperLimitCheck } from './check';
import { pathTime } from './decay';
import { describeResistorCorner, describeScenario, describeThreshold, q } from './describe';
import { networkCorners, resistorNetwork } from './network';
import type { Scenario } from './scenario';

const OPEN_LABEL = 'Single fault: discharge time with one bleeder resistor open';

/** The limit that applies under a fault, and its name for the detail. */
function faultLimit(requirement: Requirement): { limit: number; words: string } {
  return requirement.singleFaultMaxTime != null
    ? { limit: requirement.singleFaultMaxTime, words: `the ${q(requirement.singleFaultMaxTime, 's')} single-fault limit` }
    : { limit: requirement.maxTime, words: `the ${q(requirement.maxTime, 's')} time limit` };
}

/**
 * The time limit the bleeders alone are judged against: the fallback limit when set; otherwise, under
 * the single-fault condition, the fault limit (the active circuit failing is the single fault).
 */
export function fallbackLimit(requirement: Requirement): { limit: number | null; note: string } {
  if (requirement.fallbackMaxTime != null) return { limit: requirement.fallbackMaxTime, note: '' };
  if (!requirement.singleFault) return { limit: null, note: '; no fallback limit set, shown for information' };
  const { limit, words } = faultLimit(requirement);
  return { limit, note: `; the active circuit failing is the single fault, so with no fallback limit set the bleeders alone are held to ${words}` };
}

/**
 * One bleeder resistor open: its string carries no current, so the worst case loses one of the
 * `parallel` strings, R_total = R_max · n_series / (n_parallel − 1). With one string nothing is left.
 * With an active circuit declared, the single fault is that circuit failing, which the
 * `passive-fallback-time` check already judges; the open bleeder is then not counted again.
 */
function openBleederCheck(requirement: Requirement, design: Design, worst: Scenario): Check {
  const base = { id: 'single-fault-time', label: OPEN_LABEL, unit: 's' };
  if (design.active !== null) {
    return informationOnly({
      ...base,
      detail:
        'Active discharge declared: the single fault is the active circuit failing, judged by “Discharge time if the active circuit fails (bleeders alone)”; a bleeder opening while the active circuit works is covered by the active discharge time, so it is not counted twice',
    });
  }
  const { bleeder } = design;
  const { limit, words } = faultLimit(requirement);
  if (bleeder.parallel < 2) {
    return {
      ...base,
      value: null,
      limit,
      pass: false,
      margin: null,
      detail: `One resistor open breaks the only string (${bleeder.series} in series): no discharge path remains; a second string, or resistors the standard accepts as reliable, would be needed (against ${words})`,
    };
  }
  const resistance = resistorNetwork(worst.resistorUnit, bleeder.series, bleeder.parallel - 1);
  const path = { kind: 'passive', resistance, capacitance: worst.capacitance } as const;
  const value = pathTime(path, worst.initialVoltage, worst.threshold.voltage);
  const corner = describeScenario({ ...worst, main: path }, design);
  return upperLimitCheck({
    ...base,
    value,
    limit,
    detail: `One of ${bleeder.parallel} strings lost: ${bleeder.parallel - 1} string${bleeder.parallel > 2 ? 's' : ''} of ${bleeder.series} × ${q(worst.resistorUnit, 'Ω')} = ${q(resistance, 'Ω')}, ${corner}; reaches ${describeThreshold(worst.threshold, requirement, worst.capacitance)}; against ${words}`,
  });
}

/**
 * One resistor of a series string shorted: the other n_series − 1 share the maximum bus, each at
 * V0 / (n_series − 1), at the lowest resistance. A fault is judged against the resistor's ratings as
 * rated (power not derated), the margin derating keeps in normal use being spent by the fault.
 */
function shortedResistorChecks(design: Design, worst: Scenario): Check[] {
  const { bleeder } = design;
  if (bleeder.series < 2) return [];
  const net = networkCorners(design);
  const v0 = worst.initialVoltage;
  const remaining = bleeder.series - 1;
  const perResistor = v0 / remaining;
  // Continuous dissipation P = V²/R_min of each remaining resistor.
  const power = perResistor ** 2 / net.resistorUnit.min;
  const sharing =
    remaining === 1
      ? `One of 2 resistors in series shorted: the other carries the whole ${q(v0, 'V')} maximum bus`
      : `One of ${bleeder.series} resistors in series shorted: the other ${remaining} share the ${q(v0, 'V')} maximum bus, ${q(perResistor, 'V')} each`;
  return [
    upperLimitCheck({
      id: 'single-fault-power',
      label: 'Single fault: resistor dissipation with one series resistor shorted',
      value: power,
      limit: bleeder.powerRating,
      unit: 'W',
      detail: `${sharing}, ${describeResistorCorner(net.minCorner)}; limit: the rated power ${q(bleeder.powerRating, 'W')}, not derated (a fault condition)`,
    }),
    upperLimitCheck({
      id: 'single-fault-voltage',
      label: 'Single fault: element voltage with one series resistor shorted',
      value: perResistor,
      limit: bleeder.elementVoltage,
      unit: 'V',
      detail: `${sharing}; limit: the limiting element voltage ${q(bleeder.elementVoltage, 'V')}`,
    }),
  ];
}

/** The single-fault checks a requirement with `singleFault` adds; none without it. */
export function singleFaultChecks(requirement: Requirement, design: Design, worst: Scenario): Check[] {
  if (!requirement.singleFault) return [];
  return [openBleederCheck(requirement, design, worst), ...shortedResistorChecks(design, worst)];
}
