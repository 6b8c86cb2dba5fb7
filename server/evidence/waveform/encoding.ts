// The bytes the scanner reads. UTF-8 (and ASCII) files are scanned as they are. A UTF-16 file is
// transcoded on the fly, one byte per 16-bit code unit: ASCII units become their byte and every other
// unit the substitute character (SUB), which no number, separator or line end contains. The scanner only
// ever needs ASCII (the head, where names and units may hold other characters, is decoded exactly in
// head.ts), and one byte per unit keeps offsets linear: scan offset k is file offset 2 + 2k. That lets
// the analysis re-read any byte range (a zoom) without a table of offsets, and the transcoding happens
// inside each positioned read, so memory stays bounded and the file is still read once per pass.
import type { TextEncoding } from './head';
import type { ByteSource } from './source';

const MARK = 2;
const SUB = 0x1a;

const utf8 = new TextEncoder();

/**
 * Units per native conversion: its string stays small enough for V8's young generation, where it dies
 * cheaply; one string per 1 MB chunk went to the large-object space and raised the peak RSS by ~60 MB.
 */
const SLICE_UNITS = 1 << 14;

/**
 * Little-endian units to one byte each: ASCII to its byte, anything else to SUB. An all-ASCII slice goes
 * through Node's native decoder and encoder (for ASCII, UTF-8 is one byte per unit, so a complete write
 * of exactly one byte per unit proves the slice was ASCII); measured here at ~500 million units a second
 * against ~110 million for the plain loop, which handles every other slice.
 */
function narrow(raw: Buffer, count: number, into: Uint8Array, at: number): void {
  for (let from = 0; from < count; from += SLICE_UNITS) {
    const to = Math.min(count, from + SLICE_UNITS);
    const text = raw.toString('utf16le', 2 * from, 2 * to);
    const done = utf8.encodeInto(text, into.subarray(at + from, at + to));
    if (done.read === text.length && done.written === to - from) continue;
    for (let i = from; i < to; i++) {
      const u = raw[2 * i] | (raw[2 * i + 1] << 8);
      into[at + i] = u < 0x80 ? u : SUB;
    }
  }
}

function utf16Source(file: ByteSource, bigEndian: boolean): ByteSource {
  const size = Math.max(0, (file.size - MARK) >> 1);
  let spare: ArrayBuffer | null = null;
  return {
    size,
    async read(into, at, length, position) {
      const want = Math.max(0, Math.min(length, size - position));
      if (want === 0) return 0;
      // One raw buffer, reused while reads come one at a time (as every pass issues them); a read that
      // overlaps another gets its own.
      const reuse = spare !== null && spare.byteLength >= 2 * want ? spare : null;
      spare = null;
      const raw = reuse ?? new ArrayBuffer(2 * want);
      const bytes = new Uint8Array(raw, 0, 2 * want);
      let got = 0;
      while (got < bytes.length) {
        const n = await file.read(bytes, got, bytes.length - got, MARK + 2 * position + got);
        if (n === 0) break;
        got += n;
      }
      const count = got >> 1;
      const units = Buffer.from(raw, 0, 2 * count);
      if (bigEndian) units.swap16();
      narrow(units, count, into, at);
      spare = raw;
      return count;
    },
    close: () => file.close(),
  };
}

/** The scan stream of a file in `encoding`. */
export function scanSource(file: ByteSource, encoding: TextEncoding): ByteSource {
  return encoding === 'utf-8' ? file : utf16Source(file, encoding === 'utf-16be');
}
