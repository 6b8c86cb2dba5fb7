// Property: whatever layout a capture is written in (separator, decimal mark, quotes, line ends,
// metadata, number format, encoding), the numbers the reader returns are exactly the numbers written, as
// the JavaScript engine's own Number() reads the same text.
import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { readCaptureText } from '../../server/evidence/waveform/reader';
import { encodeText, type Encoding } from './capture-generator';

type Format = { kind: 'plain' } | { kind: 'exponential'; digits: number } | { kind: 'fixed'; digits: number };

function format(x: number, f: Format): string {
  switch (f.kind) {
    case 'plain':
      return String(x);
    case 'exponential':
      return x.toExponential(f.digits);
    case 'fixed':
      return x.toFixed(f.digits);
  }
}

const formatArb: fc.Arbitrary<Format> = fc.oneof(
  fc.constant<Format>({ kind: 'plain' }),
  fc.integer({ min: 0, max: 16 }).map<Format>((digits) => ({ kind: 'exponential', digits })),
  fc.integer({ min: 0, max: 9 }).map<Format>((digits) => ({ kind: 'fixed', digits })),
);

const value = fc.oneof(
  fc.double({ min: -1e6, max: 1e6, noNaN: true }),
  fc.double({ min: -1e-3, max: 1e-3, noNaN: true }),
  fc.integer({ min: -100000, max: 100000 }),
);

const captureArb = fc.integer({ min: 1, max: 4 }).chain((channels) =>
  fc.record({
    sep: fc.constantFrom(',', ';', '\t'),
    decimalComma: fc.boolean(),
    eol: fc.constantFrom('\n', '\r\n'),
    trailingNewline: fc.boolean(),
    metadata: fc.array(
      fc.constantFrom(
        'Instrument,bench scope',
        'Serial: 20931',
        'Operator=lab',
        'Coupling;DC',
        'Trigger\tfalling edge',
        '# Probe: 10X',
        '% Zone = Prüfplatz µ3',
      ),
      { maxLength: 4 },
    ),
    headers: fc.array(fc.constantFrom('CH', 'U', 'Probe '), { minLength: channels, maxLength: channels }),
    units: fc.array(fc.constantFrom('', ' (V)', ' [V]'), { minLength: channels, maxLength: channels }),
    timeFormat: formatArb,
    formats: fc.array(formatArb, { minLength: channels, maxLength: channels }),
    start: fc.double({ min: -1000, max: 1000, noNaN: true }),
    steps: fc.array(fc.double({ min: 1e-6, max: 10, noNaN: true }), { minLength: 1, maxLength: 60 }),
    values: fc.array(fc.array(value, { minLength: channels, maxLength: channels }), { minLength: 60, maxLength: 60 }),
    encoding: fc.constantFrom<Encoding>('utf-8', 'utf-8-bom', 'utf-16le', 'utf-16be'),
  }),
);

describe('reader round trip (fast-check, seeded)', () => {
  test('every number written is read back exactly', async () => {
    await fc.assert(
      fc.asyncProperty(captureArb, async (c) => {
        // A decimal comma needs quotes when the separator is a comma too.
        const quote = c.decimalComma && c.sep === ',';
        const cell = (x: number, f: Format) => {
          const text = format(x, f);
          const written = c.decimalComma ? text.replace('.', ',') : text;
          return { written: quote ? `"${written}"` : written, expected: Number(text) };
        };
        const rows = c.steps.length;
        let t = c.start;
        const expectedTime: number[] = [];
        const expectedValues: number[][] = c.headers.map(() => []);
        const lines = [...c.metadata, ['Time (s)', ...c.headers.map((h, i) => `${h}${i + 1}${c.units[i]}`)].join(c.sep)];
        for (let r = 0; r < rows; r++) {
          t += c.steps[r];
          const time = cell(t, c.timeFormat);
          expectedTime.push(time.expected);
          const cells = [time.written];
          c.values[r].forEach((v, k) => {
            const written = cell(v, c.formats[k]);
            expectedValues[k].push(written.expected);
            cells.push(written.written);
          });
          lines.push(cells.join(c.sep));
        }
        const text = lines.join(c.eol) + (c.trailingNewline ? c.eol : '');
        const table = await readCaptureText(encodeText(text, c.encoding));
        // A last line without a line end may be judged cut off; then it, and only it, is left out.
        const kept = table.truncatedLastLine ? rows - 1 : rows;
        if (table.truncatedLastLine) expect(c.trailingNewline).toBe(false);
        expect(table.skipped).toBe(rows - kept);
        expect(table.channels).toHaveLength(c.headers.length);
        expect(table.time).toEqual(expectedTime.slice(0, kept));
        table.values.forEach((column, k) => expect(column).toEqual(expectedValues[k].slice(0, kept)));
      }),
      { seed: 20250517, numRuns: 300 },
    );
  });
});
