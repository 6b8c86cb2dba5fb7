// The RCD formulas of docs/DOMAIN.md §3.9 are from memory (Severns and Todd titles in [S14]; only their
// introductions were read). Here ngspice, an independent circuit simulator, runs the circuits those
// formulas describe, and the engine's checks must agree with what it simulates (2 %).
import { describe, expect, it } from 'vitest';
import { clampOperatingPoint, snubberChecks } from '../../shared/engine/snubber';
import type { RcdClampSnubber, RcdTurnoffSnubber } from '../../shared/schema/snubber';
import { simulate } from '../support/ngspice';

const within = (measured: number, predicted: number, fraction: number) =>
  expect(Math.abs(measured - predicted) / Math.abs(predicted)).toBeLessThan(fraction);

const value = (checks: ReturnType<typeof snubberChecks>, id: string) => {
  const check = checks.find((c) => c.id === id);
  if (!check) throw new Error(`no ${id} check`);
  return check;
};

// A near-ideal diode (forward drop well under 0.1 V at these currents) keeps the comparison about the
// snubber, not about diode drops.
const DIODE = '.model dm D(IS=1e-12 N=0.1 RS=1m)';
const SWITCH = '.model swm SW(VT=0.5 VH=0 RON=1m ROFF=1e12)';

describe('RCD turn-off snubber in ngspice (formulas from memory)', () => {
  // Netlist inputs: 10 A switched off in 50 ns from a 400 V bus, minimum on-time 1 µs.
  const I = 10;
  const tf = 50e-9;
  const V = 400;
  const tOnMin = 1e-6;
  const base: RcdTurnoffSnubber = {
    name: 'D3/R7/C9',
    location: 'across Q2',
    kind: 'rcd-turnoff',
    resistance: 1,
    capacitance: 1e-9,
    capacitanceTolerance: 0,
    powerRating: 10,
    derating: 1,
    capacitorVoltageRating: 630,
    switchingVoltage: V,
    overshoot: 0,
    switchingFrequency: 100e3,
    accessible: false,
    switchedCurrent: I,
    fallTime: tf,
    minOnTime: tOnMin,
  };
  // Size the parts at the engine's own limits: C at the I·t_f/(2V) minimum, R at R·C = t_on,min/3.
  const C = value(snubberChecks(base), 'snubber-capacitance').limit ?? NaN;
  const R = tOnMin / 3 / C;
  const snubber = { ...base, capacitance: C, resistance: R };

  it('with C = I·t_f/(2V) the node reaches the bus just as the current ends; R·C = t_on,min/3 empties it to e⁻³; R takes ½·C·V² per cycle', async () => {
    const turnOn = 2e-6;
    const netlist = [
      '* RCD turn-off snubber: linear current fall, freewheel clamp to the bus, then turn-on',
      `Vbus bus 0 ${V}`,
      `Iload 0 n DC ${I}`,
      `Isw n 0 PWL(0 ${I} ${tf} 0)`,
      'Dfw n bus dm',
      'Ds n m dm',
      `Rs m n ${R}`,
      `Cs m 0 ${C}`,
      'S1 n 0 ctl 0 swm',
      `Vctl ctl 0 PULSE(0 1 ${turnOn} 1n 1n 10u 20u)`,
      DIODE,
      SWITCH,
      '.tran 0.1n 8u 0 1n uic',
    ].join('\n');
    const run = await simulate(netlist, {
      measures: [
        `meas tran vfall find v(n) at=${tf}`,
        `meas tran vreset find v(m) at=${turnOn + 1e-9 + tOnMin}`,
        `let pr = (v(m)-v(n))*(v(m)-v(n))/${R}`,
        `meas tran eres integ pr from=${turnOn - 50e-9} to=8u`,
      ],
    });
    within(run.measures.vfall, V, 0.02);
    within(run.measures.vreset, V * Math.exp(-3), 0.02);
    const checks = snubberChecks(snubber);
    const energyPerCycle = (value(checks, 'snubber-power').value ?? NaN) / snubber.switchingFrequency;
    within(run.measures.eres, energyPerCycle, 0.02);
    expect(value(checks, 'snubber-reset').margin).toBeCloseTo(0, 9);
  });
});

describe('RCD clamp of a flyback primary in ngspice (formulas from memory)', () => {
  // Netlist inputs: 5 µH leakage charged to 1.5 A in 3 µs each 65 kHz cycle, 100 V reflected, 10 nF
  // clamp capacitor, and the resistor R = V_c²/P that docs/DOMAIN.md §3.9 gives for a 150 V clamp.
  const L = 5e-6;
  const f = 65e3;
  const vr = 100;
  const C = 10e-9;
  const R = 150 ** 2 / (0.5 * L * 1.5 ** 2 * f * (150 / (150 - vr)));
  const tOn = 3e-6;
  const cycles = 140; // 10 × R·C, so the clamp has settled from its 120 V start

  it('the clamp settles where the energy balance puts it, with the ripple the charge step gives', async () => {
    const T = 1 / f;
    const drive = (1.5 * L) / tOn;
    const netlist = [
      '* flyback leakage into an RCD clamp; the reflected voltage holds the far end of the leakage',
      `Vx x 0 PULSE(${vr} ${drive} 0 1n 1n ${tOn - 1e-9} ${T})`,
      `Vctl ctl 0 PULSE(0 1 0 1n 1n ${tOn - 1e-9} ${T})`,
      `L1 x d ${L}`,
      'Rd d x 1meg',
      'S1 d 0 ctl 0 swm',
      'D1 d c dm',
      `Cc c 0 ${C} IC=120`,
      `Rc c 0 ${R}`,
      DIODE,
      SWITCH,
      `.tran 1n ${cycles * T} 0 20n uic`,
    ].join('\n');
    const last = `from=${(cycles - 2) * T} to=${(cycles - 1) * T}`;
    const run = await simulate(netlist, {
      measures: [
        `meas tran vavg avg v(c) ${last}`,
        `meas tran vmax max v(c) ${last}`,
        `meas tran vmin min v(c) ${last}`,
        `meas tran ipk max i(L1) ${last}`,
        `let pr = v(c)*v(c)/${R}`,
        `meas tran pavg avg pr ${last}`,
      ],
    });
    const clamp: RcdClampSnubber = {
      name: 'D1/R4/C2',
      location: 'flyback primary',
      kind: 'rcd-clamp',
      resistance: R,
      capacitance: C,
      capacitanceTolerance: 0,
      powerRating: 3,
      derating: 0.5,
      capacitorVoltageRating: 200,
      switchingVoltage: 375,
      overshoot: 0,
      switchingFrequency: f,
      accessible: false,
      leakageInductance: L,
      peakCurrent: run.measures.ipk,
      reflectedVoltage: vr,
      clampVoltage: 150,
    };
    const op = clampOperatingPoint({ ...clamp, leakageInductance: L, peakCurrent: run.measures.ipk, reflectedVoltage: vr });
    within(run.measures.vavg, op.clampVoltage, 0.02);
    within(run.measures.pavg, value(snubberChecks(clamp), 'snubber-power').value ?? NaN, 0.02);
    const ripple = (L * run.measures.ipk ** 2) / (2 * (op.clampVoltage - vr) * C);
    within(run.measures.vmax - run.measures.vmin, ripple, 0.02);
    // The voltage check adds the whole step to the settled value, so it is never below the simulated peak.
    expect(value(snubberChecks(clamp), 'snubber-voltage').value).toBeGreaterThanOrEqual(run.measures.vmax);
  });
});
