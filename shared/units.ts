// Engineers' quantity notation in and out: "470u", "470 µF", "2k2", "4R7", "4.7 MΩ", "4.7Meg",
// "800 VDC", "100 ms", "2 min". The common electronics forms (SI prefix letter, resistor RKM code,
// SPICE "meg", a DC/AC mark after volts) are read here because mathjs does not know them; any other
// unit expression ("2 min", "1 h", "5 kWh") goes to mathjs, which also converts it to the SI base unit.
// Text that an engineer could mean two ways ("2,200u": 2200 µF or 2.2 µF; "5 m": 5 ms or 5 min) is
// refused with both readings, never guessed: a value read the wrong way can turn a failing design
// into a passing one.
import { unit as mathUnit } from 'mathjs';

export type QuantityUnit = 'F' | 'Ω' | 'V' | 'W' | 's' | 'A' | 'J' | 'C' | 'Hz' | 'H' | 'K';

export type ParseResult = { ok: true; value: number } | { ok: false; error: string };

interface ParseOptions {
  /** Accept 0 (e.g. a delay or a drift). Default false: most quantities here must be positive. */
  allowZero?: boolean;
  /** Accept negative values (temperatures, TCR). Default false. */
  allowNegative?: boolean;
  /**
   * For voltages: whether the field holds a DC value (default: bus, safe voltage, ratings) or an AC
   * RMS value (mains). A "DC" or "AC"/"rms" mark after the volts must agree with it.
   */
  supply?: 'dc' | 'ac';
}

const QUANTITY_NAME: Record<QuantityUnit, string> = {
  F: 'capacitance',
  Ω: 'resistance',
  V: 'voltage',
  W: 'power',
  s: 'time',
  A: 'current',
  J: 'energy',
  C: 'charge',
  Hz: 'frequency',
  H: 'inductance',
  K: 'temperature',
};

/** Unit spellings accepted after the number (and its prefix) for each quantity. */
const UNIT_ALIASES: Record<QuantityUnit, readonly string[]> = {
  F: ['F', 'farad', 'farads'],
  Ω: ['Ω', 'ohm', 'ohms', 'Ohm', 'Ohms'],
  V: ['V', 'volt', 'volts'],
  W: ['W', 'watt', 'watts'],
  s: ['s', 'sec', 'secs', 'second', 'seconds'],
  A: ['A', 'amp', 'amps', 'ampere', 'amperes'],
  J: ['J', 'joule', 'joules'],
  C: ['C', 'coulomb', 'coulombs'],
  Hz: ['Hz', 'hz', 'hertz'],
  H: ['H', 'henry', 'henries', 'henrys'],
  K: ['K', 'kelvin'],
};

/** mathjs name of each SI base (or coherent derived) unit, for conversions. */
const MATHJS_UNIT: Record<QuantityUnit, string> = {
  F: 'F',
  Ω: 'ohm',
  V: 'V',
  W: 'W',
  s: 's',
  A: 'A',
  J: 'J',
  C: 'C',
  Hz: 'Hz',
  H: 'H',
  K: 'K',
};

const PREFIX: Record<string, number> = {
  f: 1e-15,
  p: 1e-12,
  n: 1e-9,
  u: 1e-6,
  m: 1e-3,
  k: 1e3,
  M: 1e6,
  G: 1e9,
  T: 1e12,
};

const EXAMPLE: Record<QuantityUnit, string> = {
  F: '“470 µF” or “470u”',
  Ω: '“2.2 kΩ”, “2k2” or “4.7 MΩ”',
  V: '“622 V” or “1.2 kV”',
  W: '“0.5 W” or “500 mW”',
  s: '“100 ms” or “5 s”',
  A: '“200 mA”',
  J: '“0.2 J”',
  C: '“45 µC”',
  Hz: '“250 kHz”',
  H: '“633 nH”',
  K: '“300 K”',
};

function normalise(text: string): string {
  return text
    .trim()
    .replace(/[µμ]/g, 'u')
    .replace(/\u2126/g, 'Ω')
    .replace(/\u2212/g, '-')
    .replace(/,(?=\d)/g, '.')
    .replace(/(\d|\s)[Mm][Ee][Gg]/g, '$1M');
}

/** A number as an engineer writes it back: "2.200" → "2.2", "2200" → "2200". */
function plainNumber(digits: string): string | null {
  const value = Number(digits);
  return digits !== '' && Number.isFinite(value) ? String(value) : null;
}

/**
 * Refuses a number whose decimal mark cannot be told from a thousands separator: a comma followed by
 * exactly three digits ("2,200"), several commas ("1,000,000"), or "." and "," in one number
 * ("1,234.5"). A comma that can only be a decimal comma ("2,2", "4,7", "2,2000") is fine. The message
 * offers each reading, written without separators. A dot is always the decimal mark, so several dots
 * ("1.2.3") are no number at all.
 */
function decimalMarkProblem(text: string): string | null {
  const shown = text.trim();
  for (const match of shown.matchAll(/[\d.,]*\d[\d.,]*/g)) {
    const run = match[0];
    const commas = run.split(',').length - 1;
    const dots = run.split('.').length - 1;
    if (commas === 0 && dots > 1) return `“${shown}” is not a number: write it with one decimal point and no thousands separators`;
    if (commas === 0) continue;
    const mixed = dots > 0;
    if (!mixed && commas === 1 && !/,\d{3}(?!\d)/.test(run)) continue;
    // The two readings: the comma as a thousands separator, or as the decimal mark (dots then grouping).
    const asThousands = dots <= 1 ? plainNumber(run.replace(/,/g, '')) : null;
    const asDecimal = commas === 1 ? plainNumber(run.replace(/\./g, '').replace(',', '.')) : null;
    const readings = [...new Set([asThousands, asDecimal].filter((r): r is string => r !== null))].map(
      (r) => shown.slice(0, match.index) + r + shown.slice(match.index + run.length),
    );
    if (readings.length === 0) return `“${shown}” is not a number: write it with one decimal point and no thousands separators`;
    return readings.length === 1
      ? `“${shown}” has thousands separators: write ${readings[0]}`
      : `${shown} can be read two ways: write ${readings[0]} or ${readings[1]}`;
  }
  return null;
}

/**
 * Suffixes that mean different things to different engineers, with the readings offered instead:
 * SPICE reads "m" as milli, where many write it for mega (and "meg" exists for that reason); a bare
 * "m" after a time is milli or minutes; "mf"/"MFD" on older parts and drawings meant microfarads.
 */
const AMBIGUOUS_SUFFIX: Partial<Record<QuantityUnit, Record<string, readonly [string, string]>>> = {
  Ω: { m: ['mΩ', 'MΩ'] },
  s: { m: ['ms', 'min'] },
  F: { mf: ['mF', 'µF'], Mf: ['mF', 'µF'], MF: ['mF', 'µF'], mfd: ['mF', 'µF'], MFD: ['mF', 'µF'], Mfd: ['mF', 'µF'] },
};

function ambiguousSuffix(shown: string, number: string, suffix: string, unit: QuantityUnit): string | null {
  const readings = AMBIGUOUS_SUFFIX[unit]?.[suffix];
  return readings ? `${shown} can be read two ways: write ${number} ${readings[0]} or ${number} ${readings[1]}` : null;
}

/** "800 VDC", "60 V DC", "230 VAC", "230 Vrms": the volts without the mark, and which supply it names. */
function supplyMark(s: string): { rest: string; supply: 'dc' | 'ac' } | null {
  const m = /^(.*V)\s*(d\.?c\.?|a\.?c\.?|rms)$/i.exec(s);
  if (!m) return null;
  return { rest: m[1], supply: m[2].toLowerCase().startsWith('d') ? 'dc' : 'ac' };
}

/** Prefix multiplier for a unit-less or prefixed suffix; `K` is read as kilo only where it cannot mean kelvin. */
function prefixValue(letter: string, unit: QuantityUnit): number | undefined {
  if (letter === '') return 1;
  if (letter === 'K' && unit !== 'K') return 1e3;
  if (letter === 'R' && unit === 'Ω') return 1;
  return PREFIX[letter];
}

/** Splits "k", "kΩ", "uF", "F", "ohm" into a prefix multiplier, or undefined when it is not this unit. */
function readSuffix(suffix: string, unit: QuantityUnit): number | undefined {
  const aliases = UNIT_ALIASES[unit];
  if (aliases.includes(suffix)) return 1;
  for (const alias of aliases) {
    if (suffix.endsWith(alias) && suffix.length === alias.length + 1) {
      const multiplier = prefixValue(suffix[0], unit);
      if (multiplier !== undefined) return multiplier;
    }
  }
  if (suffix.length <= 1) return prefixValue(suffix, unit);
  // "470uf": a lower-case farad after a prefix letter (a bare "f" stays femto).
  if (unit === 'F' && suffix.length === 2 && suffix[1] === 'f') return prefixValue(suffix[0], unit);
  return undefined;
}

const NUMBER = String.raw`[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?`;
const PLAIN = new RegExp(`^(${NUMBER})\\s*(\\S*)$`);
// Resistor and capacitor codes per IEC 60062: the prefix letter stands for the decimal point ("2k2", "4R7").
const RKM = /^([+-]?)(\d+)([fpnumkKMGTR])(\d+)\s*(\S*)$/;

function parseRaw(text: string, unit: QuantityUnit, supply: 'dc' | 'ac'): ParseResult {
  const name = QUANTITY_NAME[unit];
  if (text.trim() === '') return { ok: false, error: `Enter a ${name}, e.g. ${EXAMPLE[unit]}` };
  const marks = decimalMarkProblem(text);
  if (marks) return { ok: false, error: marks };
  let s = normalise(text);

  const mark = unit === 'V' ? supplyMark(s) : null;
  if (mark) {
    if (mark.supply !== supply) {
      return {
        ok: false,
        error:
          supply === 'dc'
            ? `“${text.trim()}” is an AC voltage; this field takes a DC voltage (rectified mains peaks at √2 × V rms)`
            : `“${text.trim()}” is a DC voltage; this field takes an AC (RMS) voltage`,
      };
    }
    s = mark.rest;
  }

  const rkm = RKM.exec(s);
  if (rkm) {
    const [, sign, whole, letter, decimals, tail] = rkm;
    const number = `${sign}${whole}.${decimals}`;
    const ambiguous = tail === '' ? ambiguousSuffix(text.trim(), number, letter, unit) : null;
    if (ambiguous) return { ok: false, error: ambiguous };
    const multiplier = prefixValue(letter, unit);
    const tailOk = tail === '' || UNIT_ALIASES[unit].includes(tail);
    if (multiplier !== undefined && tailOk) {
      return { ok: true, value: Number(number) * multiplier };
    }
  }

  const plain = PLAIN.exec(s);
  if (plain) {
    const ambiguous = ambiguousSuffix(text.trim(), plain[1], plain[2], unit);
    if (ambiguous) return { ok: false, error: ambiguous };
    const multiplier = readSuffix(plain[2], unit);
    if (multiplier !== undefined) return { ok: true, value: Number(plain[1]) * multiplier };
  }

  try {
    const parsed = mathUnit(s.replace(/Ω/g, 'ohm'));
    if (parsed.value === null) return { ok: false, error: `“${text.trim()}” has no number — enter e.g. ${EXAMPLE[unit]}` };
    const base = mathUnit(`1 ${MATHJS_UNIT[unit]}`);
    if (!parsed.equalBase(base)) {
      return { ok: false, error: `“${text.trim()}” is not a ${name} — expected ${unit}, e.g. ${EXAMPLE[unit]}` };
    }
    return { ok: true, value: parsed.toNumber(MATHJS_UNIT[unit]) };
  } catch {
    const word = plain?.[2];
    return {
      ok: false,
      error: word
        ? `“${word}” is not a unit of ${name} — expected ${unit}, e.g. ${EXAMPLE[unit]}`
        : `“${text.trim()}” is not a number — enter a ${name}, e.g. ${EXAMPLE[unit]}`,
    };
  }
}

/** Reads a value typed by an engineer and returns it in the SI base unit `unit`. */
export function parseQuantity(text: string, unit: QuantityUnit, options: ParseOptions = {}): ParseResult {
  const result = parseRaw(text, unit, options.supply ?? 'dc');
  if (!result.ok) return result;
  const name = QUANTITY_NAME[unit];
  const capitalised = name[0].toUpperCase() + name.slice(1);
  if (!Number.isFinite(result.value)) return { ok: false, error: `${capitalised} must be a finite number` };
  if (result.value < 0 && !options.allowNegative) return { ok: false, error: `${capitalised} must be positive` };
  if (result.value === 0 && !options.allowZero && !options.allowNegative) {
    return { ok: false, error: `${capitalised} must be greater than zero` };
  }
  return result;
}

/** Reads a tolerance or derating: "1 %" or "1%" → 0.01; a bare number is already a fraction ("0.01"). */
export function parsePercent(text: string): ParseResult {
  const marks = decimalMarkProblem(text);
  if (marks) return { ok: false, error: marks };
  const s = normalise(text);
  const m = new RegExp(`^(${NUMBER})\\s*(%?)$`).exec(s);
  if (!m) return { ok: false, error: `“${text.trim()}” is not a fraction — write “1 %” or “0.01”` };
  const value = m[2] ? Number(m[1]) / 100 : Number(m[1]);
  if (value < 0) return { ok: false, error: 'A tolerance or fraction cannot be negative' };
  return { ok: true, value };
}

/** Reads a temperature coefficient in ppm/K: "100 ppm/K", "100 ppm/°C", "100", "1e-4/K" → 100. */
export function parsePpmPerK(text: string): ParseResult {
  const marks = decimalMarkProblem(text);
  if (marks) return { ok: false, error: marks };
  const s = normalise(text).replace(/\s+/g, '');
  const m = new RegExp(`^(${NUMBER})(ppm)?(/(K|°C|C|degC))?$`, 'i').exec(s);
  if (!m) return { ok: false, error: `“${text.trim()}” is not a temperature coefficient — write e.g. “100 ppm/K”` };
  const n = Number(m[1]);
  // A per-kelvin fraction without "ppm" (1e-4/K) is the same coefficient written in SI.
  const value = !m[2] && m[3] ? n * 1e6 : n;
  return { ok: true, value };
}

/** Reads a temperature in °C: "85", "85 °C", "-25 C", "−25 °C". */
export function parseCelsius(text: string): ParseResult {
  const marks = decimalMarkProblem(text);
  if (marks) return { ok: false, error: marks };
  const m = new RegExp(`^(${NUMBER})\\s*(?:°?\\s*C)?$`, 'i').exec(normalise(text));
  return m ? { ok: true, value: Number(m[1]) } : { ok: false, error: `“${text.trim()}” is not a temperature — write e.g. “85 °C”` };
}

const FORMAT_PREFIXES: readonly [number, string][] = [
  [1e12, 'T'],
  [1e9, 'G'],
  [1e6, 'M'],
  [1e3, 'k'],
  [1, ''],
  [1e-3, 'm'],
  [1e-6, 'µ'],
  [1e-9, 'n'],
  [1e-12, 'p'],
  [1e-15, 'f'],
];

function trimmed(value: number, digits: number): string {
  return String(Number(value.toPrecision(digits)));
}

/** Engineering notation with an SI prefix: 4.7e-4 F → "470 µF", 2200 Ω → "2.2 kΩ". */
export function formatQuantity(value: number, unit: QuantityUnit | string, digits = 3): string {
  if (!Number.isFinite(value)) return `${value} ${unit}`;
  if (value === 0) return `0 ${unit}`;
  const magnitude = Math.abs(value);
  // Seconds above one and temperatures read better without prefixes ("112 s", not "0.112 ks").
  if ((unit === 's' && magnitude >= 1) || unit === 'K' || unit === '°C') return `${trimmed(value, digits)} ${unit}`;
  for (const [scale, prefix] of FORMAT_PREFIXES) {
    // Below one half no rounding reaches 1: skip the prefix without formatting it.
    if (magnitude / scale < 0.5 && scale !== 1e-15) continue;
    const mantissa = Number((value / scale).toPrecision(digits));
    if (Math.abs(mantissa) >= 1 || scale === 1e-15) return `${trimmed(mantissa, digits)} ${prefix}${unit}`;
  }
  return `${trimmed(value, digits)} ${unit}`;
}

/** A fraction as a percentage: 0.01 → "1 %". */
export function formatPercent(fraction: number, digits = 3): string {
  return `${trimmed(fraction * 100, digits)} %`;
}
