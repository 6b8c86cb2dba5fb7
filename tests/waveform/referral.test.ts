// Measured evidence referred to the requirement's conditions (docs/DOMAIN.md §5.3), on captures that
// ngspice (an independent circuit simulator) produces of the [S2] bleeder example (docs/DOMAIN.md §4 E1:
// 1.32 µF, 220 kΩ, 360 V maximum → 60 V within 0.75 s; τ = 0.290 s, t = 0.520 s).
import { describe, expect, test } from 'vitest';
import { analyseCaptureText } from '../../server/evidence/waveform/reader';
import { measuredDischargeCheck, type MeasuredConditions, type PredictedDecay } from '../../shared/engine/measured';
import { computeRevisionResults } from '../../shared/engine/revision-results';
import type { WaveformAnalysis } from '../../shared/schema/waveform';
import { analyseConstantCurrent } from './expect-decay';
import { spiceCapture, type BleederCircuit } from './spice-capture';

const C = 1.32e-6; // [S2]
const R = 220e3; // [S2]
const C_MIN = C * 0.9; // a film capacitor at its −10 % tolerance (typical, docs/DOMAIN.md §3.3, from memory)
const conditions: MeasuredConditions = { safeVoltage: 60, maxTime: 0.75, maxVoltage: 360, capacitanceMin: C_MIN };
const predicted: PredictedDecay = { nominalTau: R * C, worstCaseTau: R * C * 1.01 * 1.1, toleranceBand: 1 - 0.99 * 0.9 };
const e1: BleederCircuit = { v0: 360, capacitance: C, resistance: R, open: 0.1, stop: 1.6, step: 2e-4 };

async function analyse(circuit: BleederCircuit, extra: Partial<WaveformAnalysis> = {}): Promise<WaveformAnalysis> {
  const capture = await spiceCapture(circuit, 60);
  const analysis = await analyseCaptureText(capture.text, { safeVoltage: 60, maxTime: 0.75, channel: 'Bus', markerChannel: 'Relay' });
  return { ...analysis, ...extra };
}

/** ngspice's own crossing of 60 V for the circuit as the requirement means it (from 360 V, no instrument). */
async function spiceCrossing(circuit: BleederCircuit): Promise<number> {
  return (await spiceCapture(circuit, 60)).measuredCrossing;
}

const within = (actual: number | null, expected: number, relative: number) => {
  expect(actual).not.toBeNull();
  expect(Math.abs((actual ?? NaN) - expected) / expected).toBeLessThan(relative);
};

describe('start voltage: a capture from below the maximum bus is referred to it', () => {
  test('from 300 V: t(360→60) = t(300→60) + τ·ln(360/300), against ngspice from 360 V and the hand figure', async () => {
    const [check] = measuredDischargeCheck(await analyse({ ...e1, v0: 300 }), conditions, predicted, 'low-start.csv');
    // RC decay law (docs/DOMAIN.md §5.3): the same decay from 360 V; hand figure τ·ln(360/60) = 0.2904 s × 1.7918 = 0.5203 s ([S2] E1).
    within(check.value, await spiceCrossing(e1), 0.01);
    within(check.value, R * C * Math.log(360 / 60), 0.01);
    // As measured the capture says only τ·ln(300/60) = 0.4674 s: the referral adds 53 ms.
    within(check.referral?.measuredTime ?? null, R * C * Math.log(300 / 60), 0.01);
    expect(check.referral).toMatchObject({ start: 'referred', maxVoltage: 360, unloadedTau: null, probeResistance: null });
    expect(check.referral?.v0).toBeCloseTo(300, 0);
    expect(check.detail).toMatch(/below 60 V to stay after 46\d ms as measured/);
    expect(check.detail).toMatch(/referred to the 360 V maximum bus by the RC decay law: 46\d ms \+ τ 29\d ms × ln\(360 V \/ 300 V\) = 52\d ms/);
    expect(check.pass).toBe(true);
  });

  test('the referral can turn a pass into a fail: 330 kΩ from 240 V meets 0.75 s as measured, not from 360 V', async () => {
    const circuit = { ...e1, v0: 240, resistance: 330e3, stop: 2.4 };
    const analysis = await analyse(circuit);
    // As measured: 330 kΩ × 1.32 µF × ln(240/60) = 0.604 s, inside 0.75 s; from 360 V: 0.4356 s × ln 6 = 0.781 s.
    expect(analysis.timeToSafe).toBeLessThan(0.75);
    const [check] = measuredDischargeCheck(analysis, conditions, predicted, 'low-start.csv');
    within(check.value, await spiceCrossing({ ...circuit, v0: 360 }), 0.01);
    within(check.value, 330e3 * C * Math.log(6), 0.01);
    expect(check.pass).toBe(false);
  });

  test('a capture above the maximum bus is used as measured', async () => {
    const analysis = await analyse(e1);
    const [check] = measuredDischargeCheck(analysis, { ...conditions, maxVoltage: 340 }, predicted, 'high-start.csv');
    expect(check.value).toBe(analysis.timeToSafe);
    expect(check.referral?.start).toBe('as-measured');
    expect(check.detail).toMatch(/started at or above the 340 V maximum bus: time used as measured/);
  });

  test('a trace that is not a clean exponential cannot be referred: the check fails and asks for a capture from the maximum bus', async () => {
    // [S10] scenario, docs/DOMAIN.md §4 E4: a constant-current discharge, here captured from 400 V of a 450 V bus.
    const analysis = await analyseConstantCurrent(400, 7);
    expect(analysis.fit).toBe('poor');
    const checks = measuredDischargeCheck(
      analysis,
      { safeVoltage: 60, maxTime: 2, maxVoltage: 450, capacitanceMin: 480e-6 },
      predicted,
      'active.csv',
    );
    expect(checks).toHaveLength(1);
    expect(checks[0]).toMatchObject({ value: null, pass: false, margin: null });
    expect(checks[0].referral?.start).toBe('not-referable');
    expect(checks[0].detail).toMatch(
      /starts below the 450 V maximum bus and is not a clean exponential \(poor fit\), so it cannot be referred to it: capture a discharge from the maximum bus voltage/,
    );
  });
});

describe('instrument loading: the measured τ is referred to the circuit without the instrument', () => {
  test('1 MΩ across the bank at its lower tolerance: 1/τ = 1/τ_measured − 1/(R_m·C) gives back 220 kΩ × C', async () => {
    // ngspice decays through 220 kΩ ∥ 1 MΩ = 180.3 kΩ; the circuit alone is 220 kΩ × 1.188 µF = 0.2614 s (parallel resistances, common practice).
    const circuit = { ...e1, capacitance: C_MIN, probe: 1e6 };
    const analysis = await analyse(circuit, { probeResistance: 1e6 });
    within(analysis.tau, ((R * 1e6) / (R + 1e6)) * C_MIN, 0.01);
    const [time, tau] = measuredDischargeCheck(analysis, conditions, predicted, 'probe-x1.csv');
    within(tau.value, R * C_MIN, 0.01);
    // The unloaded time against ngspice without the probe, and the hand figure 0.2614 s × ln 6 = 0.4683 s.
    within(time.value, await spiceCrossing({ ...circuit, probe: undefined }), 0.01);
    within(time.value, R * C_MIN * Math.log(6), 0.01);
    expect(time.referral).toMatchObject({ probeResistance: 1e6, loadingCapacitance: C_MIN });
    within(time.referral?.unloadedTau ?? null, R * C_MIN, 0.01);
    expect(time.detail).toMatch(
      /instrument loading corrected for 1 MΩ across 1\.19 µF \(C at its lower tolerance\): 1\/τ = 1\/τ_measured − 1\/\(R_m·C\), τ 21\d ms measured → 26\d ms unloaded/,
    );
    expect(tau.detail).toMatch(/^Fitted τ 26\d ms unloaded \(21\d ms as measured, R² [01]\.\d{4}\) is within the band/);
  });

  test('with the bank above its lower tolerance the corrected τ errs long (the conservative side)', async () => {
    const analysis = await analyse({ ...e1, probe: 10e6 }, { probeResistance: 10e6 });
    const [, tau] = measuredDischargeCheck(analysis, conditions, predicted, 'probe-x10.csv');
    expect(tau.value ?? 0).toBeGreaterThanOrEqual(R * C * 0.999);
  });

  test('loading and start together: 1 MΩ probe on a capture from 300 V, against ngspice of the bare circuit from 360 V', async () => {
    const circuit = { ...e1, capacitance: C_MIN, v0: 300, probe: 1e6 };
    const [time] = measuredDischargeCheck(await analyse(circuit, { probeResistance: 1e6 }), conditions, predicted, 'both.csv');
    within(time.value, await spiceCrossing({ ...circuit, v0: 360, probe: undefined }), 0.01);
    expect(time.referral?.start).toBe('referred');
  });

  test('an instrument that alone would discharge faster than measured cannot be corrected: the check fails', async () => {
    // 100 kΩ × 1.188 µF = 0.119 s is shorter than the 0.290 s measured: the figure is wrong or the capture shows the probe.
    const checks = measuredDischargeCheck(await analyse(e1, { probeResistance: 100e3 }), conditions, predicted, 'wrong-probe.csv');
    expect(checks).toHaveLength(1);
    expect(checks[0]).toMatchObject({ value: null, pass: false });
    expect(checks[0].detail).toMatch(/alone gives τ 119 ms, no longer than the 29\d ms measured: the capture shows the instrument's own discharge/);
  });

  test('on a trace that is not a clean exponential the loading cannot be taken out: the check fails', async () => {
    const analysis = await analyseConstantCurrent(450, 8);
    const checks = measuredDischargeCheck(
      { ...analysis, probeResistance: 10e6 },
      { safeVoltage: 60, maxTime: 2, maxVoltage: 440, capacitanceMin: 480e-6 },
      predicted,
      'active.csv',
    );
    expect(checks).toHaveLength(1);
    expect(checks[0]).toMatchObject({ value: null, pass: false });
    expect(checks[0].detail).toMatch(/cannot be taken out of a trace that is not a clean exponential/);
  });

  test('without a probe resistance the detail says the loading was not corrected', async () => {
    const [time, tau] = measuredDischargeCheck(await analyse(e1), conditions, predicted, 'plain.csv');
    expect(time.detail).toMatch(/instrument loading not corrected \(no probe resistance given\)/);
    expect(tau.detail).toMatch(/instrument loading not corrected \(no probe resistance given\)\.$/);
  });
});

describe('one check per capture in a revision’s results', () => {
  test('ids carry the kind and the first 12 hex of the file’s SHA-256, with the evidence id and hash beside them', async () => {
    const analysis = await analyse(e1);
    const requirement = { safeVoltage: 60, maxTime: 0.75, singleFault: false, condition: '', reference: '' };
    const design = {
      bus: { nominalVoltage: 325, maxVoltage: 360 },
      capacitors: { capacitance: C, series: 1, parallel: 1, toleranceMinus: 0.1, tolerancePlus: 0.1 },
      bleeder: {
        resistance: R,
        series: 1,
        parallel: 1,
        tolerance: 0.01,
        tcrPpmPerK: 0,
        drift: 0,
        powerRating: 1,
        elementVoltage: 500,
        derating: 0.5,
      },
      ambient: { min: 25, max: 25 },
      active: null,
    };
    const a = 'a'.repeat(12) + '0'.repeat(52);
    const b = 'b'.repeat(12) + '1'.repeat(52);
    const result = computeRevisionResults(requirement, design, [
      { evidenceId: 7, sha256: a, name: 'first.csv', analysis },
      { evidenceId: 8, sha256: b, name: 'second.csv', analysis },
      { evidenceId: 9, sha256: a, name: 'first-again.csv', analysis },
    ]);
    const measured = result.checks.filter((c) => c.id.split(':')[0].startsWith('measured-'));
    expect(measured.map((c) => [c.id, c.evidenceId, c.evidenceSha256])).toEqual([
      ['measured-discharge:aaaaaaaaaaaa', 7, a],
      ['measured-tau:aaaaaaaaaaaa', 7, a],
      ['measured-discharge:bbbbbbbbbbbb', 8, b],
      ['measured-tau:bbbbbbbbbbbb', 8, b],
      ['measured-discharge:aaaaaaaaaaaa:2', 9, a],
      ['measured-tau:aaaaaaaaaaaa:2', 9, a],
    ]);
    expect(new Set(result.checks.map((c) => c.id)).size).toBe(result.checks.length);
    // The referral figures reach the stored results: C at its lower tolerance is the bank's −10 %.
    expect(measured[0].referral).toMatchObject({ maxVoltage: 360, probeResistance: null });
    const loaded = computeRevisionResults(requirement, design, [
      { evidenceId: 1, sha256: a, name: 'x.csv', analysis: { ...analysis, probeResistance: 10e6 } },
    ]);
    expect(loaded.checks.find((c) => c.id === 'measured-discharge:aaaaaaaaaaaa')?.referral?.loadingCapacitance).toBeCloseTo(C * 0.9, 12);
  });
});
