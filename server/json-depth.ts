// Bounds on JSON request bodies, applied to the raw bytes before they are parsed, so no code — the
// parser, zod, the audit log — ever walks a body nested deeper than a design can be.

/** The deepest nesting a valid body has is about 5 (design → snubbers → item); 32 leaves room. */
const MAX_JSON_DEPTH = 32;

const OPEN_OBJECT = 0x7b;
const OPEN_ARRAY = 0x5b;
const CLOSE_OBJECT = 0x7d;
const CLOSE_ARRAY = 0x5d;
const QUOTE = 0x22;
const BACKSLASH = 0x5c;

/** True when UTF-8 JSON text nests objects/arrays deeper than `max`; one pass, strings skipped, no recursion. */
function jsonNestingExceeds(bytes: Uint8Array, max: number): boolean {
  let depth = 0;
  let inString = false;
  let escaped = false;
  for (const c of bytes) {
    if (inString) {
      if (escaped) escaped = false;
      else if (c === BACKSLASH) escaped = true;
      else if (c === QUOTE) inString = false;
    } else if (c === QUOTE) {
      inString = true;
    } else if (c === OPEN_OBJECT || c === OPEN_ARRAY) {
      if (++depth > max) return true;
    } else if (c === CLOSE_OBJECT || c === CLOSE_ARRAY) {
      depth--;
    }
  }
  return false;
}

const bodyError = (status: number, type: string, message: string) => Object.assign(new Error(message), { status, type, expose: true });

/** body-parser's `verify` hook: refuses bodies that are not UTF-8 (RFC 8259 §8.1) or nest too deep. */
export function rejectDeepJson(max = MAX_JSON_DEPTH) {
  return (_req: unknown, _res: unknown, buf: Buffer, encoding: string): void => {
    if (!/^utf-?8$/i.test(encoding)) throw bodyError(415, 'charset.unsupported', 'Send JSON as UTF-8.');
    if (jsonNestingExceeds(buf, max)) throw bodyError(400, 'entity.too.deep', `The JSON body is nested deeper than ${max} levels.`);
  };
}
