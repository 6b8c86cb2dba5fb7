// The numeric fast path of the capture reader: turns lines of bytes straight into float64 columns.
//
// Why hand-written rather than a CSV package: a 10-million-row capture must be read at several hundred
// MB/s in bounded memory. General CSV parsers first build a JS string per chunk and a string per cell and
// only then convert to numbers, allocating per cell; on a 10-million-row capture (scripts/bench-waveform.ts)
// uDSV parses ~110 MB/s and papaparse ~25 MB/s, while this scanner lets ingest plus the whole analysis run
// at ~400 MB/s. That measured need for speed is the only reason this module exists.
//
// Exactness: a decimal of at most 15 digits with a power of ten within ±22 is computed as one IEEE
// multiplication or division of two exactly representable numbers, which rounds correctly (Clinger's
// fast path); every other valid number falls back to the engine's own `Number()`. Either way the result
// equals `Number(text)`, which the round-trip property test checks.

export interface ScanPlan {
  /** Field separator byte: ',' ';' or TAB. */
  readonly sep: number;
  /** Line terminator byte: LF, or CR for files that use CR alone. */
  readonly eol: number;
  /** Accept ',' as the decimal mark (only with ';' or TAB separators, and inside quotes). */
  readonly decimalComma: boolean;
  /** Output slot of each column, −1 for columns that are skipped without being parsed. */
  readonly slotOf: Int32Array;
  /** Values written per row. */
  readonly slots: number;
  /** A row with fewer fields than this is malformed. */
  readonly needFields: number;
}

/** Where the scan stands; kept across chunks of one pass. */
export class ScanState {
  /** Rows written to the output since the caller last reset it. */
  rows = 0;
  /** Data rows rejected: a marker (NaN, overflow, empty) or malformed text in a needed field. */
  bad = 0;
  /** Data rows seen, good or bad; blank lines excluded. Position of a row on a start + increment time base. */
  dataRows = 0;
  /** Fields of the last data row, and whether it was rejected. */
  lastFields = 0;
  lastBad = false;
  /** Byte length of the last and of the previous data row (to recognise a truncated final line). */
  lastLength = 0;
  previousLength = 0;
}

const POW10 = Float64Array.from({ length: 23 }, (_, i) => Number(`1e${i}`));
// Values at or beyond this magnitude are the overflow/"no data" marker many instruments write (common practice).
export const OVERFLOW_MARKER = 9.9e37;

const QUOTE = 34;
const COMMA = 44;
const DOT = 46;
const MINUS = 45;
const PLUS = 43;
const SPACE = 32;
const TAB = 9;
const CR = 13;

function slowNumber(buf: Uint8Array, from: number, to: number): number {
  let text = '';
  for (let i = from; i < to; i++) text += String.fromCharCode(buf[i] === COMMA ? DOT : buf[i]);
  return Number(text);
}

/**
 * Scans whole lines in `buf[pos, end)`; the byte before `end` must be the line terminator, so no loop
 * needs a bounds check. Each good row writes `plan.slots` numbers to `out`, its absolute byte offset
 * (`base` + position) to `offsets` and its data-row index to `rowIndex`. Stops early when `capacity` rows
 * are written and returns the position of the first unread line.
 */
export function scanLines(
  buf: Uint8Array,
  pos: number,
  end: number,
  base: number,
  plan: ScanPlan,
  out: Float64Array,
  offsets: Float64Array,
  rowIndex: Float64Array,
  capacity: number,
  st: ScanState,
): number {
  const { sep, eol, decimalComma, slotOf, slots, needFields } = plan;
  const columns = slotOf.length;
  const tabIsSpace = sep !== TAB;
  const crIsSpace = eol !== CR;
  // Per-line bookkeeping lives in locals and is written back once: stores to `st` on every line cost
  // a measurable share of the scan.
  let p = pos;
  let rows = st.rows;
  let badRows = st.bad;
  let dataRows = st.dataRows;
  let lastFields = st.lastFields;
  let lastBad = st.lastBad;
  let lastLength = st.lastLength;
  let previousLength = st.previousLength;
  while (p < end && rows < capacity) {
    const lineStart = p;
    let c = buf[p];
    while (c === SPACE || (c === TAB && tabIsSpace) || (c === CR && crIsSpace)) c = buf[++p];
    if (c === eol) {
      p++;
      continue; // blank line: no sample, no row position
    }
    let col = 0;
    let bad = false;
    const at = rows * slots;
    for (;;) {
      if (c <= SPACE) while (c === SPACE || (c === TAB && tabIsSpace)) c = buf[++p];
      const slot = col < columns ? slotOf[col] : -1;
      if (slot >= 0 && !bad) {
        let quoted = false;
        if (c === QUOTE) {
          quoted = true;
          c = buf[++p];
          while (c === SPACE) c = buf[++p];
        }
        const numberStart = p;
        let negative = false;
        if (c === MINUS) {
          negative = true;
          c = buf[++p];
        } else if (c === PLUS) c = buf[++p];
        // Every digit counts towards the 15 that the exact fast path allows, leading zeros included: one
        // loop per part is cheaper than telling them apart, and longer numbers take the slow path.
        let mantissa = 0;
        let from = p;
        while ((c - 48) >>> 0 < 10) {
          mantissa = mantissa * 10 + (c - 48);
          c = buf[++p];
        }
        let digits = p - from;
        let exponent = 0;
        if (c === DOT || (c === COMMA && (decimalComma || quoted))) {
          c = buf[++p];
          from = p;
          while ((c - 48) >>> 0 < 10) {
            mantissa = mantissa * 10 + (c - 48);
            c = buf[++p];
          }
          digits += p - from;
          exponent -= p - from;
        }
        let valid = digits > 0;
        if ((c | 32) === 101 && valid) {
          c = buf[++p];
          let negativeExponent = false;
          if (c === MINUS) {
            negativeExponent = true;
            c = buf[++p];
          } else if (c === PLUS) c = buf[++p];
          let e = 0;
          from = p;
          while ((c - 48) >>> 0 < 10) {
            if (e < 100000) e = e * 10 + (c - 48);
            c = buf[++p];
          }
          valid = p > from;
          exponent += negativeExponent ? -e : e;
        }
        const numberEnd = p;
        if (c !== sep && c !== eol) {
          // Off the common path: closing quote, spaces, CR before LF.
          if (quoted) {
            while (c === SPACE) c = buf[++p];
            if (c === QUOTE) {
              c = buf[++p];
            } else {
              valid = false;
              while (c !== QUOTE && c !== eol) c = buf[++p]; // the rest of the quoted text, separators included
              if (c === QUOTE) c = buf[++p];
            }
          }
          while (c === SPACE || (c === TAB && tabIsSpace) || (c === CR && crIsSpace)) c = buf[++p];
        } else if (quoted) valid = false;
        if (valid && (c === sep || c === eol)) {
          if (digits <= 15 && exponent >= -22 && exponent <= 22) {
            // At most 10¹⁵·10²² < 9.9·10³⁷: neither the overflow marker nor NaN can come out of here.
            const value = exponent < 0 ? mantissa / POW10[-exponent] : mantissa * POW10[exponent];
            out[at + slot] = negative ? -value : value;
          } else {
            const value = slowNumber(buf, numberStart, numberEnd);
            if (value >= OVERFLOW_MARKER || value <= -OVERFLOW_MARKER || value !== value) bad = true;
            else out[at + slot] = value;
          }
          if (c === eol) {
            col++;
            break;
          }
          c = buf[++p];
          col++;
          continue;
        }
        bad = true;
      }
      // Skip to the end of the field (all of it for skipped columns; the rest of a rejected one).
      if (c === QUOTE) {
        c = buf[++p];
        while (c !== QUOTE && c !== eol) c = buf[++p];
        if (c === QUOTE) c = buf[++p];
      }
      while (c !== sep && c !== eol) c = buf[++p];
      col++;
      if (c === eol) break;
      c = buf[++p];
    }
    p++;
    previousLength = lastLength;
    lastLength = p - lineStart;
    lastFields = col;
    if (col < needFields) bad = true;
    lastBad = bad;
    if (bad) {
      badRows++;
    } else {
      offsets[rows] = base + lineStart;
      rowIndex[rows] = dataRows;
      rows++;
    }
    dataRows++;
  }
  st.rows = rows;
  st.bad = badRows;
  st.dataRows = dataRows;
  st.lastFields = lastFields;
  st.lastBad = lastBad;
  st.lastLength = lastLength;
  st.previousLength = previousLength;
  return p;
}

// A few calls on a few bytes record type feedback for the code after the scan loop (V8 allocates the
// feedback vector only after several calls). Without them V8 compiles the loop on stack (OSR) during
// the first large call, before the code after it has ever run with feedback, and that compiled code
// then deoptimises on every return: measured at ~60 ms and ~300 MB of garbage per 10⁷ rows.
{
  const plan: ScanPlan = { sep: 44, eol: 10, decimalComma: false, slotOf: Int32Array.of(0, -1), slots: 1, needFields: 1 };
  const lines = Buffer.from('1,x\n"-2.5e-3",\n\n+0.25E+2,"a,b"\r\n-7,1\n0.00e+0,\n12345678901234567,\n');
  const out = new Float64Array(4);
  for (let i = 0; i < 32; i++) scanLines(lines, 0, lines.length, 0, plan, out, out, out, 4, new ScanState());
}
