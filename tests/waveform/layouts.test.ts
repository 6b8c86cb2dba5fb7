// Captures in every supported layout, generated from known decays (V = V0·e^(−t/τ) + offset, common
// practice) with seeded noise: the fitted τ and the measured crossing must match the generator's
// parameters within 1 %.
import { describe, expect, test } from 'vitest';
import { analyseCaptureText } from '../../server/evidence/waveform/reader';
import { captureText, random, sampleDecay, voltageAt, type DecaySpec } from './capture-generator';
import { expectDecay, expectWithin, SAFE } from './expect-decay';

const base: DecaySpec = {
  v0: 400,
  tau: 0.1,
  offset: 2,
  t0: 0,
  start: -0.05,
  interval: 5e-5,
  samples: 20001,
  noise: 1,
  seed: 1,
};

describe('captures in each layout, known τ, noise and offset', () => {
  test('comma separated, scientific notation, negative pre-trigger time', async () => {
    const spec = { ...base };
    const { time, volts } = sampleDecay(spec);
    const text = captureText([
      { header: 'Time (s)', values: time },
      { header: 'CH1 (V)', values: volts },
    ]);
    const result = await analyseCaptureText(text, { safeVoltage: SAFE, maxTime: 0.5 });
    expectDecay(result, spec);
    expect(result).toMatchObject({ samples: 20001, skipped: 0, channel: 'CH1 (V)', channels: ['CH1 (V)'], t0Source: 'detected' });
    // 0.5 s = 5 τ after t0: V0·e^−5 + offset
    expect(Math.abs((result.vAtLimit ?? NaN) - voltageAt(spec, 0.5))).toBeLessThan(0.3);
    expect(Math.abs((result.offset ?? NaN) - 2)).toBeLessThan(0.4);
    expect(result.residualRms).toBeGreaterThan(0.9);
    expect(result.residualRms).toBeLessThan(1.1);
  });

  test('semicolons with decimal commas, time in milliseconds', async () => {
    const spec = { ...base, tau: 0.2, start: -0.1, interval: 1e-4, seed: 2 };
    const { time, volts } = sampleDecay(spec);
    const text = captureText(
      [
        { header: 'Time [ms]', values: time, scale: 1e-3, format: (x) => x.toFixed(4) },
        { header: 'CH1 [V]', values: volts, format: (x) => x.toFixed(3) },
      ],
      { sep: ';', decimalComma: true },
    );
    expect(text.split('\n')[2]).toMatch(/^-99,\d{4};\d+,\d{3}$/);
    const result = await analyseCaptureText(text, { safeVoltage: SAFE });
    expectDecay(result, spec);
    expect(result.notes.join(' ')).toMatch(/Time values were converted to seconds/);
  });

  test('tab separated, microseconds and a kilovolt channel', async () => {
    const spec = { ...base, v0: 1200, tau: 50e-6, offset: 0, start: -20e-6, interval: 25e-9, seed: 3, noise: 3 };
    const { time, volts } = sampleDecay(spec);
    const text = captureText(
      [
        { header: 't[us]', values: time, scale: 1e-6, format: (x) => x.toFixed(3) },
        { header: 'CH1 (kV)', values: volts, scale: 1e3, format: (x) => x.toExponential(6) },
      ],
      { sep: '\t' },
    );
    const result = await analyseCaptureText(text, { safeVoltage: SAFE });
    expectDecay(result, spec);
    expect(result.channel).toBe('CH1 (kV)');
  });

  test('metadata lines with start and sample interval instead of a time column, millivolt channel', async () => {
    const spec = { ...base, seed: 4 };
    const { volts } = sampleDecay(spec);
    const text = captureText([{ header: 'CH1 (mV)', values: volts, scale: 1e-3, format: (x) => x.toExponential(6) }], {
      metadata: ['Instrument,generic data logger', 'Record length,20001', 'Sample interval,5E-05', 'Start: -0.05', 'Probe ratio,100:1'],
    });
    const result = await analyseCaptureText(text, { safeVoltage: SAFE });
    expectDecay(result, spec);
    const notes = result.notes.join(' ');
    expect(notes).toMatch(/sample interval 0\.00005 s/);
    expect(notes).toMatch(/probe setting "100:1"/);
  });

  test('names and units on two header rows, quoted cells, CRLF line ends and a byte-order mark', async () => {
    const spec = { ...base, seed: 5 };
    const { time, volts } = sampleDecay(spec);
    const text = captureText(
      [
        { header: 'Time', values: time, scale: 1e-3, format: (x) => x.toFixed(3) },
        { header: 'Bus', values: volts, format: (x) => x.toFixed(3) },
      ],
      { headerRows: [['ms', 'V']], quote: true, eol: '\r\n', bom: true },
    );
    const result = await analyseCaptureText(text, { safeVoltage: SAFE });
    expectDecay(result, spec);
    expect(result.channels).toEqual(['Bus (V)']);
  });

  test('several channels, the disconnect marked by a relay channel', async () => {
    const spec = { ...base, t0: 0.0123, seed: 6 };
    const { time, volts } = sampleDecay(spec);
    const normal = random(60);
    const relay = time.map((t) => (t < spec.t0 ? 5 : 0) + 0.02 * (normal() - 0.5));
    const other = time.map(() => normal() - 0.5);
    const text = captureText([
      { header: 'Time (s)', values: time },
      { header: 'Relay (V)', values: relay },
      { header: 'CH2 (V)', values: volts },
      { header: 'CH3 (V)', values: other },
    ]);
    const result = await analyseCaptureText(text, { safeVoltage: SAFE, channel: 'CH2', markerChannel: 'Relay' });
    expectDecay(result, spec);
    expect(result.t0Source).toBe('marker');
    expect(Math.abs(result.t0 - spec.t0)).toBeLessThanOrEqual(spec.interval);
    expect(result.channels).toEqual(['Relay (V)', 'CH2 (V)', 'CH3 (V)']);
    expect(result.channel).toBe('CH2 (V)');
  });

  test('NaN, overflow and empty markers are skipped and counted', async () => {
    const spec = { ...base, seed: 7 };
    const { time, volts } = sampleDecay(spec);
    const pick = random(70);
    const markers = ['NaN', '', '9.9E+37', '-inf', '---', 'OVER', '-nan'];
    const rows = new Set<number>();
    while (rows.size < 60) rows.add(Math.floor(pick() * spec.samples));
    const replace = [...rows].map((row, i) => ({ row, column: i % 5 === 0 ? 0 : 1, text: markers[i % markers.length] }));
    const text = captureText(
      [
        { header: 'Time (s)', values: time },
        { header: 'CH1 (V)', values: volts },
      ],
      { replace },
    );
    const result = await analyseCaptureText(text, { safeVoltage: SAFE });
    expectDecay(result, spec);
    expect(result.skipped).toBe(60);
    expect(result.samples).toBe(spec.samples - 60);
  });

  test('a truncated last line is left out and counted', async () => {
    const spec = { ...base, seed: 8 };
    const { time, volts } = sampleDecay(spec);
    const whole = captureText([
      { header: 'Time (s)', values: time },
      { header: 'CH1 (V)', values: volts },
    ]);
    const text = whole.slice(0, whole.length - 9); // cuts into the last value, no line end
    const result = await analyseCaptureText(text, { safeVoltage: SAFE });
    expectDecay(result, spec);
    expect(result.skipped).toBe(1);
    expect(result.samples).toBe(spec.samples - 1);
    expect(result.notes.join(' ')).toMatch(/last line of the file is incomplete/);
  });

  test('a long record (200 000 rows) whose decay fills 2 % of it: summarised, then re-read where it matters', async () => {
    const spec = { ...base, tau: 0.05, start: -1, interval: 1e-4, samples: 200_001, noise: 2, seed: 9 };
    const { time, volts } = sampleDecay(spec);
    const text = captureText([
      { header: 'Time (s)', values: time },
      { header: 'CH1 (V)', values: volts },
    ]);
    const result = await analyseCaptureText(text, { safeVoltage: SAFE, maxTime: 1 });
    expectDecay(result, spec);
    expect(result.samples).toBe(200_001);
    expect(result.trace.length).toBeGreaterThan(1000);
  });
});

describe('imperfect but exponential traces', () => {
  const twoColumns = (time: number[], volts: number[]) =>
    captureText([
      { header: 'Time (s)', values: time },
      { header: 'CH1 (V)', values: volts },
    ]);

  test('a record that starts at the disconnect: t0 is its first sample', async () => {
    const spec = { ...base, start: 0, seed: 12 };
    const { time, volts } = sampleDecay(spec);
    const result = await analyseCaptureText(twoColumns(time, volts), { safeVoltage: SAFE });
    expectDecay(result, spec);
    expect(result.t0Source).toBe('start');
    expect(result.t0).toBe(0);
  });

  test('a switching transient at the disconnect (80 V dip for 0.5 ms) stays outside the fit window', async () => {
    const spec = { ...base, seed: 13 };
    const { time, volts } = sampleDecay(spec);
    const dipped = volts.map((v, i) => (time[i] >= 0 && time[i] < 5e-4 ? v - 80 : v));
    const result = await analyseCaptureText(twoColumns(time, dipped), { safeVoltage: SAFE });
    expectDecay(result, spec);
    // The window opens at the 90 % point of the decay itself: τ·ln(V0/(0.9·(V0 + offset) − offset))
    expect(Math.abs((result.fitWindow?.from ?? NaN) - 0.1 * Math.log(400 / (0.9 * 402 - 2)))).toBeLessThan(0.002);
  });

  test('ringing at the disconnect (20 V at 2 kHz, dying in 2 ms) on a noise-free decay', async () => {
    const spec = { ...base, noise: 0, seed: 15 };
    const { time, volts } = sampleDecay(spec);
    const ring = (t: number) => (t >= 0 ? 20 * Math.exp(-t / 0.002) * Math.sin(2 * Math.PI * 2000 * t) : 0);
    const result = await analyseCaptureText(
      twoColumns(
        time,
        volts.map((v, i) => v + ring(time[i])),
      ),
      { safeVoltage: SAFE },
    );
    expectDecay(result, spec);
  });

  test('8-bit quantisation of a 500 V range (1.95 V steps) and no noise', async () => {
    const spec = { ...base, noise: 0, seed: 14 };
    const { time, volts } = sampleDecay(spec);
    const step = 500 / 256;
    const result = await analyseCaptureText(
      twoColumns(
        time,
        volts.map((v) => Math.round(v / step) * step),
      ),
      { safeVoltage: SAFE },
    );
    expectDecay(result, spec);
  });
});

/** Two-column capture of a trace that is not an exponential, with what every such trace must give: a poor fit and no τ. */
async function analyseNonExponential(spec: DecaySpec) {
  const { time, volts } = sampleDecay(spec);
  const text = captureText([
    { header: 'Time (s)', values: time },
    { header: 'CH1 (V)', values: volts },
  ]);
  const result = await analyseCaptureText(text, { safeVoltage: SAFE });
  expect(result.fit).toBe('poor');
  expect(result.tau).toBeNull();
  return result;
}

/** Disconnect at 0 s, 0.2 s of pre-trigger, 0.1 ms sampling and 1 V of noise. */
const slowCapture = { t0: 0, start: -0.2, interval: 1e-4, noise: 1 } as const;

describe('non-exponential traces: crossing measured, no time constant invented', () => {
  test('constant-current active discharge, 600 µF from 450 V at 0.2 A ([S10] scenario, docs/DOMAIN.md §4 E4: 1.17 s)', async () => {
    const result = await analyseNonExponential({ ...slowCapture, shape: 'constant-current', v0: 450, slope: 0.2 / 600e-6, samples: 20001, seed: 10 });
    expectWithin(result.timeToSafe, 1.17, 0.01);
    expect(result.notes.join(' ')).toMatch(/Poor exponential fit/);
  });

  test('a converter still drawing constant power from the bus: V² = V0² − 2·(P/C)·t (energy balance)', async () => {
    // 20 W from 470 µF at 400 V: t(60 V) = C·(V0² − Vs²)/(2·P) = 1.838 s
    const result = await analyseNonExponential({
      ...slowCapture,
      shape: 'constant-power',
      v0: 400,
      powerPerFarad: 20 / 470e-6,
      samples: 22001,
      seed: 11,
    });
    expectWithin(result.timeToSafe, (470e-6 * (400 ** 2 - 60 ** 2)) / (2 * 20), 0.01);
  });
});
