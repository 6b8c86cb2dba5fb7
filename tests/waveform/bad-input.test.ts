// Files that are not usable captures get a WaveformError with a code and a sentence; a capture that
// never reaches the safe voltage is a valid, failing measurement.
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import { afterAll, describe, expect, test } from 'vitest';
import {
  WaveformError,
  analyseCaptureFile,
  analyseCaptureText,
  outlineCaptureFile,
  type WaveformErrorCode,
} from '../../server/evidence/waveform/reader';
import { captureText, encodeText, random, sampleDecay, timeToLevel, type DecaySpec } from './capture-generator';

const dir = mkdtempSync(join(tmpdir(), 'vf-waveform-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function file(name: string, content: string | Uint8Array): string {
  const path = join(dir, name);
  writeFileSync(path, content);
  return path;
}

async function failure(run: Promise<unknown>): Promise<WaveformError> {
  const error = await run.then(
    () => null,
    (e: unknown) => e,
  );
  expect(error).toBeInstanceOf(WaveformError);
  return error as WaveformError;
}

async function expectCode(run: Promise<unknown>, code: WaveformErrorCode, message: RegExp): Promise<void> {
  const error = await failure(run);
  expect(error.code).toBe(code);
  expect(error.message).toMatch(message);
}

const options = { safeVoltage: 60 };

const spec: DecaySpec = { v0: 400, tau: 0.1, t0: 0, start: -0.02, interval: 1e-4, samples: 3001, noise: 0.5, seed: 21 };
const good = () => {
  const { time, volts } = sampleDecay(spec);
  return captureText([
    { header: 'Time (s)', values: time },
    { header: 'CH1 (V)', values: volts },
  ]);
};

describe('files that are not captures', () => {
  test('an empty file', async () => {
    await expectCode(analyseCaptureFile(file('empty.csv', ''), options), 'EMPTY', /empty/);
  });

  test('a file of blank lines', async () => {
    await expectCode(analyseCaptureFile(file('blank.csv', '\n\r\n  \n'), options), 'EMPTY', /blank/);
  });

  test('binary bytes renamed .csv (a PNG header followed by noise), named with the text formats to export instead', async () => {
    const rand = random(22);
    const bytes = new Uint8Array(4096).map(() => Math.floor(rand() * 256));
    bytes.set([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13]);
    await expectCode(
      analyseCaptureFile(file('photo.csv', bytes), options),
      'NOT_TEXT',
      /binary data\. Export the capture from the instrument as CSV .*, TSV .* or TXT/,
    );
  });

  test('a binary record behind a UTF-16 byte-order mark is still binary', async () => {
    const noise = random(23);
    const samples = new Float32Array(2048).map((_, i) => 400 * Math.exp(-i / 500) + noise());
    const bytes = Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(samples.buffer)]);
    await expectCode(analyseCaptureFile(file('record.bin', bytes), options), 'NOT_TEXT', /CSV .*TSV .*TXT/);
  });

  test('UTF-16 without a byte-order mark, and UTF-32, are refused naming the encodings that are read', async () => {
    await expectCode(
      analyseCaptureFile(file('utf16.csv', Buffer.from(good(), 'utf16le')), options),
      'UNSUPPORTED_ENCODING',
      /without a byte-order mark.*UTF-16 with a byte-order mark/,
    );
    const utf32 = Buffer.alloc(4 * 200);
    utf32.set([0xff, 0xfe, 0, 0]);
    [...good().slice(0, 199)].forEach((c, i) => utf32.writeUInt32LE(c.charCodeAt(0), 4 + 4 * i));
    await expectCode(analyseCaptureFile(file('utf32.csv', utf32), options), 'UNSUPPORTED_ENCODING', /UTF-32/);
  });

  test('a UTF-16 file cut in the middle of a code unit loses only its last line', async () => {
    const bytes = encodeText(good(), 'utf-16le');
    // 13 bytes: the line end, five characters and half of the sixth, as the UTF-8 case above loses 6 bytes.
    const result = await analyseCaptureFile(file('cut16.csv', bytes.subarray(0, bytes.length - 13)), options);
    expect(result.skipped).toBe(1);
    expect(result.samples).toBe(spec.samples - 1);
  });

  test('property (fast-check, seeded): any bytes, behind any byte-order mark, give an analysis or a WaveformError', async () => {
    const marks = [[], [0xef, 0xbb, 0xbf], [0xff, 0xfe], [0xfe, 0xff]];
    const body = fc.oneof(
      fc.uint8Array({ maxLength: 600 }),
      fc
        .array(fc.constantFrom('0', '1', '5', '.', ',', ';', '\t', '\n', '\r', '-', 'e', 'E', ' ', '"', '#', ':', '=', 'V', 's', 'µ'), {
          maxLength: 600,
        })
        .map((cs) => cs.join('')),
    );
    await fc.assert(
      fc.asyncProperty(fc.constantFrom(...marks), body, fc.boolean(), async (mark, content, wide) => {
        const text = typeof content === 'string' ? Buffer.from(content, wide ? 'utf16le' : 'utf8') : Buffer.from(content);
        const bytes = Buffer.concat([Buffer.from(mark), text]);
        const outcome = await analyseCaptureText(bytes, options).then(
          () => null,
          (e: unknown) => e,
        );
        if (outcome !== null) expect(outcome).toBeInstanceOf(WaveformError);
      }),
      { seed: 20250519, numRuns: 400 },
    );
  });

  test('a CSV with no numeric columns', async () => {
    const text = 'Name,Role\nAda,engineer\nGrace,reviewer\n';
    await expectCode(analyseCaptureFile(file('people.csv', text), options), 'NO_NUMERIC_COLUMNS', /No rows of numbers/);
  });

  test('numbers but no time column and no sample interval', async () => {
    const text = `CH1 (V)\n${Array.from({ length: 40 }, (_, i) => 400 - i).join('\n')}\n`;
    await expectCode(analyseCaptureText(text, options), 'NO_TIME_BASE', /no time column/);
  });

  test('time running backwards names the row', async () => {
    const lines = good().split('\n');
    [lines[1001], lines[1002]] = [lines[1002], lines[1001]];
    await expectCode(analyseCaptureFile(file('backwards.csv', lines.join('\n')), options), 'TIME_NOT_INCREASING', /data row 1002 \(line 1003\)/);
  });

  test('too few samples to analyse', async () => {
    await expectCode(analyseCaptureText('Time (s),CH1 (V)\n0,400\n0.1,300\n0.2,200\n', options), 'TOO_FEW_SAMPLES', /Only 3/);
  });

  test('a channel that is not in the file', async () => {
    await expectCode(analyseCaptureText(good(), { ...options, channel: 'CH7' }), 'CHANNEL_NOT_FOUND', /CH1 \(V\)/);
    await expectCode(analyseCaptureText(good(), { ...options, channel: 3 }), 'CHANNEL_NOT_FOUND', /1 channel/);
  });

  test('a t0 outside the capture', async () => {
    await expectCode(analyseCaptureText(good(), { ...options, t0: 5 }), 'T0_OUT_OF_RANGE', /outside the capture/);
  });
});

describe('captures that are usable but imperfect', () => {
  test('never reaching the safe voltage is a valid result with no crossing', async () => {
    // A bus that settles at 75 V (a source still connected): exponential, but above 60 V for good.
    const stuck: DecaySpec = { ...spec, v0: 325, offset: 75, samples: 10001 };
    const { time, volts } = sampleDecay(stuck);
    const text = captureText([
      { header: 'Time (s)', values: time },
      { header: 'CH1 (V)', values: volts },
    ]);
    const result = await analyseCaptureFile(file('stuck.csv', text), { safeVoltage: 60, maxTime: 0.5 });
    expect(result.timeToSafe).toBeNull();
    expect(result.fit).toBe('good');
    expect(Math.abs((result.tau ?? NaN) - 0.1)).toBeLessThan(0.001);
    expect(Math.abs((result.vAtLimit ?? NaN) - (325 * Math.exp(-5) + 75))).toBeLessThan(0.5);
    expect(result.notes.join(' ')).toMatch(/does not fall below 60 V and stay there/);
  });

  test('a capture that stops before the time limit has no voltage at the limit', async () => {
    const result = await analyseCaptureText(good(), { safeVoltage: 60, maxTime: 2 });
    expect(result.vAtLimit).toBeNull();
    expect(Math.abs((result.timeToSafe ?? NaN) - timeToLevel(spec, 60))).toBeLessThan(0.01 * timeToLevel(spec, 60));
  });

  test('a truncated final line (file cut off mid-number) is counted, not fatal', async () => {
    const text = good();
    const cut = text.slice(0, text.length - 6);
    const result = await analyseCaptureFile(file('cut.csv', cut), options);
    expect(result.skipped).toBe(1);
    expect(result.samples).toBe(spec.samples - 1);
  });

  test('a final line without a line end is kept when it is whole', async () => {
    const result = await analyseCaptureText(good().trimEnd(), options);
    expect(result.skipped).toBe(0);
    expect(result.samples).toBe(spec.samples);
  });

  test('a bus that does not discharge at all: no fall, no crossing, no time constant', async () => {
    const flat: DecaySpec = { ...spec, t0: 10, samples: 2001 };
    const { time, volts } = sampleDecay(flat);
    const text = captureText([
      { header: 'Time (s)', values: time },
      { header: 'CH1 (V)', values: volts },
    ]);
    const result = await analyseCaptureText(text, { safeVoltage: 60 });
    expect(result).toMatchObject({ timeToSafe: null, tau: null, fit: 'poor', t0Source: 'start' });
    expect(result.notes.join(' ')).toMatch(/No fall was found/);
  });

  test('a marker channel without an edge falls back to detecting the decay', async () => {
    const { time, volts } = sampleDecay(spec);
    const text = captureText([
      { header: 'Time (s)', values: time },
      { header: 'Relay (V)', values: time.map(() => 5) },
      { header: 'Bus (V)', values: volts },
    ]);
    const result = await analyseCaptureText(text, { safeVoltage: 60, channel: 'Bus', markerChannel: 'Relay' });
    expect(result.t0Source).toBe('detected');
    expect(result.notes.join(' ')).toMatch(/Marker channel "Relay \(V\)" is constant/);
    expect(Math.abs((result.timeToSafe ?? NaN) - timeToLevel(spec, 60))).toBeLessThan(0.01 * timeToLevel(spec, 60));
  });

  test('a sample-number column is neither time nor a channel', async () => {
    const { volts } = sampleDecay(spec);
    const text = captureText(
      [
        { header: 'Index', values: volts.map((_, i) => i), format: String },
        { header: 'CH1 (V)', values: volts },
      ],
      { metadata: [`Sample interval,${spec.interval}`, `Start,${spec.start}`] },
    );
    const result = await analyseCaptureText(text, { safeVoltage: 60 });
    expect(result.channels).toEqual(['CH1 (V)']);
    expect(result.notes.join(' ')).toMatch(/"Index" is taken as a sample number/);
    expect(Math.abs((result.timeToSafe ?? NaN) - timeToLevel(spec, 60))).toBeLessThan(0.01 * timeToLevel(spec, 60));
    await expectCode(analyseCaptureText(text.split('\n').slice(2).join('\n'), { safeVoltage: 60 }), 'NO_TIME_BASE', /no time column/);
  });

  test('the outline lists the channels before any analysis', async () => {
    const outline = await outlineCaptureFile(file('outline.csv', good()));
    expect(outline).toEqual({ channels: ['CH1 (V)'], timeColumn: 'Time (s)', notes: [] });
  });
});
