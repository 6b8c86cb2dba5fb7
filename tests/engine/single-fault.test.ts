// Single-fault checks. Test-report forms for IEC 62368-1 record the discharge under normal and
// single-fault conditions ([S6]); the fault cases (one bleeder open: its string lost; one series
// resistor shorted: the rest carry V0/(n−1)) are common practice (docs/DOMAIN.md §5.3). Each figure is
// checked against ngspice on the faulted network, built element by element here, and by hand.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { computeDischarge } from '../../shared/engine';
import type { Check, Design, DischargeResult, Requirement } from '../../shared/schema/discharge';
import { simulate } from '../support/ngspice';
import { designOf, idealDesign, networkArb, requirement } from './fixtures';

function check(result: DischargeResult, id: string): Check {
  const found = result.checks.find((c) => c.id === id);
  if (!found) throw new Error(`no check ${id} in ${result.checks.map((c) => c.id).join(', ')}`);
  return found;
}

/** Component corners written out from docs/DOMAIN.md §3.3 (independent of the engine's network code). */
function corners(d: Design) {
  const { bleeder: b, capacitors: c, ambient: a } = d;
  const tcr = (t: number) => 1 + b.tcrPpmPerK * 1e-6 * (t - 25);
  return {
    rMax: b.resistance * (1 + b.tolerance) * Math.max(tcr(a.max), tcr(a.min)) * (1 + b.drift),
    rMin: b.resistance * (1 - b.tolerance) * Math.min(tcr(a.max), tcr(a.min)),
    cMax: c.capacitance * (1 + c.tolerancePlus),
  };
}

const num = (v: number) => Number(v.toPrecision(12)).toString();

/** `count` strings of `series` equal parts from `bus` to ground; `skip` leaves element (1, 1) out or replaces it. */
function strings(
  prefix: string,
  series: number,
  count: number,
  value: number,
  first?: (from: string, to: string) => string | null,
  ic?: number,
): string[] {
  const lines: string[] = [];
  for (let k = 1; k <= count; k += 1) {
    for (let j = 1; j <= series; j += 1) {
      const from = j === 1 ? 'bus' : `${prefix.toLowerCase()}${k}_${j - 1}`;
      const to = j === series ? '0' : `${prefix.toLowerCase()}${k}_${j}`;
      const special = k === 1 && j === 1 && first ? first(from, to) : undefined;
      if (special === null) continue;
      lines.push(special ?? `${prefix}${k}_${j} ${from} ${to} ${num(value)}${ic === undefined ? '' : ` IC=${num(ic)}`}`);
    }
  }
  return lines;
}

/** ngspice: the bank charged to V0 at the slow corner, with resistor (1, 1) of the bleeder open. */
async function openBleederCrossing(d: Design, safe: number, expected: number): Promise<number> {
  const { rMax, cMax } = corners(d);
  const v0 = d.bus.maxVoltage;
  const step = expected / 4000;
  const deck = [
    '* bleeder with one resistor open (single fault)',
    ...strings('C', d.capacitors.series, d.capacitors.parallel, cMax, undefined, v0 / d.capacitors.series),
    ...strings('R', d.bleeder.series, d.bleeder.parallel, rMax, () => null),
    `.tran ${num(step)} ${num(1.5 * expected)} 0 ${num(step)} UIC`,
  ].join('\n');
  const run = await simulate(deck, { measures: [`meas tran tcross WHEN v(bus)=${num(safe)} FALL=1`] });
  expect(run.measures.tcross, run.stdout.slice(-1500)).toBeGreaterThan(0);
  return run.measures.tcross;
}

/** ngspice operating point: the bus held at V0, resistors at the low corner, resistor (1, 1) shorted. */
async function shortedResistorStress(d: Design): Promise<{ voltage: number; power: number }> {
  const { rMin } = corners(d);
  const next = d.bleeder.series === 2 ? '0' : 'r1_2';
  const deck = [
    '* bleeder string with one resistor shorted (single fault)',
    `Vbus bus 0 DC ${num(d.bus.maxVoltage)}`,
    ...strings('R', d.bleeder.series, d.bleeder.parallel, rMin, (from, to) => `Vshort ${from} ${to} DC 0`),
    '.op',
  ].join('\n');
  // Voltage across the resistor after the short, and its power as V·I from the string current.
  const run = await simulate(deck, {
    measures: [`let vr = v(r1_1)${next === '0' ? '' : ` - v(${next})`}`, 'let pr = abs(vr * i(vshort))', 'print vr', 'print pr'],
  });
  return { voltage: run.measures.vr, power: run.measures.pr };
}

const sampled = fc.sample(
  fc
    .record({ net: networkArb(100), safeShare: fc.double({ min: 0.02, max: 0.5, noNaN: true }) })
    .filter(({ net }) => net.resParallel >= 2 && net.resSeries >= 2),
  { seed: 20_250_310, numRuns: 10 },
);

describe('single-fault checks against ngspice on the faulted network', () => {
  it.each(sampled.map((s, i) => [i + 1, s] as const))('random design %i: one resistor open, one resistor shorted', async (_, { net, safeShare }) => {
    const design = designOf(net);
    const req: Requirement = requirement({ safeVoltage: net.vMax * safeShare, maxTime: 1e5, singleFault: true });
    const result = computeDischarge({ requirement: req, design });
    const { rMax, rMin, cMax } = corners(design);
    const { series, parallel } = design.bleeder;

    // Open: one string lost, R = R_max·n_s/(n_p − 1), C = C_max·n_p/n_s; t = R·C·ln(V0/V_safe) ([S2] RC law).
    const time = check(result, 'single-fault-time');
    const hand =
      ((rMax * series) / (parallel - 1)) * ((cMax * design.capacitors.parallel) / design.capacitors.series) * Math.log(net.vMax / req.safeVoltage);
    expect(Math.abs((time.value ?? NaN) - hand) / hand).toBeLessThan(1e-9);
    const spice = await openBleederCrossing(design, req.safeVoltage, hand);
    expect(Math.abs((time.value ?? NaN) - spice) / spice).toBeLessThan(1e-3);

    // Short: the other n_s − 1 carry V0/(n_s − 1); P = V²/R_min (docs/DOMAIN.md §3.6).
    const stress = await shortedResistorStress(design);
    const perResistor = net.vMax / (series - 1);
    expect(Math.abs(stress.voltage - perResistor) / perResistor).toBeLessThan(1e-6);
    const voltage = check(result, 'single-fault-voltage');
    expect(Math.abs((voltage.value ?? NaN) - stress.voltage) / stress.voltage).toBeLessThan(1e-6);
    const power = check(result, 'single-fault-power');
    expect(Math.abs((power.value ?? NaN) - stress.power) / stress.power).toBeLessThan(1e-6);
    expect(Math.abs((power.value ?? NaN) - perResistor ** 2 / rMin) / (perResistor ** 2 / rMin)).toBeLessThan(1e-9);
  });
});

describe('single-fault checks by hand from published examples', () => {
  // [S2] (docs/DOMAIN.md §4 E1): 1.32 µF from 360 V to 60 V within 0.75 s through 220 kΩ (t = 0.520 s).
  const s2 = { capacitance: 1.32e-6, voltage: 360, resistance: 220e3 };

  it('one 220 kΩ bleeder open leaves no discharge path: no value, fails, and the verdict fails', () => {
    const result = computeDischarge({ requirement: requirement({ safeVoltage: 60, maxTime: 0.75, singleFault: true }), design: idealDesign(s2) });
    expect(check(result, 'discharge-time').pass).toBe(true);
    const time = check(result, 'single-fault-time');
    expect(time).toMatchObject({ value: null, limit: 0.75, pass: false, margin: null });
    expect(time.detail).toMatch(/no discharge path remains/);
    expect(result.verdict).toBe('fails');
    // One resistor in series: no shorted-resistor case to compute.
    expect(result.checks.map((c) => c.id)).not.toContain('single-fault-power');
  });

  it('the same 220 kΩ as two 440 kΩ strings: one open leaves 440 kΩ, τ = 0.581 s, t = 1.041 s > 0.75 s', () => {
    const design = idealDesign({ ...s2, resistance: 440e3 }, {});
    design.bleeder = { ...design.bleeder, parallel: 2 };
    const result = computeDischarge({ requirement: requirement({ safeVoltage: 60, maxTime: 0.75, singleFault: true }), design });
    expect(check(result, 'discharge-time').value).toBeCloseTo(0.52, 3);
    // 440 kΩ × 1.32 µF × ln(360/60) = 0.5808 s × 1.7918 = 1.0407 s.
    const time = check(result, 'single-fault-time');
    expect(time.value).toBeCloseTo(1.0407, 3);
    expect(time.pass).toBe(false);
    expect(time.detail).toMatch(
      /^One of 2 strings lost: 1 string of 1 × 440 kΩ = 440 kΩ, worst case: R nominal, C nominal, V0 360 V; reaches the 60 V safe voltage; against the 750 ms time limit$/,
    );
    // Where the user's standard allows longer under a fault, that limit applies.
    const longer = computeDischarge({
      requirement: requirement({ safeVoltage: 60, maxTime: 0.75, singleFault: true, singleFaultMaxTime: 2 }),
      design,
    });
    expect(check(longer, 'single-fault-time')).toMatchObject({ limit: 2, pass: true });
    expect(check(longer, 'single-fault-time').detail).toMatch(/against the 2 s single-fault limit$/);
    expect(longer.verdict).toBe('meets');
  });

  it('[E9] two 100 kΩ in series across 800 V: one shorted puts 800 V and 6.4 W on the other, against its ratings as rated', () => {
    // docs/DOMAIN.md §4 E9: 1.6 W each in normal use (400 V across 100 kΩ); shorted, 800²/100 kΩ = 6.4 W.
    const design = idealDesign({ capacitance: 1e-3, voltage: 800, resistance: 100e3 });
    design.bleeder = { ...design.bleeder, series: 2, powerRating: 5, elementVoltage: 1000, derating: 0.5 };
    const result = computeDischarge({ requirement: requirement({ safeVoltage: 60, maxTime: 600, singleFault: true }), design });
    expect(check(result, 'resistor-power').value).toBeCloseTo(1.6, 9);
    const power = check(result, 'single-fault-power');
    expect(power).toMatchObject({ limit: 5, pass: false });
    expect(power.value).toBeCloseTo(6.4, 9);
    expect(power.detail).toMatch(/the rated power 5 W, not derated/);
    const voltage = check(result, 'single-fault-voltage');
    expect(voltage).toMatchObject({ limit: 1000, pass: true });
    expect(voltage.value).toBeCloseTo(800, 9);
    expect(voltage.detail).toMatch(
      /^One of 2 resistors in series shorted: the other carries the whole 800 V maximum bus; limit: the limiting element voltage 1 kV$/,
    );
    expect(result.verdict).toBe('fails');
  });

  it('without the single-fault condition no fault checks are added', () => {
    const result = computeDischarge({ requirement: requirement({ safeVoltage: 60, maxTime: 0.75 }), design: idealDesign(s2) });
    expect(result.checks.filter((c) => c.id.startsWith('single-fault'))).toEqual([]);
    expect(result.verdict).toBe('meets');
  });

  it('with active discharge the fault is the active circuit failing: the fallback check judges it, the open bleeder is not counted twice', () => {
    // [S10] scenario (docs/DOMAIN.md §4 E4): 600 µF, 450 V → 60 V, 0.2 A constant current → 1.17 s; bleeders as fallback.
    const design = idealDesign(
      { capacitance: 600e-6, voltage: 450, resistance: 100e3 },
      { active: { mode: 'constant-current', current: 0.2, delay: 0 } },
    );
    const result = computeDischarge({ requirement: requirement({ safeVoltage: 60, maxTime: 2, singleFault: true }), design });
    const open = check(result, 'single-fault-time');
    expect(open).toMatchObject({ value: null, limit: null, pass: true, informational: true });
    expect(open.detail).toMatch(/the single fault is the active circuit failing, judged by “Discharge time if the active circuit fails/);
    // No fallback limit set: under the fault condition the bleeders alone are held to the 2 s limit.
    // 100 kΩ × 600 µF × ln(450/60) = 60 s × 2.0149 = 120.9 s.
    const fallback = check(result, 'passive-fallback-time');
    expect(fallback).toMatchObject({ limit: 2, pass: false });
    expect(fallback.value).toBeCloseTo(120.9, 1);
    expect(fallback.informational).toBeUndefined();
    expect(fallback.detail).toMatch(
      /the active circuit failing is the single fault, so with no fallback limit set the bleeders alone are held to the 2 s time limit/,
    );
    expect(result.verdict).toBe('fails');
  });

  it('stored energy with no energy limit is for information, never a judged pass', () => {
    const result = computeDischarge({ requirement: requirement({ safeVoltage: 60, maxTime: 0.75 }), design: idealDesign(s2) });
    expect(check(result, 'stored-energy')).toMatchObject({ limit: null, informational: true, margin: null });
  });
});
