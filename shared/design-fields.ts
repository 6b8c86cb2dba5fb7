// One description of every input field (label, unit, how it is typed), used by the design form,
// the revision diff and the PDF so that all three speak the same engineering units.
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
}

export interface FieldGroup {
  key: string;
  title: string;
  fields: FieldSpec[];
}

const q = (unit: QuantityUnit, allowZero = false): FieldKind => ({ type: 'quantity', unit, allowZero });

export const REQUIREMENT_FIELDS: FieldSpec[] = [
  // No figure in the placeholders: a faint "60 V" reads as a value already chosen, and the limit is the user's.
  { path: 'safeVoltage', label: 'Safe voltage', kind: q('V'), placeholder: 'your limit, in V' },
  { path: 'maxTime', label: 'Time limit', kind: q('s'), placeholder: 'your limit, in s' },
  { path: 'maxEnergy', label: 'Energy limit (optional)', kind: q('J'), placeholder: 'in J' },
  { path: 'maxCharge', label: 'Charge limit (optional)', kind: q('C'), placeholder: 'in C' },
  { path: 'fallbackMaxTime', label: 'Bleeder-only time limit (optional)', kind: q('s'), placeholder: 'in s' },
  { path: 'singleFaultMaxTime', label: 'Time limit under a single fault (optional, if longer)', kind: q('s'), placeholder: 'same as the time limit' },
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
      { path: 'capacitors.ageing', label: 'Ageing loss (optional)', kind: { type: 'percent' }, placeholder: '10 %' },
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
    title: 'Series balancing (optional)',
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
    { path: 'active.powerRating', label: 'Pulse power rating (optional)', kind: q('W'), placeholder: '250 W' },
    { path: 'active.delay', label: 'Activation delay', kind: q('s', true), placeholder: '100 ms' },
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

/** A stored SI value shown the way an engineer writes it. */
export function formatField(kind: FieldKind, value: number | null | undefined): string {
  if (value === null || value === undefined) return '—';
  switch (kind.type) {
    case 'quantity':
      return formatQuantity(value, kind.unit);
    case 'percent':
      return formatPercent(value);
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

export function getPath(obj: unknown, path: string): unknown {
  return path.split('.').reduce<unknown>((o, k) => (o && typeof o === 'object' ? (o as Record<string, unknown>)[k] : undefined), obj);
}
