// The discharge check (docs/DOMAIN.md §7.3): from a requirement and a (possibly unfinished) design to the
// wire result of docs/ARCHITECTURE.md §6.3 — checks, corners, curve, sensitivity and a bleeder suggestion.
import {
  type Check,
  type Design,
  type DesignDraft,
  designSchema,
  type DischargeResult,
  type NetworkState,
  type Requirement,
  type RequirementDraft,
  requirementSchema,
  type Suggestion,
} from '../schema/discharge';
import { formatPercent } from '../units';
import { balancingBound } from './balancing';
import { informationOnly, upperLimitCheck } from './check';
import { type CurveResolution, dischargeCurve } from './curve';
import { pathVoltage, storedCharge, storedEnergy } from './decay';
import { describeResistorCorner, describeScenario, describeThreshold, q } from './describe';
import { networkCorners } from './network';
import { type Scenario, scenario } from './scenario';
import { sensitivity } from './sensitivity';
import { fallbackLimit, singleFaultChecks } from './single-fault';
import { suggestBleeder } from './suggest';

export const ENGINE_VERSION = '1.0.0';

export interface DischargeRequest {
  readonly requirement: Readonly<RequirementDraft>;
  readonly design: Readonly<DesignDraft>;
}

export type CompleteInput = { ok: true; requirement: Requirement; design: Design } | { ok: false; missing: string[] };

/** The fields whose absence or invalidity keeps a verdict from being given, as dotted paths. */
function issuePaths(prefix: string, issues: readonly { path: readonly PropertyKey[] }[]): string[] {
  return issues.map((issue) => [prefix, ...issue.path.map(String)].join('.'));
}

/** Checks that a draft is complete; returns the complete, typed requirement and design or the missing paths. */
export function completeInput(input: DischargeRequest): CompleteInput {
  const requirement = requirementSchema.safeParse(input.requirement ?? {});
  const design = designSchema.safeParse(input.design ?? {});
  if (requirement.success && design.success) return { ok: true, requirement: requirement.data, design: design.data };
  const missing = [
    ...(requirement.success ? [] : issuePaths('requirement', requirement.error.issues)),
    ...(design.success ? [] : issuePaths('design', design.error.issues)),
  ];
  return { ok: false, missing: [...new Set(missing)] };
}

/** `curve: 'chart'` thins the curve to what the app's chart can show (the check route's default answer). */
export function computeDischarge(input: DischargeRequest, options: { curve?: CurveResolution } = {}): DischargeResult {
  const complete = completeInput(input);
  if (!complete.ok) {
    return {
      engineVersion: ENGINE_VERSION,
      verdict: 'incomplete',
      missing: complete.missing,
      checks: [],
      nominal: null,
      worstCase: null,
      curve: [],
      sensitivity: null,
      suggestion: suggestionForDraft(input, complete.missing),
    };
  }
  const { requirement, design } = complete;
  const nominal = scenario(requirement, design, 'nominal');
  const worst = scenario(requirement, design, 'worst');
  const checks = dischargeChecks(requirement, design, worst);
  const decisive = checks.filter((c) => !c.alternative);
  return {
    engineVersion: ENGINE_VERSION,
    verdict: decisive.every((c) => c.pass) ? 'meets' : 'fails',
    missing: [],
    checks,
    nominal: networkState(nominal),
    worstCase: networkState(worst),
    curve: dischargeCurve(nominal, worst, requirement.maxTime, options.curve),
    sensitivity: sensitivity(requirement, design),
    suggestion: suggestBleeder(requirement, design),
  };
}

/** The bleeder suggestion still helps when only the bleeder's value and string counts are missing. */
function suggestionForDraft(input: DischargeRequest, missing: readonly string[]): Suggestion | null {
  const sought = ['design.bleeder.resistance', 'design.bleeder.series', 'design.bleeder.parallel'];
  if (!missing.every((path) => sought.includes(path))) return null;
  // Placeholders for exactly the fields the suggestion searches over; it never reads them.
  const bleeder = { ...input.design.bleeder, resistance: 1, series: 1, parallel: 1 };
  const complete = completeInput({ requirement: input.requirement, design: { ...input.design, bleeder } });
  return complete.ok ? suggestBleeder(complete.requirement, complete.design) : null;
}

function networkState(s: Scenario): NetworkState {
  return {
    resistance: s.resistance,
    capacitance: s.capacitance,
    initialVoltage: s.initialVoltage,
    tau: s.tau,
    timeToSafe: s.timeToSafe,
    passiveTimeToSafe: s.passiveTimeToSafe,
    safeThreshold: s.threshold.voltage,
  };
}

function dischargeChecks(requirement: Requirement, design: Design, worst: Scenario): Check[] {
  const checks: Check[] = [timeCheck(requirement, design, worst)];
  if (design.active !== null) checks.push(fallbackCheck(requirement, design, worst));
  checks.push(...resistorChecks(design, worst));
  checks.push(...singleFaultChecks(requirement, design, worst));
  checks.push(energyCheck(requirement, worst));
  if (requirement.maxCharge != null) checks.push(chargeCheck(requirement, worst));
  if (design.active?.mode === 'switched-resistor') checks.push(...switchedChecks(design, worst));
  if (design.balancing) checks.push(balancingCheck(design, worst));
  return checks.map((c) => (c.alternative && !c.pass ? { ...c, detail: `${c.detail}; ${otherwiseMet(requirement, worst)}` } : c));
}

function alreadySafe(s: Scenario, requirement: Requirement): string {
  return `Bus maximum ${q(s.initialVoltage, 'V')} is already at or below ${describeThreshold(s.threshold, requirement, s.capacitance)}: nothing to discharge`;
}

/** Why a failed alternative criterion does not fail the requirement (or does, when none is met). */
function otherwiseMet(requirement: Requirement, worst: Scenario): string {
  return worst.timeToSafe <= requirement.maxTime
    ? `not needed: ${describeThreshold(worst.threshold, requirement, worst.capacitance)} is met ${worst.timeToSafe === 0 ? 'from the start' : `at ${q(worst.timeToSafe, 's')}`}`
    : 'no allowed criterion is met in time';
}

function decidedBy(s: Scenario, requirement: Requirement): string {
  const others = s.threshold.all.length > 1 ? ` (earliest of ${s.threshold.all.length} allowed criteria)` : '';
  return `${describeThreshold(s.threshold, requirement, s.capacitance)}${others}`;
}

function timeCheck(requirement: Requirement, design: Design, worst: Scenario): Check {
  const detail =
    worst.timeToSafe === 0
      ? alreadySafe(worst, requirement)
      : `${capitalise(describeScenario(worst, design))}; reaches ${decidedBy(worst, requirement)}`;
  return upperLimitCheck({
    id: 'discharge-time',
    label: design.active === null ? 'Discharge time (bleeders)' : 'Discharge time (active circuit)',
    value: worst.timeToSafe,
    limit: requirement.maxTime,
    unit: 's',
    detail,
  });
}

function fallbackCheck(requirement: Requirement, design: Design, worst: Scenario): Check {
  const { limit, note } = fallbackLimit(requirement);
  const corner = `Bleeders alone, ${describeScenario({ ...worst, main: worst.passive }, design)}`;
  const detail = worst.passiveTimeToSafe === 0 ? alreadySafe(worst, requirement) : `${corner}; reaches ${decidedBy(worst, requirement)}${note}`;
  return upperLimitCheck({
    id: 'passive-fallback-time',
    label: 'Discharge time if the active circuit fails (bleeders alone)',
    value: worst.passiveTimeToSafe,
    limit,
    unit: 's',
    detail,
  });
}

function resistorChecks(design: Design, worst: Scenario): Check[] {
  const { bleeder } = design;
  const net = networkCorners(design);
  const v0 = worst.initialVoltage;
  const perResistor = v0 / bleeder.series;
  // Continuous dissipation at the highest bus voltage and the lowest resistance: P = V²/R_min.
  const power = perResistor ** 2 / net.resistorUnit.min;
  const sharing = bleeder.series > 1 ? ` (${q(v0, 'V')} shared by ${bleeder.series} in series)` : '';
  return [
    upperLimitCheck({
      id: 'resistor-power',
      label: 'Bleeder resistor dissipation',
      value: power,
      limit: bleeder.powerRating * bleeder.derating,
      unit: 'W',
      detail: `Worst case: ${q(perResistor, 'V')} across each resistor${sharing}, ${describeResistorCorner(net.minCorner)}; limit ${q(bleeder.powerRating, 'W')} × ${formatPercent(bleeder.derating)} derating`,
    }),
    upperLimitCheck({
      id: 'resistor-voltage',
      label: 'Bleeder resistor element voltage',
      value: perResistor,
      limit: bleeder.elementVoltage,
      unit: 'V',
      detail: `Maximum bus ${q(v0, 'V')} shared equally by ${bleeder.series} resistor${bleeder.series > 1 ? 's' : ''} in series`,
    }),
  ];
}

function energyCheck(requirement: Requirement, worst: Scenario): Check {
  const c = worst.capacitance;
  const e0 = storedEnergy(c, worst.initialVoltage);
  const vAtLimit = pathVoltage(worst.main, worst.initialVoltage, requirement.maxTime);
  const eAtLimit = storedEnergy(c, vAtLimit);
  const atSafe =
    worst.initialVoltage > requirement.safeVoltage
      ? `, ${q(storedEnergy(c, requirement.safeVoltage), 'J')} at the ${q(requirement.safeVoltage, 'V')} safe voltage`
      : '';
  const start = `½CV² on ${q(c, 'F')} (worst case): ${q(e0, 'J')} at ${q(worst.initialVoltage, 'V')}${atSafe}`;
  if (requirement.maxEnergy == null) {
    return upperLimitCheck({
      id: 'stored-energy',
      label: 'Stored energy',
      value: e0,
      limit: null,
      unit: 'J',
      detail: `${start}, ${q(eAtLimit, 'J')} left at ${q(requirement.maxTime, 's')}; no energy limit set, shown for information`,
    });
  }
  return {
    ...upperLimitCheck({
      id: 'stored-energy',
      label: `Stored energy at ${q(requirement.maxTime, 's')} (alternative criterion)`,
      value: eAtLimit,
      limit: requirement.maxEnergy,
      unit: 'J',
      detail: `${start}, ${q(eAtLimit, 'J')} left at ${q(requirement.maxTime, 's')} (${q(vAtLimit, 'V')}); an alternative to the safe voltage`,
    }),
    alternative: true,
  };
}

function chargeCheck(requirement: Requirement, worst: Scenario): Check {
  const c = worst.capacitance;
  const vAtLimit = pathVoltage(worst.main, worst.initialVoltage, requirement.maxTime);
  // Stored charge Q = C·V at the limit time.
  const charge = storedCharge(c, vAtLimit);
  return {
    ...upperLimitCheck({
      id: 'charge',
      label: `Stored charge at ${q(requirement.maxTime, 's')} (alternative criterion)`,
      value: charge,
      limit: requirement.maxCharge ?? null,
      unit: 'C',
      detail: `Q = CV on ${q(c, 'F')} (worst case) at ${q(vAtLimit, 'V')} after ${q(requirement.maxTime, 's')}; an alternative to the safe voltage`,
    }),
    alternative: true,
  };
}

function switchedChecks(design: Design, worst: Scenario): Check[] {
  if (design.active?.mode !== 'switched-resistor') return [];
  const { resistance, pulseEnergy, powerRating } = design.active;
  const v0 = worst.initialVoltage;
  // The whole stored energy ½·C·V0² ends up in the discharge resistor; its peak power is V0²/R.
  const energy = storedEnergy(worst.capacitance, v0);
  const peak = v0 ** 2 / resistance;
  return [
    upperLimitCheck({
      id: 'active-pulse-energy',
      label: 'Discharge resistor pulse energy',
      value: energy,
      limit: pulseEnergy,
      unit: 'J',
      detail: `½CV² on ${q(worst.capacitance, 'F')} (C at its upper tolerance) from ${q(v0, 'V')} dumped into ${q(resistance, 'Ω')}`,
    }),
    upperLimitCheck({
      id: 'active-peak-power',
      label: 'Discharge resistor peak power',
      value: peak,
      limit: powerRating ?? null,
      unit: 'W',
      detail: `V0²/R at ${q(v0, 'V')}: peak current ${q(v0 / resistance, 'A')}${powerRating == null ? '; no pulse power rating given, shown for information' : ''}`,
    }),
  ];
}

function balancingCheck(design: Design, worst: Scenario): Check {
  const n = design.capacitors.series;
  const balancing = design.balancing;
  const base = { id: 'balancing', label: 'Balancing of series capacitors', unit: 'Ω' };
  if (!balancing || n < 2) return informationOnly({ ...base, detail: 'One capacitor in series: no voltage sharing to balance' });
  const v0 = worst.initialVoltage;
  // The bleeder across the N capacitors is their balancing network; its highest value is the worst case.
  const perCapacitor = worst.resistance / n;
  const bound = balancingBound(n, balancing, v0);
  const rule = `(${n} × ${q(balancing.capacitorVoltageRating, 'V')} − ${q(v0, 'V')}) / (${n - 1} × ${q(balancing.leakageCurrent, 'A')})`;
  if (bound <= 0) {
    return {
      ...base,
      value: perCapacitor,
      limit: bound,
      pass: false,
      margin: null,
      detail: `${n} × ${q(balancing.capacitorVoltageRating, 'V')} does not exceed the ${q(v0, 'V')} bus: no resistor can balance these capacitors`,
    };
  }
  return upperLimitCheck({
    ...base,
    value: perCapacitor,
    limit: bound,
    detail: `Worst case ${q(perCapacitor, 'Ω')} across each capacitor (${describeResistorCorner(worst.resistorCorner)}) against R ≤ ${rule}, one capacitor leak-free and the others at the maximum leakage`,
  });
}

function capitalise(text: string): string {
  return text[0].toUpperCase() + text.slice(1);
}
