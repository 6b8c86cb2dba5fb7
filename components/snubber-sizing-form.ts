// The snubber sizing screen's form: its fields, the typed texts read into the API's input (units only;
// the server judges ranges and f1 < f0), the server's refusals by field, and a sized input back as texts.
import { ApiError } from '../hooks/api';
import { MULTIPLE_RANGE, type RingingInputRaw } from '../shared/schema/snubber';
import { formatQuantity, parseQuantity, type ParseResult, type QuantityUnit } from '../shared/units';

export type FieldName = 'f0' | 'cAdd' | 'f1' | 'multiple' | 'switchingVoltage' | 'switchingFrequency';
export type Texts = Record<FieldName, string>;

export interface FieldSpec {
  name: FieldName;
  label: string;
  placeholder: string;
  hint?: string;
  unit?: QuantityUnit;
}

export const MEASUREMENT: FieldSpec[] = [
  { name: 'f0', label: 'Ring frequency f0 (bare node)', placeholder: '20 MHz', unit: 'Hz' },
  { name: 'cAdd', label: 'Added capacitance C_add', placeholder: '300 pF', unit: 'F' },
  { name: 'f1', label: 'Ring frequency f1 (with C_add)', placeholder: '10 MHz', unit: 'Hz' },
  {
    name: 'multiple',
    label: 'Snubber C as a multiple of C_par',
    placeholder: String(MULTIPLE_RANGE.default),
    hint: 'Common practice 3–4×',
  },
];

export const OPERATING: FieldSpec[] = [
  { name: 'switchingVoltage', label: 'Switching voltage (optional)', placeholder: '48 V', unit: 'V' },
  { name: 'switchingFrequency', label: 'Switching frequency (optional)', placeholder: '250 kHz', unit: 'Hz' },
];

export const EMPTY: Texts = { f0: '', cAdd: '', f1: '', multiple: String(MULTIPLE_RANGE.default), switchingVoltage: '', switchingFrequency: '' };

function parseMultiple(text: string): ParseResult {
  const m = /^(\d+(?:[.,]\d+)?)\s*[×xX]?$/.exec(text.trim());
  return m ? { ok: true, value: Number(m[1].replace(',', '.')) } : { ok: false, error: `“${text.trim()}” is not a number — write e.g. “3.5”` };
}

/** Typed text → the API input; only the units are read here, the server judges ranges and f1 < f0. */
export function readForm(texts: Texts): { input: RingingInputRaw | null; errors: Partial<Record<FieldName, string>> } {
  const errors: Partial<Record<FieldName, string>> = {};
  const values: Partial<Record<FieldName, number>> = {};
  for (const spec of [...MEASUREMENT, ...OPERATING]) {
    const text = texts[spec.name].trim();
    if (text === '') continue;
    const parsed = spec.unit ? parseQuantity(text, spec.unit) : parseMultiple(text);
    if (parsed.ok) values[spec.name] = parsed.value;
    else errors[spec.name] = parsed.error;
  }
  // An emptied multiple falls back to the default, as the server would.
  const { f0, cAdd, f1, multiple = MULTIPLE_RANGE.default, switchingVoltage = null, switchingFrequency = null } = values;
  if (f0 === undefined || cAdd === undefined || f1 === undefined || Object.keys(errors).length > 0) {
    return { input: null, errors };
  }
  return { input: { f0, cAdd, f1, multiple, switchingVoltage, switchingFrequency }, errors };
}

export function serverFieldErrors(error: Error | null): Partial<Record<FieldName, string>> {
  if (!(error instanceof ApiError)) return {};
  return Object.fromEntries(error.fields.map((f) => [f.path, f.message]));
}

/** A sized input as the texts of the form, for going back to it. */
export function textsOf(input: RingingInputRaw): Texts {
  const q = (value: number | null | undefined, unit: QuantityUnit) => (value === null || value === undefined ? '' : formatQuantity(value, unit, 4));
  return {
    f0: q(input.f0, 'Hz'),
    cAdd: q(input.cAdd, 'F'),
    f1: q(input.f1, 'Hz'),
    multiple: String(input.multiple),
    switchingVoltage: q(input.switchingVoltage, 'V'),
    switchingFrequency: q(input.switchingFrequency, 'Hz'),
  };
}
