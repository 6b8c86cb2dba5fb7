// The two shapes most checks take: a value against an upper limit, or a line for information only.
import type { Check } from '../schema/discharge';

type Base = Pick<Check, 'id' | 'label' | 'unit' | 'detail'>;

/** margin = (limit − value) / limit for an upper limit; without a limit the check is for information. */
export function upperLimitCheck(fields: Omit<Check, 'pass' | 'margin' | 'limit' | 'value'> & { value: number; limit: number | null }): Check {
  const { limit, value } = fields;
  if (limit === null) return { ...fields, pass: true, margin: null, informational: true };
  return { ...fields, pass: value <= limit, margin: (limit - value) / limit };
}

/** Nothing to judge (no figure, or another check covers the case): shown, never a pass or a fail. */
export function informationOnly(base: Base): Check {
  return { ...base, value: null, limit: null, pass: true, margin: null, informational: true };
}
