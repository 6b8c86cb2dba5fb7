// What the field descriptors (shared/schema/fields.ts) are used for: a value shown, edited and read
// back in the field's unit, the form's label, and a path in the words of the form. Labels carry no
// "(optional)": forms add it from `optional` (formLabel), the dossier prints the label alone.
import { ALL_DESIGN_FIELDS, DESIGN_GROUPS, REQUIREMENT_FIELDS, SNUBBER_FIELDS, type FieldKind } from './schema/fields';
import { formatPercent, formatQuantity, parseCelsius, parsePercent, parsePpmPerK, parseQuantity, type ParseResult } from './units';

/** The label a form shows: optional fields and groups say so. */
export function formLabel(spec: { label?: string; title?: string; optional?: true }): string {
  const text = spec.label ?? spec.title ?? '';
  return spec.optional ? `${text} (optional)` : text;
}

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
    const spec = SNUBBER_FIELDS.find((f) => f.key === key);
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
