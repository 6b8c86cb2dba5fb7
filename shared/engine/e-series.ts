// Preferred number series of IEC 60063 for resistors (values per decade, from memory of the standard's
// tables; E96 follows round(10^(i/96)) to three figures, which the tests check).
export type ESeries = 'E24' | 'E96';

const E24 = [10, 11, 12, 13, 15, 16, 18, 20, 22, 24, 27, 30, 33, 36, 39, 43, 47, 51, 56, 62, 68, 75, 82, 91] as const;

const E96 = [
  100, 102, 105, 107, 110, 113, 115, 118, 121, 124, 127, 130, 133, 137, 140, 143, 147, 150, 154, 158, 162, 165, 169, 174, 178, 182, 187, 191, 196,
  200, 205, 210, 215, 221, 226, 232, 237, 243, 249, 255, 261, 267, 274, 280, 287, 294, 301, 309, 316, 324, 332, 340, 348, 357, 365, 374, 383, 392,
  402, 412, 422, 432, 442, 453, 464, 475, 487, 499, 511, 523, 536, 549, 562, 576, 590, 604, 619, 634, 649, 665, 681, 698, 715, 732, 750, 768, 787,
  806, 825, 845, 866, 887, 909, 931, 953, 976,
] as const;

/** The series' significant figures as integers (E24: 10 … 91, E96: 100 … 976). */
export function eSeriesMantissas(series: ESeries): readonly number[] {
  return series === 'E24' ? E24 : E96;
}

/** The power of ten that scales the series' table to the decade of x. */
function split(x: number, series: ESeries): { exponent: number } {
  const digits = series === 'E24' ? 2 : 3;
  return { exponent: Math.floor(Math.log10(x)) - digits + 1 };
}

// m·10^e as the double nearest the decimal value: exact for e ≥ 0, and a division by an exact power of
// ten is correctly rounded, which is what the decimal string would parse to (and much cheaper).
const scaled = (m: number, e: number) => (e >= 0 ? m * 10 ** e : m / 10 ** -e);

/** The series' values around x in ascending order: the last of the decade below, x's decade, the first above. */
function neighbourhood(x: number, series: ESeries): number[] {
  const table = eSeriesMantissas(series);
  const { exponent } = split(x, series);
  // A cheap estimate of the position narrows the exact (rounded) comparison to a few values; a plain
  // loop, as the inverse design calls this dozens of times per check.
  const raw = x / 10 ** exponent;
  let i = 0;
  while (i < table.length && !(table[i] > raw * (1 + 1e-9))) i += 1;
  const window: number[] = [];
  for (let k = i - 2; k <= i + 1; k += 1) {
    const e = exponent + Math.floor(k / table.length);
    window.push(scaled(table[((k % table.length) + table.length) % table.length], e));
  }
  return window;
}

/**
 * Largest series value ≤ x, or undefined for x ≤ 0 or non-finite. Strict: a bound that lands a rounding
 * error below a preferred value (749 999.999… for 750 k) gives the value below, so the answer always
 * passes the check that set the bound.
 */
export function eValueAtOrBelow(x: number, series: ESeries): number | undefined {
  if (!(x > 0) || !Number.isFinite(x)) return undefined;
  const window = neighbourhood(x, series);
  let below: number | undefined;
  for (const v of window) if (v <= x) below = v;
  return below;
}

/** Smallest series value strictly above x. */
export function eValueAbove(x: number, series: ESeries): number {
  const window = neighbourhood(x, series);
  return window.find((v) => v > x) ?? window[window.length - 1];
}
