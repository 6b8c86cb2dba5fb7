// Works out how a capture export is laid out from its first bytes: separator, decimal mark, where the
// metadata ends and the data begins, the header row and its unit hints, which column is time (or the
// start + increment that replaces it) and which columns are channels. Only the head is looked at as
// text; the data rows are left to the byte scanner.
import { cellKind, splitCells, type Cell } from './cells';
import { WaveformError } from './errors';
import { readHead, type LineInfo, type TextEncoding } from './head';
import { COMMENT_MARK, isMetadataLine, readMetadata, type Metadata } from './metadata';
import type { ByteSource } from './source';
import { readHeaderCell, type HeaderCell } from './units';

interface ColumnInfo {
  index: number;
  /** Header text (trimmed), or "column N" when the file has no header row. */
  label: string;
  header: HeaderCell | null;
  /** Whether the sampled data rows hold numbers in this column. */
  numeric: boolean;
}

export interface CaptureLayout {
  /** Encoding named by the byte-order mark (UTF-8 without one); offsets below are in its scan stream (encoding.ts). */
  encoding: TextEncoding;
  sep: number;
  eol: number;
  decimalComma: boolean;
  /** Byte offset of the first data row. */
  dataOffset: number;
  /** 1-based line number of the first data row, for messages. */
  dataLine: number;
  /** Fields in a complete data row. */
  fieldCount: number;
  columns: ColumnInfo[];
  /** Column holding time, or null when the metadata gives start + increment. */
  timeColumn: number | null;
  /** Factor from the time column's numbers to seconds. */
  timeScale: number;
  /** Time base when there is no time column, s. */
  start: number;
  increment: number;
  /** Numeric columns other than time, in column order. */
  channelColumns: number[];
  channelNames: string[];
  /** Factor from each channel's numbers to volts (from a unit hint; 1 without one). */
  channelScales: number[];
  /** Probe ratio stated by the metadata, as written; never applied. */
  probeRatio: string | null;
  notes: string[];
}

const RUN_LENGTH = 32;
const SEPARATORS = [9, 59, 44] as const; // tab, ';', ','

const TIME_NAME = /^(?:t|x|time|times|timestamp|time ?stamp|sec|secs|seconds?|elapsed(?: time)?|relative time|zeit|temps|tiempo|tempo)$/i;
const INDEX_NAME = /^(?:index|idx|no\.?|nr\.?|n|#|sample|samples|sample no\.?|point|points|pt|row)$/i;

interface Candidate {
  sep: number;
  start: number;
  length: number;
  fields: number;
  decimalComma: boolean;
  header: number | null;
  headerMatches: boolean;
}

/** A number converted from other units, without the last-digit noise of the conversion (−50 ms is −0.05 s). */
function plain(x: number): string {
  return Number(x.toPrecision(12)).toString();
}

/** Cells of a header row; a comment mark before it ("# Time (s),CH1 (V)") is not part of the first name. */
function headerRow(line: LineInfo, sep: string): Cell[] {
  return splitCells(line.text.replace(COMMENT_MARK, ''), sep);
}

/**
 * The first run of data rows with a constant field count under separator `sep`: at least RUN_LENGTH rows,
 * or fewer when they reach the end of a file read whole (a small capture). Rows of markers only (NaN,
 * empty) continue a run; the file's last line may be truncated and need not match.
 */
function findRun(lines: LineInfo[], sep: number, allLines: boolean): Candidate | null {
  const sepText = String.fromCharCode(sep);
  const commaDecimal = sep !== 44;
  let last = lines.length - 1;
  while (last >= 0 && !lines[last].text.trim()) last--;
  let start = -1;
  let fields = 0;
  let length = 0;
  let decimalComma = false;
  /** The run's rows end in an empty cell (a separator after the last value). */
  let trailingEmpty = false;
  const accept = (): Candidate => {
    let header: number | null = null;
    for (let h = start - 1; h >= 0; h--) {
      if (lines[h].text.trim()) {
        header = h;
        break;
      }
    }
    const headerCells = header === null ? [] : headerRow(lines[header], sepText);
    // A trailing separator on the header or on the data rows leaves one empty cell more on one side.
    // A single name over two values without one is a one-column file under another separator: "402,5"
    // under "U (V)" is one value with a decimal comma, not two columns.
    const count = headerCells.length - (headerCells[headerCells.length - 1]?.text === '' ? 1 : 0);
    // A metadata line right above the data ("# increment: 1E-04 s" over one column of values) is no header.
    const headerMatches =
      header !== null &&
      (count === fields || (count === fields - 1 && (trailingEmpty || count > 1))) &&
      headerCells.every((c) => cellKind(c, commaDecimal) !== 'number') &&
      !isMetadataLine(lines[header].text, sepText, commaDecimal);
    return { sep, start, length, fields, decimalComma, header, headerMatches };
  };
  for (let i = 0; i <= last; i++) {
    const text = lines[i].text;
    if (!text.trim()) continue;
    const cells = splitCells(text, sepText);
    let numbers = 0;
    let others = 0;
    let usesComma = false;
    for (const cell of cells) {
      const kind = cellKind(cell, commaDecimal);
      if (kind === 'number') {
        numbers++;
        if (!cell.quoted && cell.text.includes(',')) usesComma = true;
      } else if (kind === 'text') others++;
    }
    if (start >= 0 && others === 0 && cells.length === fields) {
      length++;
      decimalComma ||= usesComma;
      if (length >= RUN_LENGTH) return accept();
      continue;
    }
    if (start >= 0 && allLines && i === last) return accept();
    if (others === 0 && numbers > 0) {
      start = i;
      fields = cells.length;
      length = 1;
      decimalComma = usesComma;
      trailingEmpty = cells[cells.length - 1].text === '';
    } else {
      start = -1;
      length = 0;
    }
  }
  return start >= 0 && allLines ? accept() : null;
}

/**
 * Header agreement first, several columns next; among equals (a single-column capture fits every
 * separator) the separator used most in the lines above the data wins, a fraction below one point.
 */
function score(c: Candidate, lines: LineInfo[]): number {
  const sepText = String.fromCharCode(c.sep);
  let uses = 0;
  for (let i = 0; i < c.start; i++) uses += lines[i].text.split(sepText).length - 1;
  return (c.headerMatches ? 4 : 0) + (c.fields >= 2 ? 2 : 0) + uses / (uses + 1);
}

/** The run of data rows the layout is built on: the best-scoring separator's. */
function pickRun(lines: LineInfo[], all: boolean): Candidate {
  const candidates = SEPARATORS.map((sep) => findRun(lines, sep, all)).filter((c): c is Candidate => c !== null);
  if (candidates.length === 0) {
    throw new WaveformError(
      'NO_NUMERIC_COLUMNS',
      'No rows of numbers were found: the file has no numeric columns separated by commas, semicolons or tabs.',
    );
  }
  return candidates
    .map((candidate) => ({ candidate, score: score(candidate, lines) }))
    .reduce((a, b) => (b.score > a.score || (b.score === a.score && b.candidate.start < a.candidate.start) ? b : a)).candidate;
}

/**
 * The header row, possibly with a row of units right under the names ("Time,CH1" then "s,V"), and the
 * line where the metadata above it ends.
 */
function readHeader(lines: LineInfo[], run: Candidate): { cells: HeaderCell[] | null; metadataEnd: number } {
  if (run.header === null || !run.headerMatches) return { cells: null, metadataEnd: run.start };
  const sep = String.fromCharCode(run.sep);
  const cells = headerRow(lines[run.header], sep).map((c) => readHeaderCell(c.text));
  const allUnits = cells.every((c) => c.unit !== null && c.base === '');
  let above: number | null = null;
  for (let h = run.header - 1; h >= 0; h--) {
    if (lines[h].text.trim()) {
      above = h;
      break;
    }
  }
  const names = above === null ? null : headerRow(lines[above], sep);
  if (above !== null && allUnits && names && names.length === cells.length && names.every((c) => cellKind(c, run.sep !== 44) === 'text')) {
    const named = names.map((name, i) => ({
      label: `${name.text} (${cells[i].unit?.text ?? ''})`,
      base: readHeaderCell(name.text).base,
      unit: cells[i].unit,
      unknownUnit: null,
    }));
    return { cells: named, metadataEnd: above };
  }
  return { cells, metadataEnd: run.header };
}

/** Every column with its header, and whether the rows read hold numbers in it; the first column's numbers. */
function readColumns(lines: LineInfo[], run: Candidate, headerCells: HeaderCell[] | null): { columns: ColumnInfo[]; firstColumn: number[] } {
  const sep = String.fromCharCode(run.sep);
  const commaDecimal = run.sep !== 44;
  const numeric = new Array<boolean>(run.fields).fill(false);
  const firstColumn: number[] = [];
  for (const line of lines.slice(run.start, run.start + run.length + RUN_LENGTH)) {
    if (!line.text.trim()) continue;
    const cells = splitCells(line.text, sep);
    if (cells.length !== run.fields) continue;
    cells.forEach((cell, i) => {
      if (cellKind(cell, commaDecimal) === 'number') numeric[i] = true;
    });
    if (cellKind(cells[0], commaDecimal) === 'number') firstColumn.push(Number(cells[0].text.replace(',', '.')));
  }
  const seen = new Map<string, number>();
  const columns = numeric.map((isNumeric, index) => {
    const header = headerCells?.[index] ?? null;
    let label = header?.label || `column ${index + 1}`;
    const count = seen.get(label) ?? 0;
    seen.set(label, count + 1);
    if (count > 0) label = `${label} (${count + 1})`;
    return { index, label, header, numeric: isNumeric };
  });
  return { columns, firstColumn };
}

/** A running sample number ("Index", "No.") is neither time nor a channel. */
const isIndex = (c: ColumnInfo) => c.header !== null && INDEX_NAME.test(c.header.base);

/**
 * Time: a column named or unit-tagged as time; else the metadata's start + increment; else a first
 * column that only ever increases.
 */
function findTimeBase(
  columns: ColumnInfo[],
  firstColumn: number[],
  meta: Metadata,
  notes: string[],
): { timeColumn: number | null; timeScale: number } {
  const timeish = columns.find((c) => c.header && (c.header.unit?.kind === 'time' || TIME_NAME.test(c.header.base)));
  if (timeish && timeish.numeric) {
    return { timeColumn: timeish.index, timeScale: timeish.header?.unit?.kind === 'time' ? timeish.header.unit.scale : (meta.timeUnit?.scale ?? 1) };
  }
  if (meta.increment !== null) {
    if (timeish) notes.push(`Column "${timeish.label}" holds no numbers; the sample interval from the metadata is used instead.`);
    notes.push(`No time column: time is taken from the metadata, start ${plain(meta.start ?? 0)} s and sample interval ${plain(meta.increment)} s.`);
    return { timeColumn: null, timeScale: 1 };
  }
  if (timeish) {
    throw new WaveformError(
      'NO_TIME_BASE',
      `The time column "${timeish.label}" does not hold numbers (clock times are not supported) and the metadata gives no sample interval.`,
    );
  }
  const increasing =
    firstColumn.length >= 2 &&
    firstColumn.every((t, i) => i === 0 || t >= firstColumn[i - 1]) &&
    firstColumn[firstColumn.length - 1] > firstColumn[0];
  if (columns.length >= 2 && columns[0].numeric && !isIndex(columns[0]) && increasing) {
    notes.push(
      `No column is named as time; the first column ("${columns[0].label}") only increases and is read as time in ${meta.timeUnit?.text ?? 's'}.`,
    );
    return { timeColumn: 0, timeScale: meta.timeUnit?.scale ?? 1 };
  }
  throw new WaveformError(
    'NO_TIME_BASE',
    'The file has no time column and its metadata gives no sample interval, so the samples cannot be placed in time.',
  );
}

/** Reads the layout from the head of `source`. */
export async function readLayout(source: ByteSource): Promise<CaptureLayout> {
  const { encoding, eol, lines, all } = await readHead(source);
  const best = pickRun(lines, all);
  const header = readHeader(lines, best);
  const meta = readMetadata(lines.slice(0, header.metadataEnd), String.fromCharCode(best.sep), best.decimalComma);
  const { columns, firstColumn } = readColumns(lines, best, header.cells);
  const notes: string[] = [];
  const { timeColumn, timeScale } = findTimeBase(columns, firstColumn, meta, notes);

  for (const c of columns) {
    if (c.numeric && c.index !== timeColumn && isIndex(c)) notes.push(`Column "${c.label}" is taken as a sample number, not a channel.`);
  }
  const channels = columns.filter((c) => c.numeric && c.index !== timeColumn && !isIndex(c));
  if (channels.length === 0) {
    throw new WaveformError('NO_NUMERIC_COLUMNS', 'The file has no numeric channel besides the time column.');
  }
  const channelScales = channels.map((c) => {
    const unit = c.header?.unit ?? meta.voltUnit;
    return unit?.kind === 'voltage' ? unit.scale : 1;
  });
  for (const c of channels) {
    if (c.header?.unknownUnit) notes.push(`Unit "${c.header.unknownUnit}" of "${c.label}" is not recognised; its values are used as volts.`);
  }
  return {
    encoding,
    sep: best.sep,
    eol,
    decimalComma: best.decimalComma,
    dataOffset: lines[best.start].offset,
    dataLine: best.start + 1,
    fieldCount: best.fields,
    columns,
    timeColumn,
    timeScale,
    start: meta.start ?? 0,
    increment: meta.increment ?? 0,
    channelColumns: channels.map((c) => c.index),
    channelNames: channels.map((c) => c.label),
    channelScales,
    probeRatio: meta.probe,
    notes,
  };
}
