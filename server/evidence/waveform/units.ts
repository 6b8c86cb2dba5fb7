// Unit hints as they appear in capture headers and metadata ("Time (ms)", "t[us]", "CH1 (kV)", "mV",
// "Sample rate,100 kS/s"). Only units that change the numbers are recognised: time, voltage, sample rate.

type UnitKind = 'time' | 'voltage' | 'frequency';

export interface Unit {
  kind: UnitKind;
  /** Factor from the exported number to SI base units. */
  scale: number;
  /** The unit as written in the file. */
  text: string;
}

const MICRO = '(?:u|\u00b5|\u03bc)';
// Seconds: the prefix is read case-insensitively because exports write "mS" and "MS" for milliseconds;
// nobody records in megaseconds.
const TIME = new RegExp(`^(k|m|${MICRO}|n|p)?(?:s|sec|secs|second|seconds)$`, 'i');
// Volts: "MV" is left unrecognised (mega or a shouted milli?) so that the user is told rather than guessed for.
const VOLT = new RegExp(`^(k|K|m|${MICRO})?(?:v|V|volt|volts|Volt|Volts)$`);
const FREQUENCY = /^(k|K|M|G)?(?:hz|sa\/s|s\/s|samples?\/s|sps|pts\/s)$/i;

const PREFIX: Record<string, number> = {
  '': 1,
  k: 1e3,
  K: 1e3,
  m: 1e-3,
  M: 1e6,
  G: 1e9,
  u: 1e-6,
  '\u00b5': 1e-6,
  '\u03bc': 1e-6,
  n: 1e-9,
  p: 1e-12,
};

export function parseUnit(raw: string): Unit | null {
  const text = raw.trim();
  if (!text) return null;
  const time = TIME.exec(text);
  if (time) {
    return { kind: 'time', scale: PREFIX[(time[1] ?? '').toLowerCase()] ?? 1, text };
  }
  const volt = VOLT.exec(text);
  if (volt) return { kind: 'voltage', scale: PREFIX[volt[1] ?? ''] ?? 1, text };
  const frequency = FREQUENCY.exec(text);
  if (frequency) {
    return { kind: 'frequency', scale: PREFIX[frequency[1] ?? ''] ?? 1, text };
  }
  return null;
}

export interface HeaderCell {
  /** The cell as written (trimmed), used as the channel's name. */
  label: string;
  /** The label without its unit hint, for matching "time" and channel names. */
  base: string;
  unit: Unit | null;
  /** A bracketed unit hint that was not recognised, so the user can be told it was ignored. */
  unknownUnit: string | null;
}

const BRACKETED = /^(.*?)[\s_]*[([{]\s*([^)\]}]*?)\s*[)\]}]\s*$/;
const SLASHED = /^(.+?)\s*\/\s*([^/\s]+)$/;
const TRAILING = /^(.+?)[\s_]+(\S+)$/;

export function readHeaderCell(raw: string): HeaderCell {
  const label = raw
    .trim()
    .replace(/^"(.*)"$/, '$1')
    .trim();
  const whole = parseUnit(label);
  if (whole) return { label, base: '', unit: whole, unknownUnit: null };
  const bracketed = BRACKETED.exec(label);
  if (bracketed) {
    const unit = parseUnit(bracketed[2]);
    return { label, base: bracketed[1].trim(), unit, unknownUnit: unit ? null : bracketed[2] || null };
  }
  for (const pattern of [SLASHED, TRAILING]) {
    const match = pattern.exec(label);
    const unit = match ? parseUnit(match[2]) : null;
    if (match && unit) return { label, base: match[1].trim(), unit, unknownUnit: null };
  }
  return { label, base: label, unit: null, unknownUnit: null };
}

/** Reads "1E-05", "10 us", "100kS/s", "1,5E-3 s", "2E-3 [s]" (decimal comma when `decimalComma`). */
export function readQuantity(raw: string, decimalComma: boolean): { value: number; unit: Unit | null } | null {
  const text = raw
    .trim()
    .replace(/^"(.*)"$/, '$1')
    .trim();
  const match = /^([+-]?(?:\d+[.,]?\d*|[.,]\d+)(?:[eE][+-]?\d+)?)\s*(.*)$/.exec(text);
  if (!match) return null;
  const number = match[1];
  if (number.includes(',') && !decimalComma) return null;
  const value = Number(number.replace(',', '.'));
  if (!Number.isFinite(value)) return null;
  // The unit may follow bare or in brackets: "1E-04 s", "1E-04 [s]".
  const rest = match[2].trim().replace(/^[([{]\s*(.*?)\s*[)\]}]$/, '$1');
  if (!rest) return { value, unit: null };
  const unit = parseUnit(rest);
  return unit ? { value, unit } : null;
}
