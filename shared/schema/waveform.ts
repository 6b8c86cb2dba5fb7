// Wire format of an oscilloscope / data-logger capture analysis (docs/ARCHITECTURE.md §4 evidence `analysis`,
// docs/DOMAIN.md §5.2). Times are seconds on the capture's own time axis (after unit scaling), voltages volts.
import { z } from 'zod';
import { formatQuantity, parseQuantity } from '../units';

const finite = (label: string) => z.number({ error: `${label} must be a finite number` }).finite();

/** A channel is picked by its 0-based position in `channels` (the time column excluded) or by its name. */
export const channelRefSchema = z.union([
  z.number().int('A channel index must be a whole number').min(0, 'A channel index cannot be negative'),
  z.string().trim().min(1, 'A channel name cannot be empty'),
]);

export const analysisOptionsSchema = z.object({
  /** Threshold the voltage must fall below and stay below, V. */
  safeVoltage: finite('Safe voltage').positive('Safe voltage must be greater than zero'),
  /** Time limit after t0, s; when given, the voltage at that instant is reported as `vAtLimit`. */
  maxTime: finite('Time limit').positive('Time limit must be greater than zero').optional(),
  /** Voltage channel to analyse; default the first channel. */
  channel: channelRefSchema.optional(),
  /** Channel whose edge marks the disconnect instant (e.g. a disconnect relay's auxiliary contact). */
  markerChannel: channelRefSchema.optional(),
  /** Disconnect instant on the capture's time axis, s; overrides the marker and the detection. */
  t0: finite('Disconnect instant').optional(),
  /**
   * Factor the voltage channel's values are multiplied by (after their unit), for a file holding
   * probe-side volts: 100 for a 100:1 probe the instrument did not account for. Default 1.
   */
  scale: finite('Voltage scale').positive('Voltage scale must be greater than zero').optional(),
});

export const tracePointSchema = z.object({ t: z.number(), v: z.number() });

export const waveformAnalysisSchema = z.object({
  /** Samples used (rows with a valid time and value). */
  samples: z.number().int().nonnegative(),
  /** Rows left out: NaN/overflow/empty markers, malformed rows, a truncated last line. */
  skipped: z.number().int().nonnegative(),
  /** Name of the analysed voltage channel. */
  channel: z.string(),
  /** Every channel of the capture, in column order (the time column excluded). */
  channels: z.array(z.string()),
  /** Disconnect instant, s (capture time axis). */
  t0: z.number(),
  /** How t0 was found. */
  t0Source: z.enum(['option', 'marker', 'detected', 'start']),
  /** Voltage at t0, V. */
  v0: z.number(),
  /** The threshold the analysis used, V (re-analyse when the requirement changes). */
  safeVoltage: z.number(),
  /** Time from t0 until the voltage falls below `safeVoltage` and stays below, s; null when it never does. */
  timeToSafe: z.number().nullable(),
  /** Voltage at t0 + maxTime, V; null when the capture ends earlier; absent when no maxTime was given. */
  vAtLimit: z.number().nullable().optional(),
  /** Fitted time constant, s; null when the fit is poor (non-exponential trace). */
  tau: z.number().nullable(),
  /** Coefficient of determination of the fit over the fit window (null when no fit was possible). */
  rSquared: z.number().nullable(),
  /** Root-mean-square residual of the fit over the fit window, V. */
  residualRms: z.number().nullable(),
  /** Time span the fit used, s (capture time axis). */
  fitWindow: z.object({ from: z.number(), to: z.number() }).nullable(),
  /** Fitted offset B of V = A·e^(−(t−t0)/τ) + B, V; null when the fit is poor. */
  offset: z.number().nullable(),
  fit: z.enum(['good', 'poor']),
  /** Min/max-decimated trace for plotting, capture time axis, at most 2 000 points. */
  trace: z.array(tracePointSchema).max(2000),
  /** Plain-language remarks: skipped rows, units, probe ratio, how t0 was found, why a fit is poor. */
  notes: z.array(z.string()),
  /**
   * Input resistance of the measuring chain across the capacitor, Ω, as declared at upload; absent or
   * null when not given (the measured checks then say that instrument loading was not corrected).
   */
  probeResistance: z.number().positive().nullable().optional(),
  // The fields below are absent from analyses stored before they existed (those were UTF-8 files,
  // positive rails, unscaled).
  /**
   * Sign of the rail, read from the level before the disconnect. Every voltage in this analysis (V0, the
   * trace, offset, residual, vAtLimit) is in the rail's sense: for a negative rail, the magnitude |v|.
   */
  polarity: z.enum(['positive', 'negative']).optional(),
  /** Voltage scale factor entered with the capture and applied to its values (1 when none was entered). */
  scale: z.number().positive().optional(),
  /** Probe setting stated in the file's metadata, as written; never applied (see `warnings`). */
  probeRatio: z.string().nullable().optional(),
  /** Encoding the file was decoded from (UTF-8 covers ASCII; UTF-16 needs a byte-order mark). */
  encoding: z.enum(['utf-8', 'utf-16le', 'utf-16be']).optional(),
  /**
   * The remarks that need the engineer's attention before the result is trusted (a probe ratio stated
   * in the file, an excursion of the opposite sign beyond the safe level); each is also in `notes`.
   */
  warnings: z.array(z.string()).optional(),
});

/** Lowest input resistance taken for a measuring instrument; below it the figure is surely a wrong unit. */
export const PROBE_RESISTANCE_MIN = 1e3;

/**
 * The upload field `probeResistance`: text in Ω with engineers' notation ("10M", "10 MΩ", "1e7"),
 * blank for none. Refused: non-numeric, ≤ 0, or below 1 kΩ.
 */
export const probeResistanceFieldSchema = z.preprocess(
  (v) => (v === undefined || v === null || String(v).trim() === '' ? undefined : String(v)),
  z
    .string()
    .transform((text, ctx) => {
      const parsed = parseQuantity(text, 'Ω', { allowZero: true, allowNegative: true });
      if (!parsed.ok) {
        ctx.addIssue({ code: 'custom', message: `Probe resistance: ${parsed.error}` });
        return z.NEVER;
      }
      if (parsed.value <= 0) {
        ctx.addIssue({ code: 'custom', message: 'Probe resistance must be greater than zero (e.g. 10 MΩ)' });
        return z.NEVER;
      }
      if (parsed.value < PROBE_RESISTANCE_MIN) {
        ctx.addIssue({
          code: 'custom',
          message: `Probe resistance of ${formatQuantity(parsed.value, 'Ω')} is below 1 kΩ: not a measuring input — check the unit (e.g. 10 MΩ)`,
        });
        return z.NEVER;
      }
      return parsed.value;
    })
    .optional(),
);

export type ChannelRef = z.infer<typeof channelRefSchema>;
export type AnalysisOptions = z.infer<typeof analysisOptionsSchema>;
export type TracePoint = z.infer<typeof tracePointSchema>;
export type WaveformAnalysis = z.infer<typeof waveformAnalysisSchema>;
