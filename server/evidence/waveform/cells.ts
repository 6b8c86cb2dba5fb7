// Cells of one text line of a capture's head, and what kind of value each holds. Used while working out
// the layout; the data rows themselves go to the byte scanner.
import { OVERFLOW_MARKER } from './scan';

export interface Cell {
  text: string;
  quoted: boolean;
}

type CellKind = 'number' | 'marker' | 'text';

const NUMBER_DOT = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;
const NUMBER_COMMA = /^[+-]?(?:\d+,?\d*|,\d+)(?:[eE][+-]?\d+)?$/;
const MARKER =
  /^(?:|[+-]?nan|[+-]?inf(?:inity)?|n\/?a|null|none|-+|\*+|\?+|over(?:flow|range)?|under(?:flow|range)?|ovl|clip(?:ped)?|invalid|err(?:or)?)$/i;

export function splitCells(line: string, sep: string): Cell[] {
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

export function cellKind(cell: Cell, commaDecimal: boolean): CellKind {
  const { text } = cell;
  if (NUMBER_DOT.test(text) || ((commaDecimal || cell.quoted) && NUMBER_COMMA.test(text))) {
    return Math.abs(Number(text.replace(',', '.'))) >= OVERFLOW_MARKER ? 'marker' : 'number';
  }
  return MARKER.test(text) ? 'marker' : 'text';
}
