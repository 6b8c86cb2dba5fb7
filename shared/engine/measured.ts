// The `measured-discharge` check (DESIGN.md §4.3): what one oscilloscope capture proves against the
// requirement, and whether the measured time constant agrees with the calculation.
import type { Check } from '../schema/discharge';
import type { WaveformAnalysis } from '../schema/waveform';
import { formatQuantity as q } from '../units';

export interface MeasuredRequirement {
  readonly safeVoltage: number;
  readonly maxTime: number;
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

export interface TauBand {
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

/**
 * The checks one waveform adds to a revision's results: `measured-discharge` (measured time to the safe
 * voltage against the time limit) and, when the trace is a clean exponential, `measured-tau` (fitted τ
 * within the predicted band). A poor fit leaves the τ comparison out and says so in the detail.
 */
export function measuredDischargeCheck(
  analysis: Readonly<WaveformAnalysis>,
  requirement: MeasuredRequirement,
  predicted: PredictedDecay,
  evidenceName: string,
): Check[] {
  const { safeVoltage, maxTime } = requirement;
  const label = `Measured time to ${q(safeVoltage, 'V')} (${evidenceName})`;
  if (Math.abs(analysis.safeVoltage - safeVoltage) > 1e-9 * safeVoltage) {
    return [
      {
        id: 'measured-discharge',
        label,
        value: null,
        limit: maxTime,
        unit: 's',
        pass: false,
        margin: null,
        detail: `${evidenceName} was analysed against ${q(analysis.safeVoltage, 'V')}, but the requirement now asks for ${q(safeVoltage, 'V')}: analyse the capture again.`,
      },
    ];
  }
  const time = analysis.timeToSafe;
  const atLimit =
    analysis.vAtLimit === undefined
      ? ''
      : analysis.vAtLimit === null
        ? '; the capture ends before the time limit'
        : `; ${q(analysis.vAtLimit, 'V')} at the time limit`;
  const tauNote =
    analysis.tau === null
      ? '; time constant not compared: the trace is not a clean exponential (poor fit), so only the crossing is used'
      : '';
  const start = `${q(analysis.v0, 'V')} at t0 (${T0_SOURCE[analysis.t0Source]})`;
  const checks: Check[] = [
    {
      id: 'measured-discharge',
      label,
      value: time,
      limit: maxTime,
      unit: 's',
      pass: time !== null && time <= maxTime,
      margin: time === null ? null : (maxTime - time) / maxTime,
      detail:
        time === null
          ? `${evidenceName}: from ${start} the voltage does not stay below ${q(safeVoltage, 'V')} within the capture${atLimit}${tauNote}.`
          : `${evidenceName}: from ${start}, below ${q(safeVoltage, 'V')} to stay after ${q(time, 's')}${atLimit}${tauNote}.`,
    },
  ];
  if (analysis.tau !== null) {
    const tau = analysis.tau;
    const band = predictedTauBand(predicted);
    const pass = tau >= band.lower && tau <= band.upper;
    const where = tau > band.upper ? 'above' : tau < band.lower ? 'below' : 'within';
    const fit = analysis.rSquared === null ? '' : `, R² ${analysis.rSquared.toFixed(4)}`;
    const meaning =
      where === 'below'
        ? ': lower C or R than declared, or a discharge path the calculation does not credit'
        : where === 'above'
          ? ': slower than the worst case allows for'
          : '';
    checks.push({
      id: 'measured-tau',
      label: `Measured time constant (${evidenceName})`,
      value: tau,
      limit: band.upper,
      unit: 's',
      pass,
      // The smaller relative distance to either end of the band; negative outside it.
      margin: Math.min((band.upper - tau) / band.upper, (tau - band.lower) / band.lower),
      detail:
        `Fitted τ ${q(tau, 's')}${fit} is ${where} the predicted band ${q(band.lower, 's')} to ${q(band.upper, 's')} ` +
        `(nominal ${q(predicted.nominalTau, 's')}, worst case ${q(predicted.worstCaseTau, 's')})${meaning}.`,
    });
  }
  return checks;
}
