// The `measured-discharge` check (docs/DOMAIN.md §7.3): what one oscilloscope capture proves against the
// requirement, and whether the measured time constant agrees with the calculation. The capture is
// referred to the requirement's conditions (docs/DOMAIN.md §5.3): to the circuit without the measuring
// instrument, and to the maximum bus voltage when it started lower.
import type { Check } from '../schema/discharge';
import type { WaveformAnalysis } from '../schema/waveform';
import { formatQuantity as q } from '../units';

/** The requirement and the design figures a capture is referred to. */
export interface MeasuredConditions {
  readonly safeVoltage: number;
  readonly maxTime: number;
  /** The design's maximum bus voltage, V: the start the requirement must hold from. */
  readonly maxVoltage: number;
  /** Bank capacitance at its lower tolerance (ageing included), F: the conservative C for the loading correction. */
  readonly capacitanceMin: number;
}

export interface PredictedDecay {
  /** τ of the nominal design, s. */
  readonly nominalTau: number;
  /** τ at the slow corner (R_max·C_max), s: the top of the band. */
  readonly worstCaseTau: number;
  /**
   * How far below nominal the fast corner reaches, as a fraction: for R −1 % and C −20 % it is
   * 1 − 0.99·0.80 = 0.208. Without it the band starts at the nominal τ.
   */
  readonly toleranceBand?: number;
}

interface TauBand {
  lower: number;
  upper: number;
}

/**
 * The band a measured τ must fall in: from the fast corner nominal·(1 − toleranceBand) — or the nominal
 * τ itself when no tolerance is given — up to the worst-case τ. Above the band the sample discharges
 * slower than the worst case allows for; below it the sample is not the declared design (lower
 * capacitance or resistance, or a discharge path the calculation does not credit).
 */
export function predictedTauBand(predicted: PredictedDecay): TauBand {
  const fast = predicted.nominalTau * (1 - Math.max(0, predicted.toleranceBand ?? 0));
  return { lower: Math.min(fast, predicted.worstCaseTau), upper: Math.max(predicted.nominalTau, predicted.worstCaseTau) };
}

const T0_SOURCE: Record<WaveformAnalysis['t0Source'], string> = {
  option: 't0 as entered',
  marker: 't0 from the marker edge',
  detected: 't0 where the decay starts',
  start: 't0 at the first sample',
};

type Loading =
  { kind: 'not-given' } | { kind: 'corrected'; tau: number; probe: number; capacitance: number } | { kind: 'impossible'; reason: string };

/**
 * The measuring chain's input resistance R_m sits across the bank, in parallel with the bleeders, so
 * the capture decays faster than the circuit alone: 1/τ_unloaded = 1/τ_measured − 1/(R_m·C) (parallel
 * resistances). C at its lower tolerance gives the longest, conservative τ.
 */
function loadingCorrection(analysis: Readonly<WaveformAnalysis>, conditions: MeasuredConditions): Loading {
  const probe = analysis.probeResistance ?? null;
  if (probe === null) return { kind: 'not-given' };
  const c = conditions.capacitanceMin;
  const instrument = `the instrument's ${q(probe, 'Ω')} across ${q(c, 'F')} (C at its lower tolerance)`;
  if (analysis.tau === null) {
    return {
      kind: 'impossible',
      reason: `${instrument} cannot be taken out of a trace that is not a clean exponential (poor fit); capture with an instrument of much higher input resistance`,
    };
  }
  const rate = 1 / analysis.tau - 1 / (probe * c);
  if (rate <= 0) {
    return {
      kind: 'impossible',
      reason: `${instrument} alone gives τ ${q(probe * c, 's')}, no longer than the ${q(analysis.tau, 's')} measured: the capture shows the instrument's own discharge; capture with an instrument of much higher input resistance`,
    };
  }
  return { kind: 'corrected', tau: 1 / rate, probe, capacitance: c };
}

function loadingWords(loading: Loading, measuredTau: number | null): string {
  switch (loading.kind) {
    case 'not-given':
      return 'instrument loading not corrected (no probe resistance given)';
    case 'impossible':
      return `instrument loading not corrected: ${loading.reason}`;
    case 'corrected':
      return `instrument loading corrected for ${q(loading.probe, 'Ω')} across ${q(loading.capacitance, 'F')} (C at its lower tolerance): 1/τ = 1/τ_measured − 1/(R_m·C), τ ${q(measuredTau ?? NaN, 's')} measured → ${q(loading.tau, 's')} unloaded`;
  }
}

/** What a failed referral asks for. */
const ASK_FOR_CAPTURE = 'capture a discharge from the maximum bus voltage';

/**
 * The checks one waveform adds to a revision's results: `measured-discharge` (measured time to the safe
 * voltage, referred to the maximum bus and the unloaded circuit, against the time limit) and, when the
 * trace is a clean exponential, `measured-tau` (fitted τ within the predicted band). A poor fit leaves
 * the τ comparison out and says so in the detail.
 */
export function measuredDischargeCheck(
  analysis: Readonly<WaveformAnalysis>,
  conditions: MeasuredConditions,
  predicted: PredictedDecay,
  evidenceName: string,
): Check[] {
  const { safeVoltage, maxTime, maxVoltage } = conditions;
  const base = { id: 'measured-discharge', label: `Measured time to ${q(safeVoltage, 'V')} (${evidenceName})`, limit: maxTime, unit: 's' };
  if (Math.abs(analysis.safeVoltage - safeVoltage) > 1e-9 * safeVoltage) {
    return [
      {
        ...base,
        value: null,
        pass: false,
        margin: null,
        detail: `${evidenceName} was analysed against ${q(analysis.safeVoltage, 'V')}, but the requirement now asks for ${q(safeVoltage, 'V')}: analyse the capture again.`,
      },
    ];
  }

  const measured = analysis.timeToSafe;
  const v0 = analysis.v0;
  const loading = loadingCorrection(analysis, conditions);
  const tau = loading.kind === 'corrected' ? loading.tau : analysis.tau;
  // For an exponential every crossing time scales with τ (t = τ·ln(V0/V)).
  const unloaded = measured === null || loading.kind !== 'corrected' || analysis.tau === null ? measured : (measured * loading.tau) / analysis.tau;
  const start: NonNullable<Check['referral']>['start'] =
    v0 >= maxVoltage ? 'as-measured' : tau === null || v0 <= safeVoltage ? 'not-referable' : 'referred';
  const referral: NonNullable<Check['referral']> = {
    measuredTime: measured,
    v0,
    maxVoltage,
    start,
    measuredTau: analysis.tau,
    unloadedTau: loading.kind === 'corrected' ? loading.tau : null,
    probeResistance: analysis.probeResistance ?? null,
    loadingCapacitance: loading.kind === 'corrected' ? loading.capacitance : null,
  };

  // A negative rail is analysed as |v|; the detail keeps its sign so nobody reads it as a positive bus.
  const from = analysis.polarity === 'negative' ? `${q(-v0, 'V')} (negative rail, measured as |v|)` : q(v0, 'V');
  const clauses: string[] = [];
  clauses.push(
    measured === null
      ? `${evidenceName}: from ${from} at t0 (${T0_SOURCE[analysis.t0Source]}) the voltage does not stay below ${q(safeVoltage, 'V')} within the capture`
      : `${evidenceName}: from ${from} at t0 (${T0_SOURCE[analysis.t0Source]}), below ${q(safeVoltage, 'V')} to stay after ${q(measured, 's')} as measured`,
  );
  if (analysis.vAtLimit !== undefined) {
    clauses.push(
      analysis.vAtLimit === null ? 'the capture ends before the time limit' : `${q(analysis.vAtLimit, 'V')} at the time limit in the capture`,
    );
  }
  clauses.push(loadingWords(loading, analysis.tau));
  const warnings = analysis.warnings ?? [];
  if (warnings.length)
    clauses.push(`${warnings.length === 1 ? 'one warning' : `${warnings.length} warnings`} on this capture to read first: ${warnings.join('; ')}`);

  let value: number | null = null;
  if (measured !== null && unloaded !== null && loading.kind !== 'impossible') {
    if (start === 'as-measured') {
      value = unloaded;
      clauses.push(
        `started at or above the ${q(maxVoltage, 'V')} maximum bus: time used as measured${loading.kind === 'corrected' ? ` and unloaded, ${q(unloaded, 's')}` : ''}`,
      );
    } else if (start === 'referred' && tau !== null) {
      // RC decay from V_max: t(V_max→V_safe) = t(V0→V_safe) + τ·ln(V_max/V0).
      value = unloaded + tau * Math.log(maxVoltage / v0);
      clauses.push(
        `referred to the ${q(maxVoltage, 'V')} maximum bus by the RC decay law: ${q(unloaded, 's')} + τ ${q(tau, 's')} × ln(${q(maxVoltage, 'V', 4)} / ${q(v0, 'V', 4)}) = ${q(value, 's')}`,
      );
    } else {
      clauses.push(
        v0 <= safeVoltage
          ? `the capture starts at or below the safe voltage, so it shows no discharge to refer to the ${q(maxVoltage, 'V')} maximum bus: ${ASK_FOR_CAPTURE}`
          : `the capture starts below the ${q(maxVoltage, 'V')} maximum bus and is not a clean exponential (poor fit), so it cannot be referred to it: ${ASK_FOR_CAPTURE}`,
      );
    }
  }
  if (analysis.tau === null && loading.kind === 'not-given') {
    clauses.push('time constant not compared: the trace is not a clean exponential (poor fit), so only the crossing is used');
  }

  const checks: Check[] = [
    {
      ...base,
      value,
      pass: value !== null && value <= maxTime,
      margin: value === null ? null : (maxTime - value) / maxTime,
      detail: `${clauses.join('; ')}.`,
      referral,
    },
  ];
  if (tau !== null && loading.kind !== 'impossible') checks.push(tauCheck(analysis, tau, loading, predicted, evidenceName, referral));
  return checks;
}

/** The fitted (unloaded when corrected) τ against the predicted band, stated against the end it is nearest or beyond. */
function tauCheck(
  analysis: Readonly<WaveformAnalysis>,
  tau: number,
  loading: Loading,
  predicted: PredictedDecay,
  evidenceName: string,
  referral: NonNullable<Check['referral']>,
): Check {
  const band = predictedTauBand(predicted);
  const where = tau > band.upper ? 'above' : tau < band.lower ? 'below' : 'within';
  const fromLower = (tau - band.lower) / band.lower;
  const fromUpper = (band.upper - tau) / band.upper;
  const againstLower = where === 'below' || (where === 'within' && fromLower < fromUpper);
  const fit = analysis.rSquared === null ? '' : `, R² ${analysis.rSquared.toFixed(4)}`;
  const figure =
    loading.kind === 'corrected'
      ? `Fitted τ ${q(tau, 's')} unloaded (${q(analysis.tau ?? NaN, 's')} as measured${fit})`
      : `Fitted τ ${q(tau, 's')}${fit}`;
  const meaning =
    where === 'below'
      ? ': lower C or R than declared, or a discharge path the calculation does not credit'
      : where === 'above'
        ? ': slower than the worst case allows for'
        : '';
  return {
    id: 'measured-tau',
    label: `Measured time constant (${evidenceName})`,
    value: tau,
    limit: againstLower ? band.lower : band.upper,
    unit: 's',
    pass: where === 'within',
    margin: againstLower ? fromLower : fromUpper,
    band,
    detail:
      `${figure} is ${where} the band ${q(band.lower, 's')} – ${q(band.upper, 's')} ` +
      `(nominal ${q(predicted.nominalTau, 's')}, worst case ${q(predicted.worstCaseTau, 's')})${meaning}; ` +
      (loading.kind === 'corrected'
        ? `instrument loading corrected for ${q(loading.probe, 'Ω')} across ${q(loading.capacitance, 'F')} (C at its lower tolerance).`
        : `${loadingWords(loading, analysis.tau)}.`),
    referral,
  };
}
