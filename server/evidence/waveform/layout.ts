// Works out how a capture export is laid out from its first bytes: separator, decimal mark, where the
// metadata ends and the data begins, the header row and its unit hints, which column is time (or the
// start + increment that replaces it) and which columns are channels. Only the head is looked at as
// text; the data rows are left to the byte scanner.
import { WaveformError } from './errors';
import { OVERFLOW_MARKER } from './scan';
import type { ByteSource } from './source';
import { parseUnit, readHeaderCell, readQuantity, type HeaderCell, type Unit } from './units';

export interface ColumnInfo {
  index: number;
  /** Header text (trimmed), or "column N" when the file has no header row. */
  label: string;
  header: HeaderCell | null;
  /** Whether the sampled data rows hold numbers in this column. */
  numeric: boolean;
}

export interface CaptureLayout {
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

const HEAD_BYTES = 1 << 20;
const MAX_LINES = 2000;
const RUN_LENGTH = 32;

const TAB = 9;
const LF = 10;
const CR = 13;
const SEPARATORS = [TAB, 59, 44] as const; // tab, ';', ','

const NUMBER_DOT = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;
const NUMBER_COMMA = /^[+-]?(?:\d+,?\d*|,\d+)(?:[eE][+-]?\d+)?$/;
const MARKER =
  /^(?:|[+-]?nan|[+-]?inf(?:inity)?|n\/?a|null|none|-+|\*+|\?+|over(?:flow|range)?|under(?:flow|range)?|ovl|clip(?:ped)?|invalid|err(?:or)?)$/i;

const TIME_NAME =
  /^(?:t|x|time|times|timestamp|time ?stamp|sec|secs|seconds?|elapsed(?: time)?|relative time|zeit|temps|tiempo|tempo)$/i;
const INDEX_NAME = /^(?:index|idx|no\.?|nr\.?|n|#|sample|samples|sample no\.?|point|points|pt|row)$/i;
const INCREMENT_KEY =
  /^(?:(?:sample|sampling|time|x|horizontal|point)\s*)?(?:interval|increment|step|spacing)$|^(?:sample|sampling)\s*(?:period|time)$|^(?:dt|delta\s*t|(?:time|seconds)\s*per\s*(?:point|sample))$/i;
const RATE_KEY = /^(?:sample|sampling)\s*(?:rate|frequency)$|^samples?\s*per\s*second$/i;
const START_KEY =
  /^(?:start|start\s*time|time\s*start|x\s*start|t\s*start|start\s*x|x\s*origin|time\s*origin|time\s*offset|horizontal\s*offset|x\s*offset|first\s*(?:time|point|sample)(?:\s*time)?)$/i;
const PROBE_KEY = /probe|atten/i;
const TIME_UNIT_KEY = /^(?:horizontal|time|x)\s*units?$/i;
const VOLT_UNIT_KEY = /^(?:vertical|voltage|y|volt)\s*units?$/i;

interface Cell {
  text: string;
  quoted: boolean;
}

type CellKind = 'number' | 'marker' | 'text';

interface LineInfo {
  /** Byte offset of the line in the file. */
  offset: number;
  text: string;
}

function splitCells(line: string, sep: string): Cell[] {
  const cells: Cell[] = [];
  let i = 0;
  for (;;) {
    while (line[i] === ' ' || (line[i] === '\t' && sep !== '\t')) i++;
    if (line[i] === '"') {
      let text = '';
      i++;
      while (i < line.length) {
        if (line[i] === '"') {
          if (line[i + 1] === '"') {
            text += '"';
            i += 2;
            continue;
          }
          i++;
          break;
        }
        text += line[i++];
      }
      const next = line.indexOf(sep, i);
      cells.push({ text: text.trim(), quoted: true });
      if (next < 0) return cells;
      i = next + 1;
    } else {
      const next = line.indexOf(sep, i);
      cells.push({ text: (next < 0 ? line.slice(i) : line.slice(i, next)).trim(), quoted: false });
      if (next < 0) return cells;
      i = next + 1;
    }
  }
}

function cellKind(cell: Cell, commaDecimal: boolean): CellKind {
  const { text } = cell;
  if (NUMBER_DOT.test(text) || ((commaDecimal || cell.quoted) && NUMBER_COMMA.test(text))) {
    return Math.abs(Number(text.replace(',', '.'))) >= OVERFLOW_MARKER ? 'marker' : 'number';
  }
  return MARKER.test(text) ? 'marker' : 'text';
}

interface Candidate {
  sep: number;
  start: number;
  length: number;
  fields: number;
  decimalComma: boolean;
  header: number | null;
  headerMatches: boolean;
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
  const accept = (): Candidate => {
    let header: number | null = null;
    for (let h = start - 1; h >= 0; h--) {
      if (lines[h].text.trim()) {
        header = h;
        break;
      }
    }
    const headerCells = header === null ? [] : splitCells(lines[header].text, sepText);
    // A trailing separator on the header or on the data rows leaves one empty cell more on one side.
    const count = headerCells.length - (headerCells[headerCells.length - 1]?.text === '' ? 1 : 0);
    const headerMatches =
      header !== null &&
      (count === fields || count === fields - 1) &&
      headerCells.every((c) => cellKind(c, commaDecimal) !== 'number');
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

function checkText(bytes: Uint8Array, from: number): void {
  const probe = bytes.subarray(from, Math.min(bytes.length, from + 65536));
  let nul = 0;
  let control = 0;
  let evenNul = 0;
  for (let i = 0; i < probe.length; i++) {
    const b = probe[i];
    if (b === 0) {
      nul++;
      if (i % 2 === 0) evenNul++;
    } else if (b < 32 && b !== TAB && b !== LF && b !== CR && b !== 12 && b !== 26) control++;
  }
  if (nul > probe.length / 4 && (evenNul === 0 || evenNul === nul)) {
    throw new WaveformError(
      'UNSUPPORTED_ENCODING',
      'The file looks like UTF-16 text. Export the capture as plain text (ASCII or UTF-8).',
    );
  }
  if (nul > 0 || control > probe.length / 100) {
    throw new WaveformError(
      'NOT_TEXT',
      'The file is not a text export: it holds binary data. Export the capture as CSV or text from the instrument.',
    );
  }
}

/** Lines of the head; `all` tells whether they cover the whole file. */
function splitLines(bytes: Uint8Array, from: number, eol: number, complete: boolean): { lines: LineInfo[]; all: boolean } {
  const utf8 = new TextDecoder('utf-8', { fatal: true });
  const latin1 = new TextDecoder('latin1');
  const decode = (part: Uint8Array): string => {
    try {
      return utf8.decode(part);
    } catch {
      return latin1.decode(part);
    }
  };
  const lines: LineInfo[] = [];
  let start = from;
  while (start < bytes.length && lines.length < MAX_LINES) {
    let end = bytes.indexOf(eol, start);
    if (end < 0) {
      if (!complete) break; // the head stops inside this line
      end = bytes.length;
    }
    let textEnd = end;
    if (eol === LF && textEnd > start && bytes[textEnd - 1] === CR) textEnd--;
    lines.push({ offset: start, text: decode(bytes.subarray(start, textEnd)) });
    start = end + 1;
  }
  return { lines, all: complete && start >= bytes.length };
}

interface Metadata {
  increment: number | null;
  start: number | null;
  probe: string | null;
  timeUnit: Unit | null;
  voltUnit: Unit | null;
}

function readMetadata(lines: LineInfo[], sep: string, decimalComma: boolean): Metadata {
  const meta: Metadata = { increment: null, start: null, probe: null, timeUnit: null, voltUnit: null };
  for (const line of lines) {
    let cells = splitCells(line.text, sep)
      .map((c) => c.text)
      .filter((t) => t !== '');
    if (cells.length === 1) {
      // "Start: -0.1", "dt=1e-5", or a key/value line written with another separator than the data's.
      const split = /^([^:=,;\t]+?)\s*[:=,;\t]\s*(.*)$/.exec(cells[0]);
      cells = split ? [split[1], split[2]] : cells;
    }
    if (cells.length < 2) continue;
    const key = readHeaderCell(cells[0].replace(/[:=]\s*$/, ''));
    const name = (key.base || key.label).replace(/[\s_.]+/g, ' ').trim();
    const value = cells[1];
    if (PROBE_KEY.test(name)) {
      meta.probe ??= value;
      continue;
    }
    if (TIME_UNIT_KEY.test(name)) {
      const unit = parseUnit(value);
      if (unit?.kind === 'time') meta.timeUnit = unit;
      continue;
    }
    if (VOLT_UNIT_KEY.test(name)) {
      const unit = parseUnit(value);
      if (unit?.kind === 'voltage') meta.voltUnit = unit;
      continue;
    }
    const isIncrement = INCREMENT_KEY.test(name);
    const isRate = RATE_KEY.test(name);
    const isStart = START_KEY.test(name);
    if (!isIncrement && !isRate && !isStart) continue;
    const quantity = readQuantity(value, decimalComma);
    if (!quantity) continue;
    const unit = quantity.unit ?? key.unit;
    if (isRate) {
      if ((unit === null || unit.kind === 'frequency') && quantity.value > 0) {
        meta.increment ??= 1 / (quantity.value * (unit?.scale ?? 1));
      }
    } else if (unit === null || unit.kind === 'time') {
      const seconds = quantity.value * (unit?.scale ?? 1);
      if (isIncrement && seconds > 0) meta.increment = seconds;
      if (isStart) meta.start ??= seconds;
    }
  }
  return meta;
}

/** Reads the layout from the head of `source`. */
export async function readLayout(source: ByteSource): Promise<CaptureLayout> {
  const length = Math.min(source.size, HEAD_BYTES);
  const head = new Uint8Array(length);
  let got = 0;
  while (got < length) {
    const n = await source.read(head, got, length - got, got);
    if (n === 0) break;
    got += n;
  }
  return sniffLayout(head.subarray(0, got), got >= source.size);
}

function sniffLayout(bytes: Uint8Array, complete: boolean): CaptureLayout {
  if (bytes.length === 0) throw new WaveformError('EMPTY', 'The file is empty.');
  if ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff)) {
    throw new WaveformError(
      'UNSUPPORTED_ENCODING',
      'The file is UTF-16 text. Export the capture as plain text (ASCII or UTF-8).',
    );
  }
  const from = bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf ? 3 : 0;
  checkText(bytes, from);
  const eol = bytes.indexOf(LF, from) >= 0 || bytes.indexOf(CR, from) < 0 ? LF : CR;
  const { lines, all } = splitLines(bytes, from, eol, complete);
  if (lines.every((l) => !l.text.trim())) throw new WaveformError('EMPTY', 'The file holds no text, only blank lines.');

  const candidates = SEPARATORS.map((sep) => findRun(lines, sep, all)).filter((c): c is Candidate => c !== null);
  if (candidates.length === 0) {
    throw new WaveformError(
      'NO_NUMERIC_COLUMNS',
      'No rows of numbers were found: the file has no numeric columns separated by commas, semicolons or tabs.',
    );
  }
  const best = candidates
    .map((candidate) => ({ candidate, score: score(candidate, lines) }))
    .reduce((a, b) => (b.score > a.score || (b.score === a.score && b.candidate.start < a.candidate.start) ? b : a)).candidate;
  const sep = String.fromCharCode(best.sep);
  const commaDecimal = best.sep !== 44;
  const notes: string[] = [];

  // Header row, possibly with a row of units right under the names ("Time,CH1" then "s,V").
  let headerCells: HeaderCell[] | null = null;
  let metadataEnd = best.start;
  if (best.header !== null && best.headerMatches) {
    const cells = splitCells(lines[best.header].text, sep).map((c) => readHeaderCell(c.text));
    metadataEnd = best.header;
    const allUnits = cells.every((c) => c.unit !== null && c.base === '');
    let above: number | null = null;
    for (let h = best.header - 1; h >= 0; h--) {
      if (lines[h].text.trim()) {
        above = h;
        break;
      }
    }
    const names = above === null ? null : splitCells(lines[above].text, sep);
    if (allUnits && names && names.length === cells.length && names.every((c) => cellKind(c, commaDecimal) === 'text')) {
      headerCells = names.map((name, i) => ({
        label: `${name.text} (${cells[i].unit?.text ?? ''})`,
        base: readHeaderCell(name.text).base,
        unit: cells[i].unit,
        unknownUnit: null,
      }));
      metadataEnd = above ?? metadataEnd;
    } else {
      headerCells = cells;
    }
  }
  const meta = readMetadata(lines.slice(0, metadataEnd), sep, best.decimalComma);

  // Which columns hold numbers, judged on the rows read.
  const runLines = lines.slice(best.start, best.start + best.length + RUN_LENGTH);
  const numeric = new Array<boolean>(best.fields).fill(false);
  const firstColumn: number[] = [];
  for (const line of runLines) {
    if (!line.text.trim()) continue;
    const cells = splitCells(line.text, sep);
    if (cells.length !== best.fields) continue;
    cells.forEach((cell, i) => {
      if (cellKind(cell, commaDecimal) === 'number') numeric[i] = true;
    });
    if (cellKind(cells[0], commaDecimal) === 'number') firstColumn.push(Number(cells[0].text.replace(',', '.')));
  }

  const seen = new Map<string, number>();
  const columns: ColumnInfo[] = numeric.map((isNumeric, index) => {
    const header = headerCells?.[index] ?? null;
    let label = header?.label || `column ${index + 1}`;
    const count = seen.get(label) ?? 0;
    seen.set(label, count + 1);
    if (count > 0) label = `${label} (${count + 1})`;
    return { index, label, header, numeric: isNumeric };
  });

  // A running sample number ("Index", "No.") is neither time nor a channel.
  const isIndex = (c: ColumnInfo) => c.header !== null && INDEX_NAME.test(c.header.base);
  // Time: a column named or unit-tagged as time; else the metadata's start + increment; else a first
  // column that only ever increases.
  const timeish = columns.find((c) => c.header && (c.header.unit?.kind === 'time' || TIME_NAME.test(c.header.base)));
  let timeColumn: number | null = null;
  let timeScale = 1;
  if (timeish && timeish.numeric) {
    timeColumn = timeish.index;
    timeScale = timeish.header?.unit?.kind === 'time' ? timeish.header.unit.scale : (meta.timeUnit?.scale ?? 1);
  } else if (meta.increment !== null) {
    if (timeish) notes.push(`Column "${timeish.label}" holds no numbers; the sample interval from the metadata is used instead.`);
  } else if (timeish) {
    throw new WaveformError(
      'NO_TIME_BASE',
      `The time column "${timeish.label}" does not hold numbers (clock times are not supported) and the metadata gives no sample interval.`,
    );
  } else if (
    columns.length >= 2 &&
    columns[0].numeric &&
    !isIndex(columns[0]) &&
    firstColumn.length >= 2 &&
    firstColumn.every((t, i) => i === 0 || t >= firstColumn[i - 1]) &&
    firstColumn[firstColumn.length - 1] > firstColumn[0]
  ) {
    timeColumn = 0;
    timeScale = meta.timeUnit?.scale ?? 1;
    notes.push(
      `No column is named as time; the first column ("${columns[0].label}") only increases and is read as time in ${meta.timeUnit?.text ?? 's'}.`,
    );
  } else {
    throw new WaveformError(
      'NO_TIME_BASE',
      'The file has no time column and its metadata gives no sample interval, so the samples cannot be placed in time.',
    );
  }
  if (timeColumn === null) {
    notes.push(
      `No time column: time is taken from the metadata, start ${meta.start ?? 0} s and sample interval ${meta.increment} s.`,
    );
  }

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
  if (meta.probe !== null) {
    notes.push(
      `The metadata states a probe setting "${meta.probe}". Values are used exactly as exported; if the instrument did not apply the probe ratio, the voltages are off by that factor.`,
    );
  }
  return {
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
