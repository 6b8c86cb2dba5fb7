import { open } from 'node:fs/promises';
import { fileTypeFromFile } from 'file-type';
import { AppError } from '../errors';
import { TEXT_EXPORTS, WaveformError } from './waveform/errors';
import { checkText } from './waveform/head';

export type EvidenceKind = 'waveform' | 'image' | 'datasheet' | 'report' | 'other';

const ACCEPTED: Record<Exclude<EvidenceKind, 'other'>, { mimes: string[]; words: string }> = {
  waveform: { mimes: ['text/plain'], words: 'a text capture (CSV, TSV or TXT)' },
  image: { mimes: ['image/png', 'image/jpeg'], words: 'a PNG or JPEG image' },
  datasheet: { mimes: ['application/pdf'], words: 'a PDF' },
  report: { mimes: ['application/pdf'], words: 'a PDF' },
};

// What a download may be labelled as: types a browser shows inertly or hands to a viewer. Everything
// else — HTML, SVG, JavaScript, XML, unknown — is served as application/octet-stream.
const SERVED_TYPES = new Set([
  'text/plain',
  'text/csv',
  'text/tab-separated-values',
  'application/pdf',
  'image/png',
  'image/jpeg',
  'image/gif',
  'image/webp',
  'image/tiff',
  'image/bmp',
  'application/zip',
]);

/** The media type a stored file is served with: its sniffed type when on the allow-list, else a plain byte stream. */
export function servedMediaType(sniffed: string): string {
  return SERVED_TYPES.has(sniffed) ? sniffed : 'application/octet-stream';
}

/**
 * How the first bytes read as text: null for binary (NUL bytes, as binary formats nearly always have,
 * outside UTF-16), else whether they carry a UTF-16 byte-order mark. Text the capture reader cannot
 * decode still counts as text here, so that the reader's own message says why.
 */
async function textKind(path: string): Promise<'utf-16' | 'text' | null> {
  const handle = await open(path, 'r');
  try {
    const buffer = Buffer.alloc(64 * 1024);
    const { bytesRead } = await handle.read(buffer, 0, buffer.length, 0);
    const encoding = checkText(buffer.subarray(0, bytesRead));
    return encoding === 'utf-8' ? 'text' : 'utf-16';
  } catch (err) {
    if (err instanceof WaveformError) return err.code === 'NOT_TEXT' ? null : 'text';
    throw err;
  } finally {
    await handle.close();
  }
}

/**
 * The media type from the bytes themselves, never from the file name; refuses a file whose bytes do
 * not match the kind it was uploaded as.
 */
export async function sniffMediaType(path: string, kind: EvidenceKind, originalName: string): Promise<string> {
  const text = await textKind(path);
  // A UTF-16 byte-order mark (FF FE) also opens an MPEG audio frame header, so text decides first.
  const detected = text === 'utf-16' ? undefined : await fileTypeFromFile(path);
  const mime = detected?.mime ?? (text ? 'text/plain' : 'application/octet-stream');
  if (kind === 'other') return servedMediaType(mime);
  const rule = ACCEPTED[kind];
  if (!rule.mimes.includes(mime)) {
    const exportHint = kind === 'waveform' ? ` Export the capture from the instrument as ${TEXT_EXPORTS}.` : '';
    throw new AppError(422, 'wrong_content', `“${originalName}” is not ${rule.words}: its bytes look like ${mime}.${exportHint}`, [
      { path: 'file', message: `expected ${rule.words}` },
    ]);
  }
  return kind === 'waveform'
    ? /\.tsv$/i.test(originalName)
      ? 'text/tab-separated-values'
      : /\.csv$/i.test(originalName)
        ? 'text/csv'
        : 'text/plain'
    : mime;
}

/**
 * Keeps a file name as harmless metadata: no path, no control characters, no bidirectional overrides
 * (they make "gpj.exe" read as "exe.jpg"), bounded length; every other character stays as typed (NFC).
 */
export function sanitiseFileName(name: string): string {
  const base = name.normalize('NFC').split(/[\\/]/).pop() ?? '';
  const clean = base
    .replace(/[\u0000-\u001f\u007f\u202a-\u202e\u2066-\u2069]/g, '') // eslint-disable-line no-control-regex -- control characters are exactly what is removed.
    .replace(/^\.+/, '')
    .trim();
  // Cut by code points so a character outside the BMP is never split in half.
  return [...clean].slice(0, 200).join('').trim() || 'unnamed';
}
