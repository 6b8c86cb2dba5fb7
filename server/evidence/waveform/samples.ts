// One pass over (part of) a capture's data rows: bytes → scanner → time base, unit scaling, time-order
// check → batches of samples for whoever consumes them. Nothing but the current batch is held.
import { WaveformError } from './errors';
import type { CaptureLayout } from './layout';
import { ScanState, scanLines, type ScanPlan } from './scan';
import { forEachLineBlock, type ByteSource } from './source';

const BATCH_ROWS = 8192;

/**
 * Samples of one batch, row-major: `data[r·stride]` is the time (s), `data[r·stride + 1 + k]` the value
 * of the k-th extracted column (scaled). Arrays are reused between batches: valid only in the callback.
 */
interface SampleBatch {
  count: number;
  data: Float64Array;
  stride: number;
  /** Byte offset of each sample's line, and its data-row index. */
  offsets: Float64Array;
  rows: Float64Array;
}

export interface PassResult {
  samples: number;
  /** Rows rejected (markers, malformed) plus a truncated last line. */
  skipped: number;
  truncatedLastLine: boolean;
  /** Samples whose time equals the previous one (export resolution too coarse). */
  repeatedTimes: number;
}

interface PassRange {
  from: number;
  to: number;
  /** Data-row index of the row at `from`. */
  firstRow: number;
}

// The row loops are plain functions over typed arrays, not closures: V8 optimises those reliably.

/**
 * Puts each row's time in seconds into slot 0 (from the time column, or start + row · increment) and
 * checks that time never decreases. Returns how many rows repeat the previous time, or −1 − r when row r
 * goes backwards (the caller reports it).
 */
function convertTimes(
  data: Float64Array,
  stride: number,
  n: number,
  rows: Float64Array,
  hasTime: boolean,
  scale: number,
  start: number,
  increment: number,
  previous: number,
): number {
  let repeated = 0;
  // Unary plus makes `last` an unboxed double from the start; seeded with the (boxed) parameter itself,
  // V8 kept it boxed and allocated a heap number on every row (measured: 16 bytes a row).
  let last = +previous;
  for (let r = 0; r < n; r++) {
    const at = r * stride;
    const time = hasTime ? data[at] * scale : start + rows[r] * increment;
    if (time <= last) {
      if (time < last) return -1 - r;
      repeated++;
    }
    last = time;
    data[at] = time;
  }
  return repeated;
}

function scaleSlot(data: Float64Array, stride: number, n: number, slot: number, scale: number): void {
  for (let at = slot; at < n * stride; at += stride) data[at] *= scale;
}

/**
 * Reads `range` of the data, extracting `columns` (column indexes, scaled by `scales`), and hands the
 * samples over in batches. Throws TIME_NOT_INCREASING when time runs backwards.
 */
export async function readPass(
  source: ByteSource,
  layout: CaptureLayout,
  columns: readonly number[],
  scales: readonly number[],
  range: PassRange,
  onBatch: (batch: SampleBatch) => void,
): Promise<PassResult> {
  const slotOf = new Int32Array(layout.fieldCount).fill(-1);
  const timeColumn = layout.timeColumn;
  if (timeColumn !== null) slotOf[timeColumn] = 0;
  columns.forEach((c, i) => (slotOf[c] = i + 1));
  const slots = columns.length + 1;
  const plan: ScanPlan = {
    sep: layout.sep,
    eol: layout.eol,
    decimalComma: layout.decimalComma,
    slotOf,
    slots,
    needFields: Math.max(timeColumn ?? 0, ...columns) + 1,
  };
  // The scanner writes straight into the batch; conversion (time base, units) happens in place.
  const out = new Float64Array(BATCH_ROWS * slots);
  const batch: SampleBatch = {
    count: 0,
    data: out,
    stride: slots,
    offsets: new Float64Array(BATCH_ROWS),
    rows: new Float64Array(BATCH_ROWS),
  };
  const state = new ScanState();
  state.dataRows = range.firstRow;
  const { timeScale, start, increment } = layout;
  const result: PassResult = { samples: 0, skipped: 0, truncatedLastLine: false, repeatedTimes: 0 };
  let lastT = -Infinity;

  /** Converts the scanned rows; returns false when the final line's time goes backwards (truncation). */
  const convert = (finalLine: boolean): boolean => {
    const n = state.rows;
    if (n === 0) return true;
    const repeated = convertTimes(out, slots, n, batch.rows, timeColumn !== null, timeScale, start, increment, lastT);
    if (repeated < 0) {
      if (finalLine) return false;
      const r = -1 - repeated;
      const row = batch.rows[r];
      const time = timeColumn !== null ? out[r * slots] * timeScale : start + row * increment;
      const before = r > 0 ? out[(r - 1) * slots] : lastT;
      throw new WaveformError(
        'TIME_NOT_INCREASING',
        `Time runs backwards at data row ${row + 1} (line ${layout.dataLine + row}): ${time} s after ${before} s.`,
      );
    }
    result.repeatedTimes += repeated;
    lastT = out[(n - 1) * slots];
    scales.forEach((scale, k) => {
      if (scale !== 1) scaleSlot(out, slots, n, k + 1, scale);
    });
    return true;
  };
  const flush = () => {
    batch.count = state.rows;
    result.samples += state.rows;
    if (state.rows > 0) onBatch(batch);
    state.rows = 0;
  };

  await forEachLineBlock(source, range.from, range.to, layout.eol, (buf, end, base, unterminated) => {
    if (unterminated) {
      flush();
      const badBefore = state.bad;
      scanLines(buf, 0, end, base, plan, out, batch.offsets, batch.rows, BATCH_ROWS, state);
      // A last line without a terminator is kept only when it looks whole: every field present and
      // parsed, not clearly shorter than the row before it (2 bytes per field of slack for signs and
      // line endings), and its time not going backwards.
      const short = state.lastLength + 2 * state.lastFields < state.previousLength;
      const whole = state.lastFields >= layout.fieldCount && !state.lastBad && !short;
      if (whole && convert(true)) {
        flush();
      } else {
        result.truncatedLastLine = true;
        if (state.bad === badBefore) state.bad++;
        state.rows = 0;
      }
      return;
    }
    let pos = 0;
    while (pos < end) {
      pos = scanLines(buf, pos, end, base, plan, out, batch.offsets, batch.rows, BATCH_ROWS, state);
      if (state.rows === BATCH_ROWS || pos >= end) {
        convert(false);
        flush();
      }
    }
  });
  result.skipped = state.bad;
  return result;
}
