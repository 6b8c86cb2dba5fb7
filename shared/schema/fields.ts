// One descriptor per input field: where it sits in the wire format (its zod path), what the form and
// the dossier call it, the name used in sentences (validation messages, the revision diff), its unit
// and how it is typed, and which kind of circuit it belongs to. The zod schemas take their names and
// units from here; the design and requirement forms, the snubber editor, the revision diff and the PDF
// loop over these lists. tests/unit/field-descriptors.test.ts holds them and the schemas in step.
// Adding a field: one descriptor here, its rule in the schema beside it (docs/ARCHITECTURE.md §9).
import type { QuantityUnit } from '../units';

export type FieldKind =
  | { type: 'quantity'; unit: QuantityUnit; allowZero?: boolean; supply?: 'dc' | 'ac' }
  | { type: 'percent' }
  | { type: 'ppm' }
  | { type: 'celsius' }
  | { type: 'count' };

export interface FieldSpec {
  /** Dotted path inside the design (or requirement) JSON, e.g. "bleeder.resistance". */
  path: string;
  /** The name in the form and the dossier, where the group title gives the context ("Tolerance"). */
  label: string;
  /** The name standing alone, in a validation message ("Resistor tolerance"); the label where omitted. */
  noun?: string;
  kind: FieldKind;
  placeholder: string;
  /** May stay empty without making the inputs incomplete. */
  optional?: true;
}

interface FieldGroup {
  key: string;
  title: string;
  fields: FieldSpec[];
  /** The whole group may be left out. */
  optional?: true;
}

export type ActiveMode = 'constant-current' | 'switched-resistor';

/** A field of the active discharge circuit, present in the modes listed. */
interface ActiveFieldSpec extends FieldSpec {
  modes: readonly ActiveMode[];
}

const q = (unit: QuantityUnit, allowZero = false): FieldKind => ({ type: 'quantity', unit, allowZero });
const pct: FieldKind = { type: 'percent' };
const count: FieldKind = { type: 'count' };

export const REQUIREMENT_FIELDS: FieldSpec[] = [
  // No figure in the placeholders: a faint "60 V" reads as a value already chosen, and the limit is the user's.
  { path: 'safeVoltage', label: 'Safe voltage', kind: q('V'), placeholder: 'your limit, in V' },
  { path: 'maxTime', label: 'Time limit', kind: q('s'), placeholder: 'your limit, in s' },
  { path: 'maxEnergy', label: 'Energy limit', kind: q('J'), placeholder: 'in J', optional: true },
  { path: 'maxCharge', label: 'Charge limit', kind: q('C'), placeholder: 'in C', optional: true },
  {
    path: 'fallbackMaxTime',
    label: 'Bleeder-only time limit',
    noun: 'Fallback time limit',
    kind: q('s'),
    placeholder: 'in s',
    optional: true,
  },
  {
    path: 'singleFaultMaxTime',
    label: 'Time limit under a single fault (if longer)',
    noun: 'Single-fault time limit',
    kind: q('s'),
    placeholder: 'same as the time limit',
    optional: true,
  },
];

/** The passive network, present whatever the active circuit. */
export const DESIGN_GROUPS: FieldGroup[] = [
  {
    key: 'bus',
    title: 'DC link',
    fields: [
      { path: 'bus.nominalVoltage', label: 'Nominal bus voltage', kind: q('V'), placeholder: '565 V' },
      { path: 'bus.maxVoltage', label: 'Maximum bus voltage', kind: q('V'), placeholder: '622 V' },
    ],
  },
  {
    key: 'capacitors',
    title: 'Capacitor bank',
    fields: [
      { path: 'capacitors.capacitance', label: 'Capacitance per unit', kind: q('F'), placeholder: '470 µF' },
      { path: 'capacitors.series', label: 'Units in series', noun: 'Capacitors in series', kind: count, placeholder: '1' },
      { path: 'capacitors.parallel', label: 'Strings in parallel', noun: 'Capacitor strings in parallel', kind: count, placeholder: '2' },
      { path: 'capacitors.toleranceMinus', label: 'Tolerance −', noun: 'Capacitance tolerance (−)', kind: pct, placeholder: '20 %' },
      { path: 'capacitors.tolerancePlus', label: 'Tolerance +', noun: 'Capacitance tolerance (+)', kind: pct, placeholder: '20 %' },
      { path: 'capacitors.ageing', label: 'Ageing loss', noun: 'Capacitance ageing loss', kind: pct, placeholder: '10 %', optional: true },
    ],
  },
  {
    key: 'bleeder',
    title: 'Bleeder network',
    fields: [
      { path: 'bleeder.resistance', label: 'Resistance per resistor', kind: q('Ω'), placeholder: '100 kΩ' },
      { path: 'bleeder.series', label: 'Resistors in series', kind: count, placeholder: '2' },
      { path: 'bleeder.parallel', label: 'Strings in parallel', noun: 'Resistor strings in parallel', kind: count, placeholder: '1' },
      { path: 'bleeder.tolerance', label: 'Tolerance', noun: 'Resistor tolerance', kind: pct, placeholder: '1 %' },
      { path: 'bleeder.tcrPpmPerK', label: 'TCR', noun: 'Temperature coefficient', kind: { type: 'ppm' }, placeholder: '100 ppm/K' },
      { path: 'bleeder.drift', label: 'Life drift', noun: 'Resistor life drift', kind: pct, placeholder: '0 %' },
      { path: 'bleeder.powerRating', label: 'Power rating', noun: 'Resistor power rating', kind: q('W'), placeholder: '2 W' },
      { path: 'bleeder.elementVoltage', label: 'Limiting element voltage', kind: q('V'), placeholder: '500 V' },
      {
        path: 'bleeder.derating',
        label: 'Derating (share of rating allowed)',
        noun: 'Power derating (fraction of the rating allowed)',
        kind: pct,
        placeholder: '50 %',
      },
    ],
  },
  {
    key: 'ambient',
    title: 'Ambient',
    fields: [
      { path: 'ambient.min', label: 'Minimum ambient', noun: 'Minimum ambient temperature', kind: { type: 'celsius' }, placeholder: '-25 °C' },
      { path: 'ambient.max', label: 'Maximum ambient', noun: 'Maximum ambient temperature', kind: { type: 'celsius' }, placeholder: '85 °C' },
    ],
  },
  {
    key: 'balancing',
    title: 'Series balancing',
    optional: true,
    fields: [
      {
        path: 'balancing.leakageCurrent',
        label: 'Max capacitor leakage',
        noun: 'Maximum capacitor leakage current',
        kind: q('A'),
        placeholder: '1 mA',
      },
      { path: 'balancing.capacitorVoltageRating', label: 'Capacitor voltage rating', kind: q('V'), placeholder: '450 V' },
    ],
  },
];

const BOTH_MODES: readonly ActiveMode[] = ['constant-current', 'switched-resistor'];

/** The active discharge circuit's fields, each once, in the form's order within every mode. */
export const ACTIVE_FIELD_LIST: ActiveFieldSpec[] = [
  { path: 'active.current', label: 'Discharge current', kind: q('A'), placeholder: '200 mA', modes: ['constant-current'] },
  { path: 'active.resistance', label: 'Discharge resistance', kind: q('Ω'), placeholder: '1.5 kΩ', modes: ['switched-resistor'] },
  { path: 'active.pulseEnergy', label: 'Pulse energy rating', kind: q('J'), placeholder: '100 J', modes: ['switched-resistor'] },
  {
    path: 'active.powerRating',
    label: 'Pulse power rating',
    noun: 'Discharge resistor pulse power rating',
    kind: q('W'),
    placeholder: '250 W',
    optional: true,
    modes: ['switched-resistor'],
  },
  { path: 'active.delay', label: 'Activation delay', kind: q('s', true), placeholder: '100 ms', modes: BOTH_MODES },
];

export const ACTIVE_FIELDS: Record<ActiveMode, ActiveFieldSpec[]> = {
  'constant-current': ACTIVE_FIELD_LIST.filter((f) => f.modes.includes('constant-current')),
  'switched-resistor': ACTIVE_FIELD_LIST.filter((f) => f.modes.includes('switched-resistor')),
};

export const ACTIVE_MODE_WORDS: Record<ActiveMode, string> = {
  'constant-current': 'Constant current',
  'switched-resistor': 'Switched resistor',
};

/** Every design field outside the snubbers, each once, in the order of the design form. */
export const ALL_DESIGN_FIELDS: FieldSpec[] = [...DESIGN_GROUPS.flatMap((g) => g.fields), ...ACTIVE_FIELD_LIST];

const byPath = new Map([
  ...REQUIREMENT_FIELDS.map((f) => [`requirement.${f.path}`, f] as const),
  ...ALL_DESIGN_FIELDS.map((f) => [f.path, f] as const),
]);

/** The descriptor at a design path ("bleeder.tolerance") or a requirement path ("requirement.maxTime"). */
export function fieldAt(path: string): FieldSpec {
  const spec = byPath.get(path);
  if (!spec) throw new Error(`No field descriptor for ${path}`);
  return spec;
}

export const nounOf = (spec: { label: string; noun?: string }): string => spec.noun ?? spec.label;

// ---------------------------------------------------------------------------------------------------
// Snubbers (`design.snubbers[i].<key>`)

export type SnubberKindKey = 'rc' | 'rcd-turnoff' | 'rcd-clamp';
export const SNUBBER_KIND_KEYS: readonly SnubberKindKey[] = ['rc', 'rcd-turnoff', 'rcd-clamp'];
export const SNUBBER_KIND_WORDS: Record<SnubberKindKey, string> = { rc: 'RC', 'rcd-turnoff': 'RCD turn-off', 'rcd-clamp': 'RCD clamp' };

/** Where a snubber field sits in the editor: parts and ratings, the operating point, or its kind's own details. */
type SnubberFieldGroup = 'parts' | 'operating' | 'kind';

export type SnubberNumericKey =
  | 'resistance'
  | 'capacitance'
  | 'capacitanceTolerance'
  | 'capacitorVoltageRating'
  | 'powerRating'
  | 'derating'
  | 'switchingVoltage'
  | 'overshoot'
  | 'switchingFrequency'
  | 'parasiticInductance'
  | 'parasiticCapacitance'
  | 'switchedCurrent'
  | 'fallTime'
  | 'minOnTime'
  | 'leakageInductance'
  | 'peakCurrent'
  | 'reflectedVoltage'
  | 'clampVoltage';

/** A numeric field of one snubber. */
export interface SnubberFieldSpec {
  key: SnubberNumericKey;
  label: string;
  /** The name standing alone, in a validation message or a diff line; the label where omitted. */
  noun?: string;
  kind: SnubberFieldKind;
  placeholder: string;
  group: SnubberFieldGroup;
  kinds: readonly SnubberKindKey[];
}

const ALL_KINDS = SNUBBER_KIND_KEYS;
type SnubberFieldKind = { type: 'quantity'; unit: QuantityUnit } | { type: 'percent' };
const sq = (unit: QuantityUnit): SnubberFieldKind => ({ type: 'quantity', unit });
const sp: SnubberFieldKind = { type: 'percent' };

export const SNUBBER_FIELDS: SnubberFieldSpec[] = [
  { key: 'resistance', label: 'Resistance', kind: sq('Ω'), placeholder: '82 Ω', group: 'parts', kinds: ALL_KINDS },
  { key: 'capacitance', label: 'Capacitance', kind: sq('F'), placeholder: '330 pF', group: 'parts', kinds: ALL_KINDS },
  { key: 'capacitanceTolerance', label: 'Capacitance tolerance', kind: sp, placeholder: '10 %', group: 'parts', kinds: ALL_KINDS },
  { key: 'capacitorVoltageRating', label: 'Capacitor voltage rating', kind: sq('V'), placeholder: '100 V', group: 'parts', kinds: ALL_KINDS },
  { key: 'powerRating', label: 'Resistor power rating', kind: sq('W'), placeholder: '0.5 W', group: 'parts', kinds: ALL_KINDS },
  {
    key: 'derating',
    label: 'Derating (share of rating allowed)',
    noun: 'Derating',
    kind: sp,
    placeholder: '50 %',
    group: 'parts',
    kinds: ALL_KINDS,
  },
  {
    key: 'switchingVoltage',
    label: 'Switching voltage (highest)',
    noun: 'Switching voltage',
    kind: sq('V'),
    placeholder: '48 V',
    group: 'operating',
    kinds: ALL_KINDS,
  },
  { key: 'overshoot', label: 'Overshoot above it', noun: 'Overshoot', kind: sp, placeholder: '30 %', group: 'operating', kinds: ALL_KINDS },
  {
    key: 'switchingFrequency',
    label: 'Switching frequency (highest)',
    noun: 'Switching frequency',
    kind: sq('Hz'),
    placeholder: '250 kHz',
    group: 'operating',
    kinds: ALL_KINDS,
  },
  {
    key: 'parasiticInductance',
    label: 'Loop inductance L_par',
    noun: 'Loop inductance',
    kind: sq('H'),
    placeholder: '633 nH',
    group: 'kind',
    kinds: ['rc'],
  },
  {
    key: 'parasiticCapacitance',
    label: 'Node capacitance C_par',
    noun: 'Node capacitance',
    kind: sq('F'),
    placeholder: '100 pF',
    group: 'kind',
    kinds: ['rc'],
  },
  { key: 'switchedCurrent', label: 'Switched current', kind: sq('A'), placeholder: '10 A', group: 'kind', kinds: ['rcd-turnoff'] },
  { key: 'fallTime', label: 'Current fall time', kind: sq('s'), placeholder: '50 ns', group: 'kind', kinds: ['rcd-turnoff'] },
  { key: 'minOnTime', label: 'Minimum on-time', kind: sq('s'), placeholder: '1 µs', group: 'kind', kinds: ['rcd-turnoff'] },
  { key: 'leakageInductance', label: 'Leakage inductance', kind: sq('H'), placeholder: '5 µH', group: 'kind', kinds: ['rcd-clamp'] },
  { key: 'peakCurrent', label: 'Peak primary current', kind: sq('A'), placeholder: '2 A', group: 'kind', kinds: ['rcd-clamp'] },
  { key: 'reflectedVoltage', label: 'Reflected voltage', kind: sq('V'), placeholder: '100 V', group: 'kind', kinds: ['rcd-clamp'] },
  { key: 'clampVoltage', label: 'Clamp voltage', kind: sq('V'), placeholder: '150 V', group: 'kind', kinds: ['rcd-clamp'] },
];

/** The fields that are not numbers: every kind has them. `prompt` is the form's longer wording where it has one. */
export const SNUBBER_OTHER_FIELDS = {
  kind: { key: 'kind', label: 'Kind' },
  name: { key: 'name', label: 'Name' },
  location: { key: 'location', label: 'Location', prompt: 'Location on the schematic' },
  accessible: {
    key: 'accessible',
    label: 'Reachable after switch-off',
    prompt: 'Capacitor reachable after switch-off (adds it to the stored-energy inventory)',
  },
} as const;

/** The numeric fields of one kind of snubber in one group, in the editor's order. */
export function snubberFieldsOf(kind: SnubberKindKey, group?: SnubberFieldGroup): SnubberFieldSpec[] {
  return SNUBBER_FIELDS.filter((f) => f.kinds.includes(kind) && (!group || f.group === group));
}

export function snubberField(key: SnubberNumericKey): SnubberFieldSpec {
  return SNUBBER_FIELDS.find((f) => f.key === key)!;
}

/** The words for a snubber field of either sort, or undefined for a key no snubber has. */
export function snubberFieldWords(key: string): { label: string; noun?: string; kind?: FieldKind } | undefined {
  return [...SNUBBER_FIELDS, ...Object.values(SNUBBER_OTHER_FIELDS)].find((f) => f.key === key);
}

/** A numeric value of a snubber draft by key, whichever kind it is (undefined where its kind has no such field). */
export function snubberValue(draft: object, key: SnubberNumericKey): number | null | undefined {
  return (draft as Partial<Record<SnubberNumericKey, number | null>>)[key];
}
