import { AppError } from './errors';

// A canonical positive decimal: no sign, no spaces, no leading zero, no "0x10", "1.0" or "1e0".
const DECIMAL_ID = /^[1-9][0-9]{0,15}$/;

/** Route ids and versions are positive whole numbers written in decimal digits; anything else is a 400 naming the parameter. */
export function parseId(value: unknown, name = 'id'): number {
  const n = typeof value === 'string' && DECIMAL_ID.test(value) ? Number(value) : NaN;
  if (!Number.isSafeInteger(n))
    throw new AppError(400, 'invalid_input', `The ${name} in the address must be a positive whole number in decimal digits.`, [
      { path: name, message: 'not a positive decimal integer' },
    ]);
  return n;
}
