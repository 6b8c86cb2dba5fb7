// Preferred number series of IEC 60063 for resistors (values per decade, from memory of the standard's
// tables; E96 follows round(10^(i/96)) to three figures, which the tests check).
export type ESeries = 'E24' | 'E96';

const E24 = [10, 11, 12, 13, 15, 16, 18, 20, 22, 24, 27, 30, 33, 36, 39, 43, 47, 51, 56, 62, 68, 75, 82, 91] as const;

const E96 = [
  100, 102, 105, 107, 110, 113, 115, 118, 121, 124, 127, 130, 133, 137, 140, 143, 147, 150, 154, 158, 162, 165, 169,
  174, 178, 182, 187, 191, 196, 200, 205, 210, 215, 221, 226, 232, 237, 243, 249, 255, 261, 267, 274, 280, 287, 294,
  301, 309, 316, 324, 332, 340, 348, 357, 365, 374, 383, 392, 402, 412, 422, 432, 442, 453, 464, 475, 487, 499, 511,
  523, 536, 549, 562, 576, 590, 604, 619, 634, 649, 665, 681, 698, 715, 732, 750, 768, 787, 806, 825, 845, 866, 887,
  909, 931, 953, 976,
] as const;

/** The series' significant figures as integers (E24: 10 … 91, E96: 100 … 976). */
export function eSeriesMantissas(series: ESeries): readonly number[] {
  return series === 'E24' ? E24 : E96;
}

/** The series' values in the decade of x and its two neighbours, ascending, exact to the series' figures. */
function valuesAround(x: number, series: ESeries): number[] {
  const mantissas = eSeriesMantissas(series);
  const digits = series === 'E24' ? 2 : 3;
  const decade = Math.floor(Math.log10(x));
  const out: number[] = [];
  for (let d = decade - 1; d <= decade + 1; d += 1) {
    for (const m of mantissas) out.push(Number((m * 10 ** (d - digits + 1)).toPrecision(digits)));
  }
  return out;
}

/** Largest series value ≤ x (tolerant to floating-point noise), or undefined for x ≤ 0 or non-finite. */
export function eValueAtOrBelow(x: number, series: ESeries): number | undefined {
  if (!(x > 0) || !Number.isFinite(x)) return undefined;
  const candidates = valuesAround(x, series).filter((v) => v <= x * (1 + 1e-12));
  return candidates[candidates.length - 1];
}

/** Smallest series value strictly above x. */
export function eValueAbove(x: number, series: ESeries): number {
  const candidates = valuesAround(x, series).filter((v) => v > x * (1 + 1e-12));
  return candidates[0];
}
