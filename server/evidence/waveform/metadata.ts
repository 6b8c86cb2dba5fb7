// Metadata lines above a capture's data: "key,value", "key;value", "key: value", "key = value", with or
// without a leading "#" or "%", a unit after the value or on the key ("Sample interval (s),1E-05",
// "# increment: 100 us"). Only what changes the numbers is read: time base, units, and the probe setting
// (which is reported, never applied).
import { splitCells } from './cells';
import type { LineInfo } from './head';
import { parseUnit, readHeaderCell, readQuantity, type Unit } from './units';

export interface Metadata {
  increment: number | null;
  start: number | null;
  probe: string | null;
  timeUnit: Unit | null;
  voltUnit: Unit | null;
}

const INCREMENT_KEY =
  /^(?:(?:sample|sampling|time|x|horizontal|point)\s*)?(?:interval|increment|step|spacing)$|^(?:sample|sampling)\s*(?:period|time)$|^(?:dt|delta\s*t|(?:time|seconds)\s*per\s*(?:point|sample))$/i;
const RATE_KEY = /^(?:sample|sampling)\s*(?:rate|frequency)$|^samples?\s*per\s*second$/i;
const START_KEY =
  /^(?:start|start\s*time|time\s*start|x\s*start|t\s*start|start\s*x|x\s*origin|time\s*origin|time\s*offset|horizontal\s*offset|x\s*offset|first\s*(?:time|point|sample)(?:\s*time)?)$/i;
const PROBE_KEY = /probe|atten/i;
const TIME_UNIT_KEY = /^(?:horizontal|time|x)\s*units?$/i;
const VOLT_UNIT_KEY = /^(?:vertical|voltage|y|volt)\s*units?$/i;

/** A comment mark some exports put before metadata (and sometimes before the header row). */
export const COMMENT_MARK = /^\s*[#%]+\s*/;

type Entry =
  { kind: 'probe'; value: string } | { kind: 'time-unit' | 'volt-unit'; unit: Unit } | { kind: 'increment' | 'rate' | 'start'; seconds: number };

/** Key and value of a metadata line, split at the data's separator or, in a one-cell line, at the first of : = , ; tab. */
function keyValue(text: string, sep: string): [string, string] | null {
  let cells = splitCells(text.replace(COMMENT_MARK, ''), sep)
    .map((c) => c.text)
    .filter((t) => t !== '');
  if (cells.length === 1) {
    // "Start: -0.1", "dt=1e-5", or a key/value line written with another separator than the data's.
    const split = /^([^:=,;\t]+?)\s*[:=,;\t]\s*(.*)$/.exec(cells[0]);
    cells = split ? [split[1], split[2]] : cells;
  }
  return cells.length < 2 ? null : [cells[0].replace(/[:=]\s*$/, ''), cells[1]];
}

/** What one line states, when it is metadata the reader uses; null for anything else. */
function readEntry(text: string, sep: string, decimalComma: boolean): Entry | null {
  const pair = keyValue(text, sep);
  if (!pair) return null;
  const key = readHeaderCell(pair[0]);
  const name = (key.base || key.label).replace(/[\s_.]+/g, ' ').trim();
  const value = pair[1];
  if (PROBE_KEY.test(name)) return { kind: 'probe', value };
  if (TIME_UNIT_KEY.test(name) || VOLT_UNIT_KEY.test(name)) {
    const unit = parseUnit(value);
    if (TIME_UNIT_KEY.test(name)) return unit?.kind === 'time' ? { kind: 'time-unit', unit } : null;
    return unit?.kind === 'voltage' ? { kind: 'volt-unit', unit } : null;
  }
  const isIncrement = INCREMENT_KEY.test(name);
  const isRate = RATE_KEY.test(name);
  if (!isIncrement && !isRate && !START_KEY.test(name)) return null;
  const quantity = readQuantity(value, decimalComma);
  if (!quantity) return null;
  const unit = quantity.unit ?? key.unit;
  if (isRate) {
    const ok = (unit === null || unit.kind === 'frequency') && quantity.value > 0;
    return ok ? { kind: 'rate', seconds: 1 / (quantity.value * (unit?.scale ?? 1)) } : null;
  }
  if (unit !== null && unit.kind !== 'time') return null;
  const seconds = quantity.value * (unit?.scale ?? 1);
  if (isIncrement) return seconds > 0 ? { kind: 'increment', seconds } : null;
  return { kind: 'start', seconds };
}

/** Whether a line is metadata the reader understands (such a line is never the header row). */
export function isMetadataLine(text: string, sep: string, decimalComma: boolean): boolean {
  return readEntry(text, sep, decimalComma) !== null;
}

export function readMetadata(lines: readonly LineInfo[], sep: string, decimalComma: boolean): Metadata {
  const meta: Metadata = { increment: null, start: null, probe: null, timeUnit: null, voltUnit: null };
  for (const line of lines) {
    const entry = readEntry(line.text, sep, decimalComma);
    if (entry?.kind === 'probe') meta.probe ??= entry.value;
    else if (entry?.kind === 'time-unit') meta.timeUnit = entry.unit;
    else if (entry?.kind === 'volt-unit') meta.voltUnit = entry.unit;
    else if (entry?.kind === 'start') meta.start ??= entry.seconds;
    // A stated interval wins over one derived from a sample rate, whichever line comes first.
    else if (entry?.kind === 'increment') meta.increment = entry.seconds;
    else if (entry?.kind === 'rate') meta.increment ??= entry.seconds;
  }
  return meta;
}
