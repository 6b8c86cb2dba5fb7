// How numbers, times and sizes read in the dossier: engineering units, UTC timestamps, no float noise.
import { formatPercent, formatQuantity } from '../../shared/units';
import type { Timestamp } from './model';

// Units that take SI prefixes; others (°C, ppm/K, counts, "%") print as they are.
const PREFIXABLE = new Set(['V', 'A', 'F', 'Ω', 'W', 'J', 'C', 's', 'H', 'Hz']);

/**
 * A value in engineering notation with its unit, e.g. 4.7e-4 F → "470 µF"; null → "—". Four significant
 * digits, one more than the app shows, because an assessor may recompute from the printed inputs.
 */
export function quantity(value: number | null | undefined, unit: string, digits = 4): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  if (!PREFIXABLE.has(unit)) return `${plain(value, digits)}${unit ? ` ${unit}` : ''}`;
  return formatQuantity(value, unit, digits);
}

/** Significant digits without trailing zeros or float noise. */
export function plain(value: number, digits = 4): string {
  return String(Number(value.toPrecision(digits)));
}

/** A fraction as a percentage: 0.0125 → "1.25 %". */
export function percent(fraction: number | null | undefined, digits = 3): string {
  if (fraction === null || fraction === undefined || !Number.isFinite(fraction)) return '—';
  return formatPercent(fraction, digits);
}

/** Bytes with binary multiples, as file managers show them. */
export function bytes(size: number): string {
  if (size < 1024) return `${size} B`;
  const units = ['KiB', 'MiB', 'GiB'];
  let value = size / 1024;
  let i = 0;
  while (value >= 1024 && i < units.length - 1) {
    value /= 1024;
    i += 1;
  }
  return `${plain(value, 3)} ${units[i]} (${size.toLocaleString('en-GB')} bytes)`;
}

/** UTC, to the second, so every reader sees the same instant. */
export function timestamp(value: Timestamp | null | undefined): string {
  if (value === null || value === undefined) return '—';
  const date = value instanceof Date ? value : new Date(value);
  if (Number.isNaN(date.getTime())) return String(value);
  return `${date.toISOString().slice(0, 19).replace('T', ' ')} UTC`;
}

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** "12 Mar 2026 14:02 UTC": the form of the audit trail and the signature page. */
export function dateTime(value: Timestamp | null | undefined): string {
  if (value === null || value === undefined) return '—';
  const d = value instanceof Date ? value : new Date(value);
  if (Number.isNaN(d.getTime())) return String(value);
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${d.getUTCDate()} ${MONTHS[d.getUTCMonth()]} ${d.getUTCFullYear()} ${pad(d.getUTCHours())}:${pad(d.getUTCMinutes())} UTC`;
}
