// Switching snubbers: sizing an RC snubber from a ringing measurement, the checks a reviewer signs for
// each snubber in a design (resistor dissipation, capacitor voltage, damping or reset), and the energy
// left in accessible snubber capacitors for the discharge inventory. Pure; SI base units throughout.
import type { Check } from '../schema/discharge';
import { upperLimitCheck } from './check';
import { MULTIPLE_RANGE, type RcdClampSnubber, type RcdTurnoffSnubber, type RcSnubber, type Snubber } from '../schema/snubber';
// Short local names: the detail lines quote many quantities.
import { formatPercent as pct, formatQuantity as si } from '../units';
import { E12, E24, nearestPreferred } from './snubber-e-series';
import { ringingOf } from './snubber-ringing';

export { ringingCurves, ringingOf, stepResponse } from './snubber-ringing';
export type { Ringing, RingingCircuit, RingingCurves, RingingCurvesInput } from './snubber-ringing';

/** Damping ratio the RC snubber must reach with the parasitics (common practice: ζ ≈ 0.5 or more). */
export const DEFAULT_MIN_DAMPING_RATIO = 0.5;

// ---------------------------------------------------------------------------------------------------
// Sizing from a ringing measurement

interface RingingMeasurement {
  /** Ring frequency of the bare node, Hz. */
  readonly f0: number;
  /** Known capacitance added across the node, F. */
  readonly cAdd: number;
  /** Ring frequency with cAdd in place, Hz (below f0). */
  readonly f1: number;
  /** Snubber capacitance as a multiple of the parasitic capacitance. */
  readonly multiple?: number;
  /** Operating point for the dissipation estimate, V and Hz. */
  readonly switchingVoltage?: number | null;
  readonly switchingFrequency?: number | null;
}

export interface RingingSizing {
  f0: number;
  f1: number;
  cAdd: number;
  multiple: number;
  /** Parasitic node capacitance, F. */
  cPar: number;
  /** Parasitic loop inductance, H. */
  lPar: number;
  /** Characteristic impedance √(L_par/C_par), Ω: the suggested snubber resistance. */
  resistance: number;
  /** Suggested snubber capacitance, multiple × C_par, F. */
  capacitance: number;
  /** Nearest E24 resistance, Ω. */
  resistanceE24: number;
  /** Nearest E12 capacitance, F. */
  capacitanceE12: number;
  /** Damping ratio of the parasitics with the E24/E12 snubber (lossless loop). */
  dampingRatio: number;
  /** Ring frequency with the E24/E12 snubber, Hz; null when it no longer rings. */
  ringFrequency: number | null;
  /** Resistor dissipation C·V²·f_sw at the suggested capacitance, W; null without an operating point. */
  power: number | null;
  /** The same with the E12 capacitor, W. */
  powerE12: number | null;
}

/** Resistor dissipation of an RC snubber: the capacitor is charged and discharged through R once per cycle. */
export function rcSnubberPower(capacitance: number, voltage: number, switchingFrequency: number): number {
  // P = C·V²·f_sw: ½·C·V² lost in R on each of the two edges of a cycle.
  return capacitance * voltage * voltage * switchingFrequency;
}

/** Parasitic L and C of a ringing node from f0 and the lowered f1 after adding cAdd, and the RC snubber that damps it. */
export function sizeFromRinging(m: RingingMeasurement): RingingSizing {
  const multiple = m.multiple ?? MULTIPLE_RANGE.default;
  if (!(m.f0 > 0 && m.f1 > 0 && m.cAdd > 0) || !(m.f1 < m.f0) || !(multiple > 0)) {
    throw new RangeError('Sizing needs f0 > f1 > 0, cAdd > 0 and a positive multiple');
  }
  // f ∝ 1/√C with L fixed, so (f0/f1)² = (C_par + C_add)/C_par → C_par = C_add / ((f0/f1)² − 1).
  const cPar = m.cAdd / ((m.f0 / m.f1) ** 2 - 1);
  // Resonance f0 = 1/(2π√(L·C)) → L_par = 1/((2π·f0)²·C_par).
  const lPar = 1 / ((2 * Math.PI * m.f0) ** 2 * cPar);
  // Characteristic impedance Z0 = √(L/C): the resistor that damps the tank (measured-ringing method).
  const resistance = Math.sqrt(lPar / cPar);
  const capacitance = multiple * cPar;
  const resistanceE24 = nearestPreferred(resistance, E24);
  const capacitanceE12 = nearestPreferred(capacitance, E12);
  const fitted = ringingOf({
    inductance: lPar,
    nodeCapacitance: cPar,
    snubber: { resistance: resistanceE24, capacitance: capacitanceE12 },
  });
  const operating = m.switchingVoltage != null && m.switchingFrequency != null ? { v: m.switchingVoltage, f: m.switchingFrequency } : null;
  return {
    f0: m.f0,
    f1: m.f1,
    cAdd: m.cAdd,
    multiple,
    cPar,
    lPar,
    resistance,
    capacitance,
    resistanceE24,
    capacitanceE12,
    dampingRatio: fitted.dampingRatio,
    ringFrequency: fitted.ringFrequency,
    power: operating ? rcSnubberPower(capacitance, operating.v, operating.f) : null,
    powerE12: operating ? rcSnubberPower(capacitanceE12, operating.v, operating.f) : null,
  };
}

// ---------------------------------------------------------------------------------------------------
// Checks for a snubber in a design

interface SnubberCheckOptions {
  /** Lowest acceptable damping ratio for an RC snubber (default 0.5, common practice). */
  readonly minDampingRatio?: number;
}

function lower(base: Pick<Check, 'id' | 'label' | 'unit'>, value: number, limit: number, detail: string): Check {
  return { ...base, value, limit, pass: value >= limit, margin: (value - limit) / limit, detail };
}

/** A check that cannot be decided: no value, not passed, and the detail names what is missing. */
function undecided(base: Pick<Check, 'id' | 'label' | 'unit'>, limit: number | null, detail: string): Check {
  return { ...base, value: null, limit, pass: false, margin: null, detail };
}

const label = (s: Snubber, what: string) => `Snubber ${s.name} — ${what}`;

const capacitanceMax = (s: Snubber) => s.capacitance * (1 + s.capacitanceTolerance);
const capacitanceMin = (s: Snubber) => s.capacitance * (1 - s.capacitanceTolerance);

function powerLimit(s: Snubber): { limit: number; text: string } {
  const limit = s.powerRating * s.derating;
  const text = `${si(s.powerRating, 'W')} × ${s.derating} derating = ${si(limit, 'W')}`;
  return { limit, text };
}

function voltageCheck(s: Snubber, peak: number, how: string): Check {
  return upperLimitCheck({
    id: 'snubber-voltage',
    label: label(s, 'capacitor voltage'),
    unit: 'V',
    value: peak,
    limit: s.capacitorVoltageRating,
    detail: `${how}; rating ${si(s.capacitorVoltageRating, 'V')}`,
  });
}

function rcChecks(s: RcSnubber, options: SnubberCheckOptions): Check[] {
  const cMax = capacitanceMax(s);
  const power = rcSnubberPower(cMax, s.switchingVoltage, s.switchingFrequency);
  const { limit, text } = powerLimit(s);
  const checks: Check[] = [
    upperLimitCheck({
      id: 'snubber-power',
      label: label(s, 'resistor dissipation'),
      unit: 'W',
      value: power,
      limit,
      detail:
        `C·V²·f_sw with C at +${pct(s.capacitanceTolerance)} (${si(cMax, 'F')}), ${si(s.switchingVoltage, 'V')}, ` +
        `${si(s.switchingFrequency, 'Hz')}; limit ${text}`,
    }),
  ];
  // The capacitor follows the node through R, so it sees no more than the node's peak.
  const peak = s.switchingVoltage * (1 + s.overshoot);
  checks.push(voltageCheck(s, peak, `switching voltage ${si(s.switchingVoltage, 'V')} plus ${pct(s.overshoot)} overshoot`));

  const minZeta = options.minDampingRatio ?? DEFAULT_MIN_DAMPING_RATIO;
  const dampingBase = { id: 'snubber-damping', label: label(s, 'damping'), unit: '' };
  if (s.parasiticInductance == null) {
    checks.push(undecided(dampingBase, minZeta, 'Parasitic inductance not entered: measure the ringing and size it with the snubber helper'));
    return checks;
  }
  const L = s.parasiticInductance;
  const corners = [
    { name: `C at −${pct(s.capacitanceTolerance)}`, c: capacitanceMin(s) },
    { name: 'nominal C', c: s.capacitance },
    { name: `C at +${pct(s.capacitanceTolerance)}`, c: cMax },
  ].map((corner) => ({
    ...corner,
    zeta: ringingOf({
      inductance: L,
      nodeCapacitance: s.parasiticCapacitance ?? 0,
      snubber: { resistance: s.resistance, capacitance: corner.c },
    }).dampingRatio,
  }));
  const worst = corners.reduce((a, b) => (b.zeta < a.zeta ? b : a));
  const node =
    s.parasiticCapacitance == null
      ? 'node capacitance not entered, so the series R-L-C of the snubber alone'
      : `with ${si(s.parasiticCapacitance, 'F')} at the node`;
  checks.push(
    lower(dampingBase, worst.zeta, minZeta, `Damping ratio of ${si(L, 'H')} ${node}, worst at ${worst.name}; at least ${minZeta} (common practice)`),
  );
  return checks;
}

function rcdTurnoffChecks(s: RcdTurnoffSnubber): Check[] {
  const cMax = capacitanceMax(s);
  // The diode keeps the capacitor at the node's peak, overshoot included, until the switch turns on.
  const peak = s.switchingVoltage * (1 + s.overshoot);
  // Loss ½·C·V²·f_sw: the charge taken at turn-off is dumped into R at every turn-on (RCD turn-off snubber).
  const power = 0.5 * cMax * peak * peak * s.switchingFrequency;
  const { limit, text } = powerLimit(s);
  const checks: Check[] = [
    upperLimitCheck({
      id: 'snubber-power',
      label: label(s, 'resistor dissipation'),
      unit: 'W',
      value: power,
      limit,
      detail:
        `½·C·V²·f_sw with C at +${pct(s.capacitanceTolerance)} (${si(cMax, 'F')}), peak ${si(peak, 'V')}, ` +
        `${si(s.switchingFrequency, 'Hz')}; limit ${text}`,
    }),
    voltageCheck(s, peak, `switching voltage ${si(s.switchingVoltage, 'V')} plus ${pct(s.overshoot)} overshoot, held by the diode`),
  ];

  const resetBase = { id: 'snubber-reset', label: label(s, 'reset time'), unit: 's' };
  if (s.minOnTime == null) {
    checks.push(undecided(resetBase, null, 'Minimum on-time not entered: the capacitor must discharge within it'));
  } else {
    // Reset: R·C ≤ t_on,min/3 so the capacitor is ~95 % discharged before the next turn-off.
    checks.push(
      upperLimitCheck({
        ...resetBase,
        value: s.resistance * cMax,
        limit: s.minOnTime / 3,
        detail: `R·C with C at +${pct(s.capacitanceTolerance)} against a third of the ${si(s.minOnTime, 's')} minimum on-time`,
      }),
    );
  }

  const sizeBase = { id: 'snubber-capacitance', label: label(s, 'capacitance for the current fall'), unit: 'F' };
  if (s.switchedCurrent == null || s.fallTime == null) {
    checks.push(undecided(sizeBase, null, 'Switched current or fall time not entered: needed to size the capacitor'));
  } else {
    // C ≈ I·t_f/(2V): the capacitor takes the falling current so the node reaches V only as the current ends.
    const needed = (s.switchedCurrent * s.fallTime) / (2 * s.switchingVoltage);
    checks.push(
      lower(
        sizeBase,
        capacitanceMin(s),
        needed,
        `C at −${pct(s.capacitanceTolerance)} against I·t_f/(2V) for ${si(s.switchedCurrent, 'A')}, ` +
          `${si(s.fallTime, 's')}, ${si(s.switchingVoltage, 'V')}`,
      ),
    );
  }
  return checks;
}

/** The voltage an RCD clamp settles at with resistor R, and the energy it absorbs per cycle. */
export function clampOperatingPoint(
  s: Pick<RcdClampSnubber, 'resistance' | 'switchingFrequency'> & {
    readonly leakageInductance: number;
    readonly peakCurrent: number;
    readonly reflectedVoltage: number;
  },
): { clampVoltage: number; power: number; energyPerCycle: number } {
  const energyPerCycle = 0.5 * s.leakageInductance * s.peakCurrent ** 2;
  const ef = energyPerCycle * s.switchingFrequency;
  // Balance V_c²/R = ½·L_lk·I_pk²·f_sw·V_c/(V_c − V_refl) → V_c² − V_refl·V_c − R·E·f = 0, positive root.
  const vr = s.reflectedVoltage;
  const clampVoltage = (vr + Math.sqrt(vr * vr + 4 * s.resistance * ef)) / 2;
  return { clampVoltage, power: (clampVoltage * clampVoltage) / s.resistance, energyPerCycle };
}

/** The clamp voltage the resistor settles at when the leakage data are known, else the declared one. */
function clampVoltageOf(s: RcdClampSnubber): number | undefined {
  const { leakageInductance, peakCurrent, reflectedVoltage } = s;
  if (leakageInductance == null || peakCurrent == null || reflectedVoltage == null) {
    return s.clampVoltage ?? undefined;
  }
  return clampOperatingPoint({ ...s, leakageInductance, peakCurrent, reflectedVoltage }).clampVoltage;
}

function rcdClampChecks(s: RcdClampSnubber): Check[] {
  const powerBase = { id: 'snubber-power', label: label(s, 'resistor dissipation'), unit: 'W' };
  const voltageBase = { id: 'snubber-voltage', label: label(s, 'capacitor voltage'), unit: 'V' };
  const { limit, text } = powerLimit(s);
  const { leakageInductance: L, peakCurrent: I, reflectedVoltage: vr } = s;
  if (L != null && I != null && vr != null) {
    const op = clampOperatingPoint({ ...s, leakageInductance: L, peakCurrent: I, reflectedVoltage: vr });
    const declared = s.clampVoltage == null ? '' : ` (declared ${si(s.clampVoltage, 'V')})`;
    // Ripple: the leakage current ramps from I_pk to 0 in t = L_lk·I_pk/(V_c − V_refl), delivering
    // ½·I_pk·t of charge into C_min; the peak is the settled voltage plus that whole step.
    const ripple = (L * I * I) / (2 * (op.clampVoltage - vr) * capacitanceMin(s));
    return [
      upperLimitCheck({
        ...powerBase,
        value: op.power,
        limit,
        detail:
          `½·L_lk·I_pk²·f_sw·V_c/(V_c − V_refl) with ${si(L, 'H')}, ${si(I, 'A')}, ` +
          `${si(s.switchingFrequency, 'Hz')}; ${si(s.resistance, 'Ω')} settles the clamp at ` +
          `${si(op.clampVoltage, 'V')}${declared}; limit ${text}`,
      }),
      voltageCheck(
        s,
        op.clampVoltage + ripple,
        `settled clamp ${si(op.clampVoltage, 'V')} plus ${si(ripple, 'V')} ripple with C at ` + `−${pct(s.capacitanceTolerance)}`,
      ),
    ];
  }
  if (s.clampVoltage != null) {
    // Without the leakage data the resistor is taken to sit at the declared clamp voltage: P = V_c²/R.
    return [
      upperLimitCheck({
        ...powerBase,
        value: (s.clampVoltage * s.clampVoltage) / s.resistance,
        limit,
        detail:
          `V_c²/R at the declared clamp voltage ${si(s.clampVoltage, 'V')} (leakage inductance, peak current or ` +
          `reflected voltage not entered); limit ${text}`,
      }),
      voltageCheck(s, s.clampVoltage, `declared clamp voltage ${si(s.clampVoltage, 'V')}, ripple not known`),
    ];
  }
  const missing = 'Clamp voltage, or leakage inductance, peak current and reflected voltage, not entered';
  return [undecided(powerBase, limit, missing), undecided(voltageBase, s.capacitorVoltageRating, missing)];
}

/** The checks of one snubber: `snubber-power`, `snubber-voltage`, and `snubber-damping` or the RCD reset checks. */
export function snubberChecks(snubber: Readonly<Snubber>, options: SnubberCheckOptions = {}): Check[] {
  switch (snubber.kind) {
    case 'rc':
      return rcChecks(snubber, options);
    case 'rcd-turnoff':
      return rcdTurnoffChecks(snubber);
    case 'rcd-clamp':
      return rcdClampChecks(snubber);
  }
}

/** Optional inputs a snubber's checks need but lack (field names), so a caller can report `incomplete`. */
export function snubberMissingInputs(snubber: Readonly<Snubber>): string[] {
  switch (snubber.kind) {
    case 'rc':
      return snubber.parasiticInductance == null ? ['parasiticInductance'] : [];
    case 'rcd-turnoff':
      return (['minOnTime', 'switchedCurrent', 'fallTime'] as const).filter((k) => snubber[k] == null);
    case 'rcd-clamp': {
      const leakage = (['leakageInductance', 'peakCurrent', 'reflectedVoltage'] as const).filter((k) => snubber[k] == null);
      if (leakage.length === 0) return [];
      return snubber.clampVoltage == null ? ['clampVoltage', ...leakage] : [];
    }
  }
}

// ---------------------------------------------------------------------------------------------------
// Stored energy

interface SnubberEnergy {
  name: string;
  /** Capacitance at its + tolerance, F. */
  capacitance: number;
  /** Voltage it may hold at switch-off, V. */
  voltage: number;
  /** ½·C·V², J. */
  energy: number;
  /**
   * R·C of the snubber's own resistor when that resistor sits across the capacitor (RCD clamp), s;
   * null when the capacitor discharges with the bus.
   */
  ownTimeConstant: number | null;
}

/**
 * Energy held in the accessible snubber capacitors at switch-off: ½·C·V² at the bus voltage (each
 * snubber's switching voltage when no bus voltage is given); an RCD clamp at the voltage it settles at
 * (or its declared clamp voltage).
 */
export function snubberStoredEnergy(snubbers: readonly Readonly<Snubber>[], busVoltage?: number): { entries: SnubberEnergy[]; total: number } {
  const entries = snubbers
    .filter((s) => s.accessible)
    .map((s): SnubberEnergy => {
      const capacitance = capacitanceMax(s);
      const bus = busVoltage ?? s.switchingVoltage;
      const clamp = s.kind === 'rcd-clamp';
      const voltage = clamp ? (clampVoltageOf(s) ?? bus) : bus;
      // Capacitor energy E = ½·C·V².
      const energy = 0.5 * capacitance * voltage * voltage;
      return { name: s.name, capacitance, voltage, energy, ownTimeConstant: clamp ? s.resistance * capacitance : null };
    });
  return { entries, total: entries.reduce((sum, e) => sum + e.energy, 0) };
}
