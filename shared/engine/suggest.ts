// Inverse design of the bleeder: the largest preferred resistance (IEC 60063) and the smallest string
// that meet the time limit, the derated power and the element voltage together.
import type { Bleeder, BleederOption, Design, Requirement, Suggestion } from '../schema/discharge';
import { formatPercent } from '../units';
import { maxDischargeResistance, rcTime, safeThreshold } from './decay';
import { describeThreshold, q } from './describe';
import { type ESeries, eValueAtOrBelow } from './e-series';
import { capacitorMaxUnit, capacitorNetwork, resistorMaxCorner, resistorMinCorner } from './network';
import { balancingBound } from './balancing';

/** String sizes searched: resistors in series, strings in parallel. */
export const SUGGEST_MAX_SERIES = 8;
export const SUGGEST_MAX_PARALLEL = 4;
/** Largest single bleeder resistor offered (common practice: parts above ~1 GΩ are not stocked as bleeders). */
export const SUGGEST_MAX_RESISTANCE = 1e9;

/** The bleeder's part family (tolerance, TCR, ratings); its value and string counts are what is sought. */
export type SuggestDesign = Omit<Design, 'bleeder'> & {
  bleeder: Omit<Bleeder, 'resistance' | 'series' | 'parallel'>;
};

export function suggestBleeder(requirement: Requirement, design: SuggestDesign): Suggestion {
  const { bus, capacitors, bleeder, ambient } = design;
  const v0 = bus.maxVoltage;
  const cMax = capacitorNetwork(capacitorMaxUnit(capacitors), capacitors.series, capacitors.parallel);
  const threshold = safeThreshold(cMax, requirement);
  const forFallback = design.active !== null;
  const timeLimit = forFallback ? (requirement.fallbackMaxTime ?? requirement.maxTime) : requirement.maxTime;
  const basis = forFallback
    ? `${q(timeLimit, 's')} for the bleeders alone${requirement.fallbackMaxTime == null ? ' (no fallback limit set, so the main limit)' : ''}`
    : q(timeLimit, 's');

  if (v0 <= threshold.voltage) {
    return {
      found: false,
      reason: `The ${q(v0, 'V')} bus is already at or below ${describeThreshold(threshold, requirement, cMax)}: the time limit needs no bleeder; size one for balancing or service safety instead.`,
    };
  }

  const maxCorner = resistorMaxCorner(bleeder, ambient);
  const minCorner = resistorMinCorner(bleeder, ambient);
  const timeBound = maxDischargeResistance(timeLimit, cMax, v0, threshold.voltage);
  const balance = design.balancing && capacitors.series > 1 ? balancingBound(capacitors.series, design.balancing, v0) : undefined;
  if (balance !== undefined && balance <= 0) {
    return {
      found: false,
      reason: `${capacitors.series} capacitors rated ${q(design.balancing?.capacitorVoltageRating ?? 0, 'V')} cannot hold a ${q(v0, 'V')} bus with any balancing resistor: add a capacitor in series or use higher-rated parts.`,
    };
  }
  // The bleeder string across the N capacitors is their balancing network: R per capacitor = R_total/N.
  const balanceBound = balance === undefined ? Infinity : balance * capacitors.series;
  const totalBound = Math.min(timeBound, balanceBound);
  const powerLimit = bleeder.powerRating * bleeder.derating;

  const options: Record<ESeries, BleederOption[]> = { E24: [], E96: [] };
  for (let series = 1; series <= SUGGEST_MAX_SERIES; series += 1) {
    const voltagePerResistor = v0 / series;
    if (voltagePerResistor > bleeder.elementVoltage) continue;
    for (let parallel = 1; parallel <= SUGGEST_MAX_PARALLEL; parallel += 1) {
      const unitBound = Math.min((totalBound * parallel) / (series * maxCorner.factor), SUGGEST_MAX_RESISTANCE);
      for (const eSeries of ['E24', 'E96'] as const) {
        const resistance = eValueAtOrBelow(unitBound, eSeries);
        if (resistance === undefined) continue;
        // Continuous dissipation at the highest bus voltage and the lowest resistance: P = V²/R_min.
        const powerPerResistor = voltagePerResistor ** 2 / (resistance * minCorner.factor);
        if (powerPerResistor > powerLimit) continue;
        const totalResistance = (resistance * series) / parallel;
        options[eSeries].push({
          eSeries,
          resistance,
          series,
          parallel,
          totalResistance,
          worstCaseTime: rcTime(v0, threshold.voltage, totalResistance * maxCorner.factor * cMax),
          timeLimit,
          powerPerResistor,
          powerLimit,
          voltagePerResistor,
        });
      }
    }
  }

  // Fewest parts first, then the coolest resistors.
  const rank = (a: BleederOption, b: BleederOption) => a.series * a.parallel - b.series * b.parallel || a.powerPerResistor - b.powerPerResistor;
  const bestE24 = [...options.E24].sort(rank)[0];
  const primary = bestE24 ?? [...options.E96].sort(rank)[0];
  if (primary === undefined) return { found: false, reason: noBleederReason() };

  const alternatives = options.E96.filter(
    (o) => o.series === primary.series && o.parallel === primary.parallel && o.resistance !== primary.resistance,
  );
  const capped = primary.resistance * primary.series * maxCorner.factor >= SUGGEST_MAX_RESISTANCE * primary.parallel;
  const decidedBy = balanceBound < timeBound ? 'the balancing bound' : basis;
  const detail =
    `Largest ${primary.eSeries} value meeting ${decidedBy}, power and element voltage with the fewest resistors: ` +
    `${primary.series} in series × ${primary.parallel} string${primary.parallel > 1 ? 's' : ''} of ${q(primary.resistance, 'Ω')} → ` +
    `worst case ${q(primary.worstCaseTime, 's')}, ${q(primary.powerPerResistor, 'W')} each (limit ${q(powerLimit, 'W')}), ` +
    `${q(primary.voltagePerResistor, 'V')} each (limit ${q(bleeder.elementVoltage, 'V')})` +
    (capped ? `; capped at ${q(SUGGEST_MAX_RESISTANCE, 'Ω')} per resistor` : '');
  return { found: true, ...primary, detail, alternatives };

  function noBleederReason(): string {
    const lowest = v0 / SUGGEST_MAX_SERIES;
    if (lowest > bleeder.elementVoltage) {
      return `Even ${SUGGEST_MAX_SERIES} resistors in series leave ${q(lowest, 'V')} on each, above the ${q(bleeder.elementVoltage, 'V')} limiting element voltage: choose a part with a higher voltage rating or a longer string.`;
    }
    // The dissipation is set by the total resistance, however the string is arranged: P = V0²/R_total,min.
    const needed = v0 ** 2 / ((totalBound * minCorner.factor) / maxCorner.factor);
    const available = SUGGEST_MAX_SERIES * SUGGEST_MAX_PARALLEL * powerLimit;
    if (needed <= available) {
      return (
        `No string of up to ${SUGGEST_MAX_SERIES} × ${SUGGEST_MAX_PARALLEL} resistors of this part meets ${basis}, ` +
        `${q(powerLimit, 'W')} per resistor and ${q(bleeder.elementVoltage, 'V')} per resistor together at preferred values: ` +
        'choose a part with a higher power or voltage rating.'
      );
    }
    return (
      `Meeting ${basis} needs at most ${q(totalBound, 'Ω')} in total (worst case), which dissipates about ` +
      `${q(needed, 'W')} continuously at ${q(v0, 'V')}; ${SUGGEST_MAX_SERIES * SUGGEST_MAX_PARALLEL} resistors of ` +
      `${q(bleeder.powerRating, 'W')} at ${formatPercent(bleeder.derating)} of their rating carry ${q(available, 'W')} at most. ` +
      'A passive bleeder is impractical here: use an active discharge circuit, or a warning label stating the discharge time where the standard allows it.'
    );
  }
}
