// The bench procedure of docs/DOMAIN.md §3.9 replayed on ngspice (an independent circuit simulator):
// ring a node, add a known capacitor, size the snubber from the two frequencies, then compare the
// simulated overshoot peak and ring-down time constant, with and without the snubber, to the engine's
// analytic step response. Agreement required: 2 % on the overshoot and on the decay time constant.
import { describe, expect, it } from 'vitest';
import { ringingOf, sizeFromRinging, type RingingCircuit } from '../../shared/engine/snubber';
import { simulate } from '../support/ngspice';
import { envelopeTimeConstant, localMaxima, periodOf, pronyPoles, resample } from './ring-measure';

// The circuits the simulator rings. These are netlist inputs, not expected results: every expectation
// below is the engine's prediction set against what ngspice produces from the same netlist. The first
// is the node behind docs/DOMAIN.md §4 E12 (20 MHz ring, 300 pF added → 10 MHz; constructed example); the
// second a 400 V stage with a larger device capacitance. Loop loss makes the bare ring decay measurably.
interface Bench {
  name: string;
  step: number; // V
  inductance: number; // H
  nodeCapacitance: number; // F
  loopResistance: number; // Ω
  added: number; // F, the known capacitor clipped across the node
  /** Ring frequencies the source states for this node, Hz. */
  stated?: { f0: number; f1: number };
}
const benches: Bench[] = [
  {
    name: 'E12 node, 48 V',
    step: 48,
    inductance: 1 / ((2 * Math.PI * 20e6) ** 2 * 100e-12),
    nodeCapacitance: 100e-12,
    loopResistance: 0.5,
    added: 300e-12,
    stated: { f0: 20e6, f1: 10e6 },
  },
  { name: '400 V stage', step: 400, inductance: 20e-9, nodeCapacitance: 1.2e-9, loopResistance: 0.05, added: 2.2e-9 },
];

interface Trace {
  time: number[];
  v: number[];
  peak: number;
}

/** Step response at the node; `extra` adds elements across it (node n). Samples 600 points a bare period. */
async function ring(bench: Bench, extra: string, periods: number): Promise<Trace> {
  const period = 2 * Math.PI * Math.sqrt(bench.inductance * bench.nodeCapacitance);
  const stop = periods * period;
  const step = period / 600;
  const netlist = [
    '* switching node step response',
    `V1 in 0 PWL(0 0 1p ${bench.step})`,
    `R1 in a ${bench.loopResistance}`,
    `L1 a n ${bench.inductance}`,
    `C1 n 0 ${bench.nodeCapacitance}`,
    extra,
    `.tran ${step} ${stop} 0 ${step}`,
  ].join('\n');
  const run = await simulate(netlist, {
    vectors: ['v(n)'],
    measures: [`meas tran vpeak max v(n) from=0 to=${stop}`],
  });
  return { time: run.time, v: run.vectors['v(n)'], peak: run.measures.vpeak };
}

/** Ring frequency and envelope time constant of a lightly damped trace, read from its peaks as on a scope. */
function readRing(trace: Trace, final: number) {
  const peaks = localMaxima(trace.time, trace.v).filter((p) => p.v > final);
  return { frequency: 1 / periodOf(peaks), tau: envelopeTimeConstant(peaks, final) };
}

/** Natural frequencies of a trace by Prony's method, on 24 samples a bare period after the step. */
function modes(trace: Trace, bench: Bench, periods: number) {
  const dt = (2 * Math.PI * Math.sqrt(bench.inductance * bench.nodeCapacitance)) / 24;
  const samples = resample(trace.time, trace.v, 2 * dt, dt, periods * 24).map((x) => x - bench.step);
  return pronyPoles(samples, dt, 3);
}

const within = (measured: number, predicted: number, fraction: number) =>
  expect(Math.abs(measured - predicted) / Math.abs(predicted)).toBeLessThan(fraction);

describe.each(benches)('snubber sized from a simulated bench measurement: $name', (bench) => {
  const bare: RingingCircuit = {
    inductance: bench.inductance,
    nodeCapacitance: bench.nodeCapacitance,
    seriesResistance: bench.loopResistance,
  };
  const period = 2 * Math.PI * Math.sqrt(bench.inductance * bench.nodeCapacitance);

  it('recovers the node L and C from the two ring frequencies; peaks and decay match the engine with and without the snubber', async () => {
    const [plain, loaded] = await Promise.all([ring(bench, '', 60), ring(bench, `Cadd n 0 ${bench.added}`, 60)]);
    const plainRead = readRing(plain, bench.step);
    const f1 = readRing(loaded, bench.step).frequency;
    if (bench.stated) {
      // docs/DOMAIN.md §4 E12 (constructed example, computed): 20 MHz bare, 10 MHz with 300 pF added.
      within(plainRead.frequency, bench.stated.f0, 0.001);
      within(f1, bench.stated.f1, 0.001);
    }

    const sizing = sizeFromRinging({ f0: plainRead.frequency, cAdd: bench.added, f1, multiple: 3.5 });
    // Loop loss shifts the damped frequency by a few ppm only, so the netlist's L and C come back.
    within(sizing.cPar, bench.nodeCapacitance, 0.001);
    within(sizing.lPar, bench.inductance, 0.001);

    const before = ringingOf(bare);
    // Overshoot above the step (peak − final) is a stricter comparison than the absolute peak.
    within(plain.peak - bench.step, before.overshoot * bench.step, 0.02);
    within(plainRead.tau, before.decayTimeConstant ?? Infinity, 0.02);

    const snubber = { resistance: sizing.resistanceE24, capacitance: sizing.capacitanceE12 };
    const after = ringingOf({ ...bare, snubber });
    const snubbed = await ring(bench, `Rs n m ${snubber.resistance}\nCs m 0 ${snubber.capacitance}`, 8);
    within(snubbed.peak - bench.step, after.overshoot * bench.step, 0.02);
    // The snubber adds a real pole about as fast as the ring's envelope, so successive peaks mix two
    // decays; Prony's method separates the modes.
    const pair = modes(snubbed, bench, 6).find((p) => p.im > 0);
    expect(pair).toBeDefined();
    within(-1 / (pair?.re ?? 0), after.decayTimeConstant ?? Infinity, 0.02);

    // And the snubber does its job: much less overshoot, a ring that dies within a bare period.
    expect(snubbed.peak - bench.step).toBeLessThan((plain.peak - bench.step) / 1.5);
    expect(-1 / (pair?.re ?? 0)).toBeLessThan(period);
  });

  it('damps hardest with R near √(L/C): the simulated damping ratio at Z0 beats 0.3·Z0 and 3·Z0', async () => {
    const z0 = Math.sqrt(bench.inductance / bench.nodeCapacitance);
    const measured = await Promise.all(
      [0.3, 1, 3].map(async (k) => {
        const snubber = { resistance: k * z0, capacitance: 3.5 * bench.nodeCapacitance };
        const trace = await ring(bench, `Rs n m ${snubber.resistance}\nCs m 0 ${snubber.capacitance}`, 14);
        const pair = modes(trace, bench, 12).find((p) => p.im > 0);
        const zeta = -(pair?.re ?? 0) / Math.hypot(pair?.re ?? 0, pair?.im ?? 0);
        within(zeta, ringingOf({ ...bare, snubber }).dampingRatio, 0.02);
        return zeta;
      }),
    );
    const [low, atZ0, high] = measured;
    expect(atZ0).toBeGreaterThan(low);
    expect(atZ0).toBeGreaterThan(high);
  });
});
