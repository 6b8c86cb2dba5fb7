// The head of a capture as text: the encoding its byte-order mark names, whether it is text at all, the
// line terminator, and the first lines, each with its offset in the stream the byte scanner reads (the
// file itself for UTF-8; one byte per code unit for UTF-16, see encoding.ts).
import { TEXT_EXPORTS, WaveformError } from './errors';
import type { ByteSource } from './source';

export type TextEncoding = 'utf-8' | 'utf-16le' | 'utf-16be';

export interface LineInfo {
  /** Offset of the line in the scan stream. */
  offset: number;
  text: string;
}

export interface Head {
  encoding: TextEncoding;
  eol: number;
  lines: LineInfo[];
  /** Whether the lines cover the whole file. */
  all: boolean;
}

const HEAD_BYTES = 1 << 20;
const MAX_LINES = 2000;
/** Code units looked at to tell text from binary. */
const PROBE_UNITS = 65536;

const TAB = 9;
const LF = 10;
const CR = 13;

/**
 * The head decoded far enough to be split into lines: code units by index (bytes of UTF-8, 16-bit units
 * of UTF-16), with the text of a span of them. An index is an offset in the scan stream.
 */
interface Units {
  length: number;
  /** Index of the first unit after the byte-order mark. */
  from: number;
  at(i: number): number;
  indexOf(unit: number, from: number): number;
  text(from: number, to: number): string;
}

function byteOrderMark(bytes: Uint8Array): { encoding: TextEncoding; length: number } {
  if (bytes[0] === 0xff && bytes[1] === 0xfe) {
    if (bytes[2] === 0 && bytes[3] === 0) throw utf32();
    return { encoding: 'utf-16le', length: 2 };
  }
  if (bytes[0] === 0xfe && bytes[1] === 0xff) return { encoding: 'utf-16be', length: 2 };
  if (bytes[0] === 0 && bytes[1] === 0 && bytes[2] === 0xfe && bytes[3] === 0xff) throw utf32();
  if (bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) return { encoding: 'utf-8', length: 3 };
  return { encoding: 'utf-8', length: 0 };
}

function utf32(): WaveformError {
  return new WaveformError('UNSUPPORTED_ENCODING', `The file is UTF-32 text. Export the capture as ${TEXT_EXPORTS}.`);
}

function unitsOf(bytes: Uint8Array, encoding: TextEncoding, mark: number): Units {
  if (encoding === 'utf-8') {
    const utf8 = new TextDecoder('utf-8', { fatal: true });
    const latin1 = new TextDecoder('latin1');
    return {
      length: bytes.length,
      from: mark,
      at: (i) => bytes[i],
      indexOf: (unit, from) => bytes.indexOf(unit, from),
      text: (from, to) => {
        const part = bytes.subarray(from, to);
        try {
          return utf8.decode(part);
        } catch {
          return latin1.decode(part);
        }
      },
    };
  }
  // A JavaScript string is UTF-16 code units, so an index into the decoded head is the unit's index in
  // the file after the mark, which is its offset in the scan stream.
  const even = mark + ((bytes.length - mark) & ~1);
  const text = new TextDecoder(encoding, { ignoreBOM: true }).decode(bytes.subarray(mark, even));
  return {
    length: text.length,
    from: 0,
    at: (i) => text.charCodeAt(i),
    indexOf: (unit, from) => text.indexOf(String.fromCharCode(unit), from),
    text: (from, to) => text.slice(from, to),
  };
}

function checkUnits(units: Units, encoding: TextEncoding): void {
  const end = Math.min(units.length, units.from + PROBE_UNITS);
  const probed = end - units.from;
  let nul = 0;
  let control = 0;
  let evenNul = 0;
  let ascii = 0;
  for (let i = units.from; i < end; i++) {
    const u = units.at(i);
    if (u < 0x80) ascii++;
    if (u === 0) {
      nul++;
      if ((i - units.from) % 2 === 0) evenNul++;
    } else if (u < 32 && u !== TAB && u !== LF && u !== CR && u !== 12 && u !== 26) control++;
  }
  // A capture is mostly digits and separators: binary data behind a UTF-16 mark decodes to a mix of
  // arbitrary characters instead.
  const mostlyAscii = encoding === 'utf-8' || ascii >= probed / 2;
  if (encoding === 'utf-8' && nul > probed / 4 && (evenNul === 0 || evenNul === nul)) {
    throw new WaveformError(
      'UNSUPPORTED_ENCODING',
      `The file looks like UTF-16 text without a byte-order mark, so its byte order is unknown. Export the capture as ${TEXT_EXPORTS}.`,
    );
  }
  if (nul > 0 || control > probed / 100 || !mostlyAscii) {
    throw new WaveformError(
      'NOT_TEXT',
      `The file is not a text export: it holds binary data. Export the capture from the instrument as ${TEXT_EXPORTS}.`,
    );
  }
}

/**
 * The encoding of a file from its first bytes; throws NOT_TEXT for binary data and UNSUPPORTED_ENCODING
 * for text the reader cannot decode.
 */
export function checkText(bytes: Uint8Array): TextEncoding {
  const { encoding, length } = byteOrderMark(bytes);
  checkUnits(unitsOf(bytes, encoding, length), encoding);
  return encoding;
}

function splitLines(units: Units, eol: number, complete: boolean): { lines: LineInfo[]; all: boolean } {
  const lines: LineInfo[] = [];
  let start = units.from;
  while (start < units.length && lines.length < MAX_LINES) {
    let end = units.indexOf(eol, start);
    if (end < 0) {
      if (!complete) break; // the head stops inside this line
      end = units.length;
    }
    let textEnd = end;
    if (eol === LF && textEnd > start && units.at(textEnd - 1) === CR) textEnd--;
    lines.push({ offset: start, text: units.text(start, textEnd) });
    start = end + 1;
  }
  return { lines, all: complete && start >= units.length };
}

/** Reads the head of `source` (its first MB) as lines of text. */
export async function readHead(source: ByteSource): Promise<Head> {
  const length = Math.min(source.size, HEAD_BYTES);
  const bytes = new Uint8Array(length);
  let got = 0;
  while (got < length) {
    const n = await source.read(bytes, got, length - got, got);
    if (n === 0) break;
    got += n;
  }
  if (got === 0) throw new WaveformError('EMPTY', 'The file is empty.');
  const head = bytes.subarray(0, got);
  const { encoding, length: mark } = byteOrderMark(head);
  const units = unitsOf(head, encoding, mark);
  checkUnits(units, encoding);
  const eol = units.indexOf(LF, units.from) >= 0 || units.indexOf(CR, units.from) < 0 ? LF : CR;
  const { lines, all } = splitLines(units, eol, got >= source.size);
  if (lines.every((l) => !l.text.trim())) throw new WaveformError('EMPTY', 'The file holds no text, only blank lines.');
  return { encoding, eol, lines, all };
}
