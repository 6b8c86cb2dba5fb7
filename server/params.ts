import { AppError } from './errors';

/** Route ids are positive integers; anything else is a 400 naming the parameter, never a 500. */
export function parseId(value: unknown, name = 'id'): number {
  const n = Number(value);
  if (!Number.isSafeInteger(n) || n <= 0) throw new AppError(400, 'invalid_input', `The ${name} in the address must be a positive whole number.`, [{ path: name, message: 'not a positive integer' }]);
  return n;
}
