import { z } from 'zod';
import type { Page } from '../../shared/schema/lists';
import { AppError } from '../errors';

/** A keyset position: the sort value of the last row shown and its id (the tie-breaker). */
export type Cursor = [key: string | number, id: number];

const cursorSchema = z.tuple([z.union([z.string().max(100), z.number()]), z.number().int()]);

/** Cursors are opaque to clients: base64url of the keyset position. */
export function encodeCursor(cursor: Cursor): string {
  return Buffer.from(JSON.stringify(cursor)).toString('base64url');
}

export function decodeCursor(text: string | undefined): Cursor | null {
  if (text === undefined) return null;
  try {
    return cursorSchema.parse(JSON.parse(Buffer.from(text, 'base64url').toString('utf8')));
  } catch {
    throw new AppError(400, 'invalid_input', 'The list position is not valid; start again from the first page.', [
      { path: 'cursor', message: 'not a cursor this list gave out' },
    ]);
  }
}

/**
 * Cuts the `limit + 1` rows a page query read into the page and the cursor after it: the extra row
 * only says that there is more.
 */
export function toPage<R, T>(rows: R[], limit: number, total: number, cursorOf: (row: R) => Cursor, view: (row: R) => T): Page<T> {
  const shown = rows.slice(0, limit);
  const more = rows.length > limit;
  return { items: shown.map(view), nextCursor: more ? encodeCursor(cursorOf(shown[shown.length - 1])) : null, total };
}
