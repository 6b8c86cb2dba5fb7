// Wire format of the discharge check (docs/DOMAIN.md §7.1, docs/ARCHITECTURE.md §6.3). The JSON names are a contract shared by the
// app, the API and stored revisions. All numbers are SI base units; temperatures in °C; tolerances are
// fractions (0.01 = 1 %).
import { z } from 'zod';
import { fieldAt, nounOf } from './fields';
import { snubberDraftSchema, snubberSchema } from './snubber';

/** A field's name in messages, from its descriptor (shared/schema/fields.ts). */
const noun = (path: string) => nounOf(fieldAt(path));

interface QuantityRule {
  /** Plain name used in messages, e.g. "Capacitance". */
  label: string;
  /** Unit shown in messages. */
  unit: string;
  /** Lower bound; `exclusive` by default because most physical quantities here must be strictly positive. */
  min: number;
  minInclusive?: boolean;
  max: number;
  integer?: boolean;
}

function quantity(rule: QuantityRule) {
  const { label, unit, min, max } = rule;
  let schema = z.number({
    error: (issue) => (issue.input === undefined || issue.input === null ? `${label} is required` : `${label} must be a finite number in ${unit}`),
  });
  if (rule.integer) schema = schema.int(`${label} must be a whole number`);
  schema = rule.minInclusive
    ? schema.gte(min, min === 0 ? `${label} cannot be negative` : `${label} must be at least ${min} ${unit}`)
    : schema.gt(min, min === 0 ? `${label} must be greater than zero` : `${label} must be above ${min} ${unit}`);
  return schema.lte(max, `${label} above ${max} ${unit} is not a realistic value — check the unit`);
}

const voltage = (label: string) => quantity({ label, unit: 'V', min: 0, max: 1e6 });
const time = (label: string) => quantity({ label, unit: 's', min: 0, max: 1e6 });
const delay = (label: string) => quantity({ label, unit: 's', min: 0, minInclusive: true, max: 1e6 });
const count = (label: string) => quantity({ label, unit: 'units', min: 1, minInclusive: true, max: 1000, integer: true });
const fraction = (label: string) => quantity({ label, unit: '(fraction, 0.01 = 1 %)', min: 0, minInclusive: true, max: 0.999 });
const temperature = (label: string) => quantity({ label, unit: '°C', min: -273.15, minInclusive: true, max: 1000 });
const text = (label: string) => z.string({ error: `${label} must be text` }).max(2000, `${label} is too long`);

// Leaf definitions, written once and used for both the complete design and the draft.
const busLeaves = {
  nominalVoltage: voltage(noun('bus.nominalVoltage')),
  maxVoltage: voltage(noun('bus.maxVoltage')),
};
const capacitorLeaves = {
  capacitance: quantity({ label: noun('capacitors.capacitance'), unit: 'F', min: 0, max: 10 }),
  series: count(noun('capacitors.series')),
  parallel: count(noun('capacitors.parallel')),
  toleranceMinus: fraction(noun('capacitors.toleranceMinus')),
  tolerancePlus: fraction(noun('capacitors.tolerancePlus')),
};
const bleederLeaves = {
  resistance: quantity({ label: noun('bleeder.resistance'), unit: 'Ω', min: 0, max: 1e12 }),
  series: count(noun('bleeder.series')),
  parallel: count(noun('bleeder.parallel')),
  tolerance: fraction(noun('bleeder.tolerance')),
  tcrPpmPerK: quantity({ label: noun('bleeder.tcrPpmPerK'), unit: 'ppm/K', min: -10000, minInclusive: true, max: 10000 }),
  drift: fraction(noun('bleeder.drift')),
  powerRating: quantity({ label: noun('bleeder.powerRating'), unit: 'W', min: 0, max: 1e5 }),
  elementVoltage: voltage(noun('bleeder.elementVoltage')),
  derating: quantity({ label: noun('bleeder.derating'), unit: '(fraction)', min: 0, max: 1 }),
};
const ambientLeaves = {
  min: temperature(noun('ambient.min')),
  max: temperature(noun('ambient.max')),
};
const constantCurrentLeaves = {
  current: quantity({ label: noun('active.current'), unit: 'A', min: 0, max: 1e5 }),
  delay: delay(noun('active.delay')),
};
const switchedResistorLeaves = {
  resistance: quantity({ label: noun('active.resistance'), unit: 'Ω', min: 0, max: 1e12 }),
  pulseEnergy: quantity({ label: noun('active.pulseEnergy'), unit: 'J', min: 0, max: 1e9 }),
  delay: delay(noun('active.delay')),
};
const balancingLeaves = {
  leakageCurrent: quantity({ label: noun('balancing.leakageCurrent'), unit: 'A', min: 0, max: 100 }),
  capacitorVoltageRating: voltage(noun('balancing.capacitorVoltageRating')),
};

type Leaves = Record<string, z.ZodType>;
/** Every leaf optional and nullable: drafts may be unfinished, but what is present must be valid. */
function draftOf<T extends Leaves>(leaves: T): { [K in keyof T]: z.ZodOptional<z.ZodNullable<T[K]>> } {
  return Object.fromEntries(Object.entries(leaves).map(([k, v]) => [k, v.nullish()])) as {
    [K in keyof T]: z.ZodOptional<z.ZodNullable<T[K]>>;
  };
}

interface MaybeOrdered {
  [key: string]: unknown;
}
/** Adds "lower ≤ upper" with the error on the upper field, checked only when both are present. */
function ordered(lower: string, upper: string, message: string) {
  return (value: MaybeOrdered, ctx: z.RefinementCtx) => {
    const lo = value[lower];
    const hi = value[upper];
    if (typeof lo === 'number' && typeof hi === 'number' && lo > hi) {
      ctx.addIssue({ code: 'custom', path: [upper], message });
    }
  };
}
const busOrder = ordered('nominalVoltage', 'maxVoltage', 'Maximum bus voltage must be at least the nominal voltage');
const ambientOrder = ordered('min', 'max', 'Maximum ambient temperature must be at least the minimum');

// ---------------------------------------------------------------------------------------------------
// Requirement (docs/DOMAIN.md §7.1)

export const requirementSchema = z.object({
  safeVoltage: voltage(noun('requirement.safeVoltage')),
  maxTime: time(noun('requirement.maxTime')),
  maxEnergy: quantity({ label: noun('requirement.maxEnergy'), unit: 'J', min: 0, max: 1e9 }).nullish(),
  /** Charge criterion, coulombs (e.g. 45 µC in laboratory-equipment standards). */
  maxCharge: quantity({ label: noun('requirement.maxCharge'), unit: 'C', min: 0, max: 1e3 }).nullish(),
  /** Limit for the passive bleeders alone when an active circuit is declared. */
  fallbackMaxTime: time(noun('requirement.fallbackMaxTime')).nullish(),
  /**
   * Whether the discharge must also hold under a single fault (one bleeder open, one series resistor
   * shorted); the user's standard decides, e.g. not when the bleeder is a component judged reliable.
   */
  singleFault: z.boolean({ error: 'Single-fault condition must be true or false' }).default(false),
  /** Time limit under a single fault where the standard allows longer than `maxTime`, s. */
  singleFaultMaxTime: time(noun('requirement.singleFaultMaxTime')).nullish(),
  condition: text('Condition').default(''),
  reference: text('Reference').default(''),
});

/** A requirement being typed in: every field optional; what is present must be valid. */
export const requirementDraftSchema = z.object({
  safeVoltage: requirementSchema.shape.safeVoltage.nullish(),
  maxTime: requirementSchema.shape.maxTime.nullish(),
  maxEnergy: requirementSchema.shape.maxEnergy,
  maxCharge: requirementSchema.shape.maxCharge,
  fallbackMaxTime: requirementSchema.shape.fallbackMaxTime,
  singleFault: z.boolean({ error: 'Single-fault condition must be true or false' }).nullish(),
  singleFaultMaxTime: requirementSchema.shape.singleFaultMaxTime,
  condition: text('Condition').nullish(),
  reference: text('Reference').nullish(),
});

// ---------------------------------------------------------------------------------------------------
// Design (docs/DOMAIN.md §7.2, docs/ARCHITECTURE.md §6.3)

export const busSchema = z.object(busLeaves).superRefine(busOrder);
export const capacitorsSchema = z.object({
  ...capacitorLeaves,
  /** Fractional capacitance loss over life; it lowers C_min only (never helps the slow corner). */
  ageing: fraction(noun('capacitors.ageing')).nullish(),
});
export const bleederSchema = z.object(bleederLeaves);
export const ambientSchema = z.object(ambientLeaves).superRefine(ambientOrder);
export const constantCurrentSchema = z.object({ mode: z.literal('constant-current'), ...constantCurrentLeaves });
export const switchedResistorSchema = z.object({
  mode: z.literal('switched-resistor'),
  ...switchedResistorLeaves,
  /** Short-time (pulse) power rating of the discharge resistor, compared with the peak power V0²/R. */
  powerRating: quantity({ label: noun('active.powerRating'), unit: 'W', min: 0, max: 1e9 }).nullish(),
});
const activeModeError = { error: 'Active discharge mode must be "constant-current" or "switched-resistor"' };
export const activeSchema = z.discriminatedUnion('mode', [constantCurrentSchema, switchedResistorSchema], activeModeError).nullable();
export const balancingSchema = z.object(balancingLeaves);

export const designSchema = z.object({
  bus: busSchema,
  capacitors: capacitorsSchema,
  bleeder: bleederSchema,
  ambient: ambientSchema,
  active: activeSchema.default(null),
  /** Leakage data for the N-series balancing bound; the bleeder network is taken as the balancing network. */
  balancing: balancingSchema.nullish(),
  snubbers: z.array(snubberSchema).optional(),
});

export const designDraftSchema = z.object({
  bus: z.object(draftOf(busLeaves)).superRefine(busOrder).nullish(),
  capacitors: z.object({ ...draftOf(capacitorLeaves), ageing: capacitorsSchema.shape.ageing }).nullish(),
  bleeder: z.object(draftOf(bleederLeaves)).nullish(),
  ambient: z.object(draftOf(ambientLeaves)).superRefine(ambientOrder).nullish(),
  active: z
    .discriminatedUnion(
      'mode',
      [
        z.object({ mode: z.literal('constant-current'), ...draftOf(constantCurrentLeaves) }),
        z.object({
          mode: z.literal('switched-resistor'),
          ...draftOf(switchedResistorLeaves),
          powerRating: switchedResistorSchema.shape.powerRating,
        }),
      ],
      activeModeError,
    )
    .nullish(),
  balancing: z.object(draftOf(balancingLeaves)).nullish(),
  snubbers: z.array(snubberDraftSchema).optional(),
});

// ---------------------------------------------------------------------------------------------------
// Input and result (docs/DOMAIN.md §7.3, docs/ARCHITECTURE.md §6.3)

export const dischargeInputSchema = z.object({
  requirement: requirementSchema,
  design: designDraftSchema,
});

export const checkSchema = z.object({
  id: z.string(),
  label: z.string(),
  value: z.number().nullable(),
  limit: z.number().nullable(),
  unit: z.string(),
  pass: z.boolean(),
  /** (limit − value) / limit for upper limits; null when there is no limit. */
  margin: z.number().nullable(),
  /** One line naming what decided the check (corner, criterion). */
  detail: z.string(),
  /**
   * True for a criterion that is one of several allowed alternatives (energy, charge): the
   * `discharge-time` check already takes the earliest instant any of them is met, so this one informs
   * and does not decide the verdict on its own.
   */
  alternative: z.boolean().optional(),
  /**
   * True when nothing is judged: no limit is set (stored energy without an energy limit, a fallback
   * without its own limit), or another check covers the case. Show "for information", never a pass;
   * `pass` stays true so it does not fail the verdict.
   */
  informational: z.boolean().optional(),
  /** For a check derived from one evidence file: that evidence record's id and the file's SHA-256. */
  evidenceId: z.number().int().optional(),
  evidenceSha256: z.string().optional(),
  /**
   * For a check against a band (measured τ): both ends. `limit` is then the end the value is nearest
   * to (or beyond), and `margin` is relative to that end.
   */
  band: z.object({ lower: z.number(), upper: z.number() }).optional(),
  /** For measured checks: how the capture was referred to the requirement's conditions. */
  referral: z
    .object({
      /** Crossing time as measured, s after t0 (null when the capture never stays below). */
      measuredTime: z.number().nullable(),
      /** Voltage at t0 in the capture, V. */
      v0: z.number(),
      /** The design's maximum bus voltage, V. */
      maxVoltage: z.number(),
      /** "as-measured": V0 ≥ V_max; "referred": extended to V_max by the RC law; "not-referable". */
      start: z.enum(['as-measured', 'referred', 'not-referable']),
      /** Fitted τ as measured, s (null when the fit is poor). */
      measuredTau: z.number().nullable(),
      /** τ referred to the circuit without the instrument, s (null when not corrected). */
      unloadedTau: z.number().nullable(),
      /** Input resistance of the measuring chain, Ω (null when not given: loading not corrected). */
      probeResistance: z.number().nullable(),
      /** Capacitance used for the loading correction (bank at its lower tolerance), F. */
      loadingCapacitance: z.number().nullable(),
    })
    .optional(),
});

/** A check that informs and judges nothing; older stored results carry no flag, only no limit and a pass. */
export function isInformational(check: Pick<Check, 'informational' | 'limit' | 'pass'>): boolean {
  return check.informational ?? (check.limit === null && check.pass);
}

export const networkStateSchema = z.object({
  /** Network total after series/parallel, Ω. */
  resistance: z.number(),
  /** Network total after series/parallel, F. */
  capacitance: z.number(),
  initialVoltage: z.number(),
  /** Time constant of the passive network, s. */
  tau: z.number(),
  /** Time to reach the safe condition on the declared discharge path (active when declared), s. */
  timeToSafe: z.number(),
  /** Time for the passive bleeders alone, s. */
  passiveTimeToSafe: z.number(),
  /** Voltage at which the earliest allowed criterion (voltage, charge or energy) is met, V. */
  safeThreshold: z.number(),
});

export const curvePointSchema = z.object({ t: z.number(), v: z.number(), vWorst: z.number() });

export const sensitivityEntrySchema = z.object({
  input: z.string(),
  label: z.string(),
  /** % change of the worst-case time for +1 % of the input. */
  percentPerPercent: z.number(),
});
export const sensitivitySchema = z.object({
  of: z.string(),
  entries: z.array(sensitivityEntrySchema),
});

export const bleederOptionSchema = z.object({
  eSeries: z.enum(['E24', 'E96']),
  resistance: z.number(),
  series: z.number().int(),
  parallel: z.number().int(),
  totalResistance: z.number(),
  worstCaseTime: z.number(),
  timeLimit: z.number(),
  powerPerResistor: z.number(),
  powerLimit: z.number(),
  voltagePerResistor: z.number(),
});
export const suggestionSchema = z.discriminatedUnion('found', [
  bleederOptionSchema.extend({
    found: z.literal(true),
    detail: z.string(),
    alternatives: z.array(bleederOptionSchema),
  }),
  z.object({ found: z.literal(false), reason: z.string() }),
]);

export const dischargeResultSchema = z.object({
  engineVersion: z.string(),
  verdict: z.enum(['meets', 'fails', 'incomplete']),
  /** Field paths (e.g. "design.bleeder.resistance") that must be filled before a verdict is possible. */
  missing: z.array(z.string()),
  checks: z.array(checkSchema),
  nominal: networkStateSchema.nullable(),
  worstCase: networkStateSchema.nullable(),
  curve: z.array(curvePointSchema),
  sensitivity: sensitivitySchema.nullable(),
  suggestion: suggestionSchema.nullable(),
});

export type Requirement = z.infer<typeof requirementSchema>;
export type RequirementDraft = z.infer<typeof requirementDraftSchema>;
export type Design = z.infer<typeof designSchema>;
export type DesignDraft = z.infer<typeof designDraftSchema>;
export type Bus = z.infer<typeof busSchema>;
export type Capacitors = z.infer<typeof capacitorsSchema>;
export type Bleeder = z.infer<typeof bleederSchema>;
export type Ambient = z.infer<typeof ambientSchema>;
export type Active = z.infer<typeof activeSchema>;
export type Balancing = z.infer<typeof balancingSchema>;
export type DischargeInput = z.infer<typeof dischargeInputSchema>;
export type Check = z.infer<typeof checkSchema>;
export type NetworkState = z.infer<typeof networkStateSchema>;
export type CurvePoint = z.infer<typeof curvePointSchema>;
export type Sensitivity = z.infer<typeof sensitivitySchema>;
export type BleederOption = z.infer<typeof bleederOptionSchema>;
export type Suggestion = z.infer<typeof suggestionSchema>;
export type DischargeResult = z.infer<typeof dischargeResultSchema>;
export type Verdict = DischargeResult['verdict'];
