// Captures as bench instruments and loggers write them: metadata lines in every common style, UTF-16 and
// UTF-8 with a byte-order mark, a voltage scale entered with the capture, a probe ratio stated in the
// file. Each capture is generated from a known decay (capture-generator.ts: the analytic RC law
// V = V0·e^(−t/τ) + offset, common practice) or simulated by ngspice, and the analysis must match that
// truth within 1 %.
import { describe, expect, test } from 'vitest';
import { analyseCaptureText } from '../../server/evidence/waveform/reader';
import type { WaveformAnalysis } from '../../shared/schema/waveform';
import { captureText, encodeText, random, sampleDecay, timeToLevel, type DecaySpec, type Encoding } from './capture-generator';
import { expectDecay, expectWithin, SAFE } from './expect-decay';
import { spiceCapture } from './spice-capture';

const base: DecaySpec = { v0: 400, tau: 0.1, offset: 2, t0: 0, start: -0.05, interval: 5e-5, samples: 8001, noise: 1, seed: 41 };

describe('metadata lines in the styles exports use, one column on start + increment (truth: the RC law)', () => {
  // Each style states start −0.05 s and interval 50 µs, in its own notation and units.
  const styles: Array<[string, string[], boolean]> = [
    ['key,value', ['Start,-0.05', 'Increment,5E-05'], true],
    ['key;value', ['Start;-0.05', 'Sample interval;5E-05'], true],
    ['# key: value with units after the value', ['# start: -0.05 s', '# increment: 0.05 ms'], false],
    ['% key = value in ms and µs', ['% Start = -50 ms', '% Sample interval = 50 µs'], false],
    ['#key:value, a bracketed unit', ['#Start time:-50000 us', '#Sample interval: 5E-05 [s]'], true],
    ['# key = sample rate', ['# x start = -0.05 s', '# sample rate = 20 kS/s'], false],
    ['unit on the key', ['Start (s),-0.05', 'Sample interval (ms),0.05'], true],
    ['quoted cells', ['"Start","-0.05"', '"Increment","5E-05"'], true],
  ];
  test.each(styles)('%s', async (_style, metadata, header) => {
    const spec = { ...base, seed: 42 };
    const { volts } = sampleDecay(spec);
    const text = captureText([{ header: 'CH1 (V)', values: volts, format: (x) => x.toFixed(3) }], {
      metadata: ['Instrument: bench logger', ...metadata],
      headerRows: header ? [] : null,
    });
    const result = await analyseCaptureText(text, { safeVoltage: SAFE });
    expectDecay(result, spec);
    expect(result.notes.join(' ')).toMatch(/start -0\.05 s and sample interval 0\.00005 s/);
  });

  test('semicolons and decimal commas in one column, metadata with decimal commas', async () => {
    const spec = { ...base, seed: 43 };
    const { volts } = sampleDecay(spec);
    const text = captureText([{ header: 'U (V)', values: volts, format: (x) => x.toFixed(3) }], {
      sep: ';',
      decimalComma: true,
      metadata: ['# Start; -0,05 s', '# Increment; 0,05 ms'],
    });
    expect(text).toMatch(/\n40\d,\d{3}\n/);
    expectDecay(await analyseCaptureText(text, { safeVoltage: SAFE }), spec);
  });

  test('a comment line right above the values is metadata, not a header (the one-column case that was refused)', async () => {
    const spec = { ...base, seed: 44 };
    const { volts } = sampleDecay(spec);
    const text = captureText([{ header: 'unused', values: volts }], { headerRows: null, metadata: ['# start: -0.05 s', '# increment: 5e-5 s'] });
    const result = await analyseCaptureText(text, { safeVoltage: SAFE });
    expectDecay(result, spec);
    expect(result.channels).toEqual(['column 1']);
  });

  test('a header row written as a comment ("# Time (s),CH1 (V)")', async () => {
    const spec = { ...base, seed: 45 };
    const { time, volts } = sampleDecay(spec);
    const text = captureText(
      [
        { header: '# Time (s)', values: time },
        { header: 'CH1 (V)', values: volts },
      ],
      { metadata: ['# exported by a bench logger'] },
    );
    const result = await analyseCaptureText(text, { safeVoltage: SAFE });
    expectDecay(result, spec);
    expect(result.notes.join(' ')).not.toMatch(/No column is named as time/);
  });
});

/** The analysis without the fields that say how the file was decoded. */
function numbers(result: WaveformAnalysis) {
  const { encoding: _encoding, notes, ...rest } = result;
  return { ...rest, notes: notes.filter((n) => !/decoded from/.test(n)) };
}

describe('UTF-16 LE/BE and UTF-8 with a byte-order mark read exactly as plain UTF-8', () => {
  const encodings: Encoding[] = ['utf-8-bom', 'utf-16le', 'utf-16be'];
  const layouts: Array<[string, () => { text: string; spec: DecaySpec; options: object; exponential: boolean }]> = [
    [
      'comma separated, scientific notation',
      () => {
        const spec = { ...base, seed: 51 };
        const { time, volts } = sampleDecay(spec);
        return {
          text: captureText([
            { header: 'Time (s)', values: time },
            { header: 'CH1 (V)', values: volts },
          ]),
          spec,
          options: {},
          exponential: true,
        };
      },
    ],
    [
      'semicolons, decimal commas, time in ms, CRLF',
      () => {
        const spec = { ...base, tau: 0.2, start: -0.1, interval: 1e-4, seed: 52 };
        const { time, volts } = sampleDecay(spec);
        const columns = [
          { header: 'Zeit [ms]', values: time, scale: 1e-3, format: (x: number) => x.toFixed(4) },
          { header: 'Spannung [V]', values: volts, format: (x: number) => x.toFixed(3) },
        ];
        return {
          text: captureText(columns, { sep: ';', decimalComma: true, eol: '\r\n', metadata: ['Gerät;Prüfplatz 3 (Ω-Messung aus)'] }),
          spec,
          options: {},
          exponential: true,
        };
      },
    ],
    [
      'tab separated, µs and kV',
      () => {
        const spec = { ...base, v0: 1200, tau: 50e-6, offset: 0, start: -20e-6, interval: 25e-9, seed: 53, noise: 3 };
        const { time, volts } = sampleDecay(spec);
        const columns = [
          { header: 't (µs)', values: time, scale: 1e-6, format: (x: number) => x.toFixed(3) },
          { header: 'CH1 (kV)', values: volts, scale: 1e3, format: (x: number) => x.toExponential(6) },
        ];
        return { text: captureText(columns, { sep: '\t' }), spec, options: {}, exponential: true };
      },
    ],
    [
      'one column on "# start" / "# increment" metadata',
      () => {
        const spec = { ...base, seed: 54 };
        const { volts } = sampleDecay(spec);
        const text = captureText([{ header: 'x', values: volts, format: (x) => x.toFixed(3) }], {
          headerRows: null,
          metadata: ['# start: -50 ms', '# increment: 50 µs'],
        });
        return { text, spec, options: {}, exponential: true };
      },
    ],
    [
      'a relay marker channel among three',
      () => {
        const spec = { ...base, t0: 0.0123, seed: 55 };
        const { time, volts } = sampleDecay(spec);
        const normal = random(56);
        const columns = [
          { header: 'Time (s)', values: time },
          { header: 'Relay (V)', values: time.map((t) => (t < spec.t0 ? 5 : 0) + 0.02 * (normal() - 0.5)) },
          { header: 'CH2 (V)', values: volts },
          { header: 'CH3 (V)', values: time.map(() => normal() - 0.5) },
        ];
        return { text: captureText(columns), spec, options: { channel: 'CH2', markerChannel: 'Relay' }, exponential: true };
      },
    ],
    [
      'a constant-current active discharge ([S10] scenario, docs/DOMAIN.md §4 E4: 1.17 s)',
      () => {
        const spec: DecaySpec = {
          shape: 'constant-current',
          v0: 450,
          slope: 0.2 / 600e-6,
          t0: 0,
          start: -0.2,
          interval: 2e-4,
          samples: 8001,
          noise: 1,
          seed: 57,
        };
        const { time, volts } = sampleDecay(spec);
        return {
          text: captureText([
            { header: 'Time (s)', values: time },
            { header: 'CH1 (V)', values: volts },
          ]),
          spec,
          options: {},
          exponential: false,
        };
      },
    ],
  ];
  for (const [name, make] of layouts) {
    test.each(encodings)(`${name}, %s`, async (encoding) => {
      const { text, spec, options, exponential } = make();
      const plain = await analyseCaptureText(text, { safeVoltage: SAFE, ...options });
      const result = await analyseCaptureText(encodeText(text, encoding), { safeVoltage: SAFE, ...options });
      if (exponential) expectDecay(result, spec);
      else {
        expect(result.fit).toBe('poor');
        expectWithin(result.timeToSafe, timeToLevel(spec, SAFE), 0.01);
      }
      expect(result.encoding).toBe(encoding === 'utf-8-bom' ? 'utf-8' : encoding);
      expect(numbers(result)).toEqual(numbers(plain));
    });
  }

  test('names and units with characters outside ASCII survive UTF-16', async () => {
    const spec = { ...base, seed: 58 };
    const { time, volts } = sampleDecay(spec);
    const text = captureText([
      { header: 'Zeit (µs)', values: time, scale: 1e-6, format: (x) => x.toFixed(1) },
      { header: 'Zwischenkreis Ü (V)', values: volts },
    ]);
    const result = await analyseCaptureText(encodeText(text, 'utf-16le'), { safeVoltage: SAFE, channel: 'Zwischenkreis Ü' });
    expectDecay(result, spec);
    expect(result.channels).toEqual(['Zwischenkreis Ü (V)']);
    expect(result.notes).toContain('The file was decoded from UTF-16 LE text (byte-order mark).');
  });

  test('an ngspice transient of the [S2] bleeder (docs/DOMAIN.md §4 E1) written as UTF-16 BE: τ = R·C and the crossing ngspice measures', async () => {
    const e1 = { v0: 360, capacitance: 1.32e-6, resistance: 220e3, open: 0.1, stop: 1.6, step: 2e-4 };
    const capture = await spiceCapture(e1, SAFE);
    const result = await analyseCaptureText(encodeText(capture.text, 'utf-16be'), { safeVoltage: SAFE, channel: 'Bus', markerChannel: 'Relay' });
    expectWithin(result.tau, e1.resistance * e1.capacitance, 0.01);
    expectWithin(result.timeToSafe, capture.measuredCrossing, 0.01);
  });
});

describe('a voltage scale entered with the capture, and a probe ratio stated in the file', () => {
  // The file holds probe-side volts of a 100:1 probe: 4 V for a 400 V bus.
  const spec = { ...base, seed: 61 };
  const probeSide = () => {
    const { time, volts } = sampleDecay(spec);
    return captureText(
      [
        { header: 'Time (s)', values: time },
        { header: 'CH1 (V)', values: volts, scale: 100 },
      ],
      { metadata: ['Probe attenuation: 100:1'] },
    );
  };

  test('the entered scale is applied; the stated ratio is a warning, never applied on its own', async () => {
    const result = await analyseCaptureText(probeSide(), { safeVoltage: SAFE, scale: 100 });
    expectDecay(result, spec);
    expect(result).toMatchObject({ scale: 100, probeRatio: '100:1' });
    expect(result.warnings).toHaveLength(1);
    expect(result.warnings?.[0]).toMatch(/probe setting "100:1"; it was not applied\. The voltage scale ×100 entered with the capture was applied/);
    expect(result.notes).toContain(result.warnings?.[0]);
    expect(result.notes.join(' ')).toMatch(/multiplied by 100, the voltage scale entered/);
  });

  test('without a scale the values stay as exported and the warning says how to scale them', async () => {
    const result = await analyseCaptureText(probeSide(), { safeVoltage: SAFE });
    expectWithin(result.v0, (spec.v0 + (spec.offset ?? 0)) / 100, 0.01);
    expect(result.scale).toBe(1);
    expect(result.warnings?.[0]).toMatch(
      /it was not applied\. If the exported values are probe-side volts, upload the capture again with that ratio as the voltage scale/,
    );
    // 4 V throughout reads as safe at once; the analysis says that it proves no discharge.
    expect(result.timeToSafe).toBe(0);
    expect(result.warnings?.[1]).toMatch(/never rises above 60 V in the capture, so it shows no discharge from a hazardous level/);
  });

  test('a scale on a file without a probe setting is a note, not a warning', async () => {
    const { time, volts } = sampleDecay(spec);
    const text = captureText([
      { header: 'Time (s)', values: time },
      { header: 'CH1 (mV)', values: volts, scale: 1e-3 * 10 },
    ]);
    // Values in mV of a 10:1 divider: unit ×0.001, then the entered ×10.
    const result = await analyseCaptureText(text, { safeVoltage: SAFE, scale: 10 });
    expectDecay(result, spec);
    expect(result.warnings).toEqual([]);
  });
});
