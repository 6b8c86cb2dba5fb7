// Wire format of the switching snubbers in a revision's design and of the sizing helper's input.
// Numbers are SI base units (Ω, F, W, V, Hz, H, A, s); tolerances, derating and overshoot are fractions.
// Bounds reject values no bench or datasheet would give, so a slipped prefix (Hz typed for MHz, F for pF)
// fails on its own field instead of producing a confident but meaningless result.
import { z } from 'zod';
import { formatQuantity } from '../units';
import { nounOf, snubberField, type SnubberKindKey, type SnubberNumericKey } from './fields';

const positive = (what: string, min: number, max: number, unit: string) =>
  z
    .number({ error: `${what} must be a finite number` })
    .refine((v) => v > 0, { error: `${what} must be greater than zero`, abort: true })
    .refine((v) => v >= min && v <= max, {
      error: `${what} must lie between ${formatQuantity(min, unit)} and ${formatQuantity(max, unit)}`,
    });

const fraction = (what: string, max: number) =>
  z
    .number({ error: `${what} must be a finite number` })
    .min(0, { error: `${what} cannot be negative` })
    .max(max, { error: `${what} must be at most ${max} (a fraction, not a percentage)` });

/** Ring and switching frequencies a power stage can show. */
export const FREQUENCY_RANGE = { min: 1e3, max: 1e10 } as const;
/** Capacitances that make sense at a switching node or in a snubber. */
export const CAPACITANCE_RANGE = { min: 1e-14, max: 1e-3 } as const;
/** Allowed multiple of the parasitic capacitance for the suggested snubber capacitor. */
export const MULTIPLE_RANGE = { min: 1, max: 20, default: 3.5 } as const;

const frequency = (what: string) => positive(what, FREQUENCY_RANGE.min, FREQUENCY_RANGE.max, 'Hz');
const capacitance = (what: string) => positive(what, CAPACITANCE_RANGE.min, CAPACITANCE_RANGE.max, 'F');

export type SnubberKind = SnubberKindKey;

/** A positive number named and measured as its descriptor says (shared/schema/fields.ts), within bounds. */
function sized(key: SnubberNumericKey, min: number, max: number) {
  const spec = snubberField(key);
  return positive(nounOf(spec), min, max, spec.kind.type === 'quantity' ? spec.kind.unit : '');
}
const share = (key: SnubberNumericKey, max: number) => fraction(nounOf(snubberField(key)), max);

const base = {
  name: z.string().trim().min(1, { error: 'Give the snubber a name' }).max(120),
  location: z.string().trim().max(500).default(''),
  resistance: sized('resistance', 1e-3, 1e9),
  capacitance: sized('capacitance', CAPACITANCE_RANGE.min, CAPACITANCE_RANGE.max),
  capacitanceTolerance: share('capacitanceTolerance', 0.9),
  powerRating: sized('powerRating', 1e-3, 1e4),
  derating: share('derating', 1).refine((v) => v > 0, {
    error: 'Derating must be greater than zero (the fraction of the rating allowed)',
  }),
  capacitorVoltageRating: sized('capacitorVoltageRating', 1, 1e6),
  switchingVoltage: sized('switchingVoltage', 1e-1, 1e6),
  overshoot: share('overshoot', 10),
  switchingFrequency: sized('switchingFrequency', 1, FREQUENCY_RANGE.max),
  accessible: z.boolean().default(false),
};

export const rcSnubberSchema = z.object({
  ...base,
  kind: z.literal('rc'),
  parasiticInductance: sized('parasiticInductance', 1e-12, 1e-2).nullish(),
  parasiticCapacitance: sized('parasiticCapacitance', CAPACITANCE_RANGE.min, CAPACITANCE_RANGE.max).nullish(),
});

export const rcdTurnoffSnubberSchema = z.object({
  ...base,
  kind: z.literal('rcd-turnoff'),
  switchedCurrent: sized('switchedCurrent', 1e-6, 1e5).nullish(),
  fallTime: sized('fallTime', 1e-12, 1e-2).nullish(),
  minOnTime: sized('minOnTime', 1e-12, 1).nullish(),
});

export const rcdClampSnubberSchema = z
  .object({
    ...base,
    kind: z.literal('rcd-clamp'),
    leakageInductance: sized('leakageInductance', 1e-12, 1e-1).nullish(),
    peakCurrent: sized('peakCurrent', 1e-6, 1e5).nullish(),
    clampVoltage: sized('clampVoltage', 1e-1, 1e6).nullish(),
    reflectedVoltage: sized('reflectedVoltage', 1e-1, 1e6).nullish(),
  })
  .superRefine((s, ctx) => {
    if (s.clampVoltage != null && s.reflectedVoltage != null && s.clampVoltage <= s.reflectedVoltage) {
      ctx.addIssue({
        code: 'custom',
        path: ['clampVoltage'],
        message: 'Clamp voltage must be above the reflected voltage, or the clamp conducts all the time',
      });
    }
  });

/** One snubber in a design (docs/ARCHITECTURE.md §6.3 `design.snubbers[]`). */
export const snubberSchema = z.discriminatedUnion('kind', [rcSnubberSchema, rcdTurnoffSnubberSchema, rcdClampSnubberSchema]);

export type RcSnubber = z.infer<typeof rcSnubberSchema>;
export type RcdTurnoffSnubber = z.infer<typeof rcdTurnoffSnubberSchema>;
export type RcdClampSnubber = z.infer<typeof rcdClampSnubberSchema>;
export type Snubber = z.infer<typeof snubberSchema>;

/** Sizing from a ringing measurement: ring frequency, added capacitance, the lowered ring frequency. */
export const ringingInputSchema = z
  .object({
    f0: frequency('Ring frequency f0'),
    cAdd: capacitance('Added capacitance'),
    f1: frequency('Ring frequency with the added capacitance f1'),
    multiple: z
      .number({ error: 'Multiple must be a number' })
      .min(MULTIPLE_RANGE.min, { error: `Multiple must be at least ${MULTIPLE_RANGE.min}` })
      .max(MULTIPLE_RANGE.max, { error: `Multiple must be at most ${MULTIPLE_RANGE.max}` })
      .default(MULTIPLE_RANGE.default),
    /** Optional operating point for the resistor dissipation estimate C·V²·f_sw. */
    switchingVoltage: positive('Switching voltage', 1e-1, 1e6, 'V').nullish(),
    switchingFrequency: positive('Switching frequency', 1, FREQUENCY_RANGE.max, 'Hz').nullish(),
  })
  .superRefine((r, ctx) => {
    // Adding capacitance can only lower the ring frequency; f1 ≥ f0 means swapped or mistyped readings.
    if (r.f1 >= r.f0) {
      ctx.addIssue({
        code: 'custom',
        path: ['f1'],
        message: 'f1 must be below f0: adding capacitance lowers the ring frequency',
      });
    }
  });

export type RingingInputRaw = z.input<typeof ringingInputSchema>;

/** Every field but the kind optional and nullable; present values keep their rules. */
function draftOf<T extends z.ZodRawShape>(shape: T) {
  const loose = Object.fromEntries(Object.entries(shape).map(([key, field]) => [key, key === 'kind' ? field : (field as z.ZodType).nullish()])) as {
    [K in keyof T]: K extends 'kind' ? T[K] : z.ZodOptional<z.ZodNullable<T[K]>>;
  };
  return z.object(loose);
}

/**
 * A snubber while it is being typed into a draft revision: the kind is known, every other field may
 * still be missing, but what is present must be valid. A draft that passes `snubberSchema` gets its
 * checks; one that does not yet makes the revision's verdict incomplete.
 */
export const snubberDraftSchema = z.discriminatedUnion('kind', [
  draftOf(rcSnubberSchema.shape),
  draftOf(rcdTurnoffSnubberSchema.shape),
  draftOf(rcdClampSnubberSchema.shape),
]);

export type SnubberDraft = z.infer<typeof snubberDraftSchema>;
