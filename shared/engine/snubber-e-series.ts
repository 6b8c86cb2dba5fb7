// Preferred-number series of IEC 60063, for turning a computed snubber part into one that can be bought.
import { eSeriesMantissas } from './e-series';

/** E12 mantissas (one decade), IEC 60063. */
export const E12 = [1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2] as const;

/** E24 mantissas (one decade), from the resistor table the discharge engine already keeps. */
export const E24: readonly number[] = eSeriesMantissas('E24').map((m) => m / 10);

/**
 * The member of `series` nearest to `value` on a logarithmic scale, which is how the series is spaced
 * (each step is a constant ratio), so "nearest" means the smallest relative error either way.
 */
export function nearestPreferred(value: number, series: readonly number[]): number {
  const decade = Math.floor(Math.log10(value));
  let best = value;
  let bestDistance = Infinity;
  for (const d of [decade - 1, decade, decade + 1]) {
    for (const m of series) {
      // toPrecision removes the binary noise of m·10^d so 82 Ω prints as 82, not 82.00000000000001.
      const candidate = Number((m * 10 ** d).toPrecision(3));
      const distance = Math.abs(Math.log(candidate / value));
      if (distance < bestDistance) {
        best = candidate;
        bestDistance = distance;
      }
    }
  }
  return best;
}
