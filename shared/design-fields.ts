// One description of every input field (label, unit, how it is typed), used by the design form,
// the revision diff and the PDF so that all three speak the same engineering units. Labels carry no
// "(optional)": forms add it from `optional` (formLabel), the dossier prints the label alone.
import { formatPercent, formatQuantity, parseCelsius, parsePercent, parsePpmPerK, parseQuantity, type ParseResult, type QuantityUnit } from './units';

export type FieldKind =
  | { type: 'quantity'; unit: QuantityUnit; allowZero?: boolean; supply?: 'dc' | 'ac' }
  | { type: 'percent' }
  | { type: 'ppm' }
  | { type: 'celsius' }
  | { type: 'count' };

export interface FieldSpec {
  /** Dotted path inside the design (or requirement) JSON, e.g. "bleeder.resistance". */
  path: string;
  label: string;
  kind: FieldKind;
  placeholder: string;
  /** May stay empty without making the inputs incomplete. */
  optional?: true;
}

export interface FieldGroup {
  key: string;
  title: string;
  fields: FieldSpec[];
  /** The whole group may be left out. */
  optional?: true;
}

/** The label a form shows: optional fields and groups say so. */
export function formLabel(spec: { label?: string; title?: string; optional?: true }): string {
  const text = spec.label ?? spec.title ?? '';
  return spec.optional ? `${text} (optional)` : text;
}

const q = (unit: QuantityUnit, allowZero = false): FieldKind => ({ type: 'quantity', unit, allowZero });

export const REQUIREMENT_FIELDS: FieldSpec[] = [
  // No figure in the placeholders: a faint "60 V" reads as a value already chosen, and the limit is the user's.
  { path: 'safeVoltage', label: 'Safe voltage', kind: q('V'), placeholder: 'your limit, in V' },
  { path: 'maxTime', label: 'Time limit', kind: q('s'), placeholder: 'your limit, in s' },
  { path: 'maxEnergy', label: 'Energy limit', kind: q('J'), placeholder: 'in J', optional: true },
  { path: 'maxCharge', label: 'Charge limit', kind: q('C'), placeholder: 'in C', optional: true },
  { path: 'fallbackMaxTime', label: 'Bleeder-only time limit', kind: q('s'), placeholder: 'in s', optional: true },
  {
    path: 'singleFaultMaxTime',
    label: 'Time limit under a single fault (if longer)',
    kind: q('s'),
    placeholder: 'same as the time limit',
    optional: true,
  },
];

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
      { path: 'capacitors.series', label: 'Units in series', kind: { type: 'count' }, placeholder: '1' },
      { path: 'capacitors.parallel', label: 'Strings in parallel', kind: { type: 'count' }, placeholder: '2' },
      { path: 'capacitors.toleranceMinus', label: 'Tolerance −', kind: { type: 'percent' }, placeholder: '20 %' },
      { path: 'capacitors.tolerancePlus', label: 'Tolerance +', kind: { type: 'percent' }, placeholder: '20 %' },
      { path: 'capacitors.ageing', label: 'Ageing loss', kind: { type: 'percent' }, placeholder: '10 %', optional: true },
    ],
  },
  {
    key: 'bleeder',
    title: 'Bleeder network',
    fields: [
      { path: 'bleeder.resistance', label: 'Resistance per resistor', kind: q('Ω'), placeholder: '100 kΩ' },
      { path: 'bleeder.series', label: 'Resistors in series', kind: { type: 'count' }, placeholder: '2' },
      { path: 'bleeder.parallel', label: 'Strings in parallel', kind: { type: 'count' }, placeholder: '1' },
      { path: 'bleeder.tolerance', label: 'Tolerance', kind: { type: 'percent' }, placeholder: '1 %' },
      { path: 'bleeder.tcrPpmPerK', label: 'TCR', kind: { type: 'ppm' }, placeholder: '100 ppm/K' },
      { path: 'bleeder.drift', label: 'Life drift', kind: { type: 'percent' }, placeholder: '0 %' },
      { path: 'bleeder.powerRating', label: 'Power rating', kind: q('W'), placeholder: '2 W' },
      { path: 'bleeder.elementVoltage', label: 'Limiting element voltage', kind: q('V'), placeholder: '500 V' },
      { path: 'bleeder.derating', label: 'Derating (share of rating allowed)', kind: { type: 'percent' }, placeholder: '50 %' },
    ],
  },
  {
    key: 'ambient',
    title: 'Ambient',
    fields: [
      { path: 'ambient.min', label: 'Minimum ambient', kind: { type: 'celsius' }, placeholder: '-25 °C' },
      { path: 'ambient.max', label: 'Maximum ambient', kind: { type: 'celsius' }, placeholder: '85 °C' },
    ],
  },
  {
    key: 'balancing',
    title: 'Series balancing',
    optional: true,
    fields: [
      { path: 'balancing.leakageCurrent', label: 'Max capacitor leakage', kind: q('A'), placeholder: '1 mA' },
      { path: 'balancing.capacitorVoltageRating', label: 'Capacitor voltage rating', kind: q('V'), placeholder: '450 V' },
    ],
  },
];

export const ACTIVE_FIELDS: Record<'constant-current' | 'switched-resistor', FieldSpec[]> = {
  'constant-current': [
    { path: 'active.current', label: 'Discharge current', kind: q('A'), placeholder: '200 mA' },
    { path: 'active.delay', label: 'Activation delay', kind: q('s', true), placeholder: '100 ms' },
  ],
  'switched-resistor': [
    { path: 'active.resistance', label: 'Discharge resistance', kind: q('Ω'), placeholder: '1.5 kΩ' },
    { path: 'active.pulseEnergy', label: 'Pulse energy rating', kind: q('J'), placeholder: '100 J' },
    { path: 'active.powerRating', label: 'Pulse power rating', kind: q('W'), placeholder: '250 W', optional: true },
    { path: 'active.delay', label: 'Activation delay', kind: q('s', true), placeholder: '100 ms' },
  ],
};

export const ACTIVE_MODE_WORDS: Record<'constant-current' | 'switched-resistor', string> = {
  'constant-current': 'Constant current',
  'switched-resistor': 'Switched resistor',
};

/** A numeric field of one snubber (`design.snubbers[i].<key>`). */
export interface SnubberFieldSpec {
  key: SnubberNumericKey;
  label: string;
  kind: FieldKind;
  placeholder: string;
}

export type SnubberKindKey = 'rc' | 'rcd-turnoff' | 'rcd-clamp';
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

const pct: FieldKind = { type: 'percent' };

export const SNUBBER_KIND_WORDS: Record<SnubberKindKey, string> = { rc: 'RC', 'rcd-turnoff': 'RCD turn-off', 'rcd-clamp': 'RCD clamp' };

export const SNUBBER_PART_FIELDS: SnubberFieldSpec[] = [
  { key: 'resistance', label: 'Resistance', kind: q('Ω'), placeholder: '82 Ω' },
  { key: 'capacitance', label: 'Capacitance', kind: q('F'), placeholder: '330 pF' },
  { key: 'capacitanceTolerance', label: 'Capacitance tolerance', kind: pct, placeholder: '10 %' },
  { key: 'capacitorVoltageRating', label: 'Capacitor voltage rating', kind: q('V'), placeholder: '100 V' },
  { key: 'powerRating', label: 'Resistor power rating', kind: q('W'), placeholder: '0.5 W' },
  { key: 'derating', label: 'Derating (share of rating allowed)', kind: pct, placeholder: '50 %' },
];

export const SNUBBER_OPERATING_FIELDS: SnubberFieldSpec[] = [
  { key: 'switchingVoltage', label: 'Switching voltage (highest)', kind: q('V'), placeholder: '48 V' },
  { key: 'overshoot', label: 'Overshoot above it', kind: pct, placeholder: '30 %' },
  { key: 'switchingFrequency', label: 'Switching frequency (highest)', kind: q('Hz'), placeholder: '250 kHz' },
];

/** The fields only one kind of snubber has. */
export const SNUBBER_KIND_FIELDS: Record<SnubberKindKey, SnubberFieldSpec[]> = {
  rc: [
    { key: 'parasiticInductance', label: 'Loop inductance L_par', kind: q('H'), placeholder: '633 nH' },
    { key: 'parasiticCapacitance', label: 'Node capacitance C_par', kind: q('F'), placeholder: '100 pF' },
  ],
  'rcd-turnoff': [
    { key: 'switchedCurrent', label: 'Switched current', kind: q('A'), placeholder: '10 A' },
    { key: 'fallTime', label: 'Current fall time', kind: q('s'), placeholder: '50 ns' },
    { key: 'minOnTime', label: 'Minimum on-time', kind: q('s'), placeholder: '1 µs' },
  ],
  'rcd-clamp': [
    { key: 'leakageInductance', label: 'Leakage inductance', kind: q('H'), placeholder: '5 µH' },
    { key: 'peakCurrent', label: 'Peak primary current', kind: q('A'), placeholder: '2 A' },
    { key: 'reflectedVoltage', label: 'Reflected voltage', kind: q('V'), placeholder: '100 V' },
    { key: 'clampVoltage', label: 'Clamp voltage', kind: q('V'), placeholder: '150 V' },
  ],
};

export const ALL_DESIGN_FIELDS: FieldSpec[] = [
  ...DESIGN_GROUPS.flatMap((g) => g.fields),
  ...ACTIVE_FIELDS['switched-resistor'],
  ...ACTIVE_FIELDS['constant-current'].filter((f) => f.path !== 'active.delay'),
];

export function fieldUnitLabel(kind: FieldKind): string {
  switch (kind.type) {
    case 'quantity':
      return kind.unit;
    case 'percent':
      return '%';
    case 'ppm':
      return 'ppm/K';
    case 'celsius':
      return '°C';
    case 'count':
      return '';
  }
}

/** A stored SI value shown the way an engineer writes it (`digits` significant digits for quantities and percentages). */
export function formatField(kind: FieldKind, value: number | null | undefined, digits = 3): string {
  if (value === null || value === undefined) return '—';
  switch (kind.type) {
    case 'quantity':
      return formatQuantity(value, kind.unit, digits);
    case 'percent':
      return formatPercent(value, digits);
    case 'ppm':
      return `${Number(value.toPrecision(4))} ppm/K`;
    case 'celsius':
      return `${Number(value.toPrecision(4))} °C`;
    case 'count':
      return String(value);
  }
}

/** The same value as editable text (no thousands separators, prefix kept). */
export function fieldText(kind: FieldKind, value: number | null | undefined): string {
  return value === null || value === undefined ? '' : formatField(kind, value);
}

/** Text typed into a field → SI value, or a sentence saying what is wrong. */
export function parseField(kind: FieldKind, text: string): ParseResult {
  const s = text.trim();
  switch (kind.type) {
    case 'quantity':
      return parseQuantity(s, kind.unit, { allowZero: kind.allowZero, supply: kind.supply });
    case 'percent':
      return parsePercent(s);
    case 'ppm':
      return parsePpmPerK(s);
    case 'celsius':
      return parseCelsius(s);
    case 'count': {
      const n = Number(s);
      return Number.isInteger(n) && n >= 1 ? { ok: true, value: n } : { ok: false, error: 'Enter a whole number, 1 or more' };
    }
  }
}

/** A missing input's path ("design.bleeder.tolerance") in the words of the form ("Bleeder network: Tolerance"). */
export function inputLabel(path: string): string {
  const [root, ...rest] = path.split('.');
  const inner = rest.join('.');
  if (root === 'requirement') {
    const spec = REQUIREMENT_FIELDS.find((f) => f.path === inner);
    if (spec) return `Requirement: ${spec.label}`;
    return inner ? `Requirement: ${inner}` : 'Requirement';
  }
  if (inner === 'active' || inner.startsWith('active.')) {
    const spec = ALL_DESIGN_FIELDS.find((f) => f.path === inner);
    return spec ? `Active discharge: ${spec.label}` : 'Active discharge';
  }
  const snubber = /^snubbers(?:\[(\d+)]|\.(\d+))\.(\w+)$/.exec(inner);
  if (snubber) {
    const [, bracketed, dotted, key] = snubber;
    const spec = [...SNUBBER_PART_FIELDS, ...SNUBBER_OPERATING_FIELDS, ...Object.values(SNUBBER_KIND_FIELDS).flat()].find((f) => f.key === key);
    return `Snubber #${Number(bracketed ?? dotted) + 1}: ${spec ? spec.label : key}`;
  }
  const group = DESIGN_GROUPS.find((g) => inner === g.key || inner.startsWith(`${g.key}.`));
  if (!group) return path;
  if (inner === group.key) return `${group.title} (every field)`;
  const spec = group.fields.find((f) => f.path === inner);
  return `${group.title}: ${spec ? spec.label : inner.slice(group.key.length + 1)}`;
}

export function getPath(obj: unknown, path: string): unknown {
  return path.split('.').reduce<unknown>((o, k) => (o && typeof o === 'object' ? (o as Record<string, unknown>)[k] : undefined), obj);
}
