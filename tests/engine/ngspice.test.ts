// The downloadable SPICE netlist, simulated by ngspice (an independent circuit simulator), must give the
// same time to safe voltage as the engine, within 0.1 %, at both corners, for random designs.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { computeDischarge, SPICE_MEASURE, spiceNetlist } from '../../shared/engine';
import type { Design, Requirement } from '../../shared/schema/discharge';
import { simulate } from '../support/ngspice';
import { designOf, logUniform, networkArb, requirement } from './fixtures';

const designArb = fc
  .record({
    net: networkArb(50),
    safeShare: fc.double({ min: 0.02, max: 0.6, noNaN: true }),
    maxTime: logUniform(0.1, 600),
  })
  .map(({ net, safeShare, maxTime }): { requirement: Requirement; design: Design } => ({
    requirement: requirement({ safeVoltage: net.vMax * net.nominalShare * safeShare, maxTime }),
    design: designOf(net),
  }));

const designs = fc.sample(designArb, { seed: 20_240_611, numRuns: 24 });

describe('ngspice transient of spiceNetlist() agrees with the engine within 0.1 %', () => {
  it.each(designs.map((input, i) => [i + 1, input] as const))('random design %i', async (_, input) => {
    const result = computeDischarge(input);
    const safe = input.requirement.safeVoltage;
    for (const corner of ['worst', 'nominal'] as const) {
      const netlist = spiceNetlist(input, corner);
      const run = await simulate(netlist, { measures: [`meas tran tcross WHEN v(bus)=${safe} FALL=1`] });
      const simulated = run.measures.tcross;
      const engine = corner === 'worst' ? result.worstCase?.timeToSafe : result.nominal?.timeToSafe;
      expect(simulated, run.stdout.slice(-2000)).toBeGreaterThan(0);
      expect(engine).toBeGreaterThan(0);
      expect(Math.abs(simulated - (engine ?? 0)) / simulated).toBeLessThan(1e-3);
    }
  });

  it('is plain ASCII and lists every capacitor and resistor as built', () => {
    for (const input of designs.slice(0, 5)) {
      const netlist = spiceNetlist(input, 'worst');
      expect(netlist).toMatch(/^[\n\x20-\x7e]*$/);
      const { capacitors, bleeder } = input.design;
      expect(netlist.match(/^C\d+_\d+ /gm)).toHaveLength(capacitors.series * capacitors.parallel);
      expect(netlist.match(/^R\d+_\d+ /gm)).toHaveLength(bleeder.series * bleeder.parallel);
    }
  });
});

// With a charge or energy alternative the netlist measures the crossing of the earliest criterion's
// voltage; ngspice's own reading of that `.meas` line must match the engine's time too.
const withAlternatives = fc.sample(fc.tuple(designArb, fc.double({ min: 0.05, max: 0.6, noNaN: true }), fc.boolean()), {
  seed: 20_240_612,
  numRuns: 6,
});

describe("ngspice with charge and energy criteria, using the netlist's own .meas line", () => {
  it.each(withAlternatives.map((x, i) => [i + 1, x] as const))('design %i', async (_, [input, share, useCharge]) => {
    // A limit that is met somewhere between the start and the safe voltage.
    const { capacitance, tolerancePlus, parallel, series } = input.design.capacitors;
    const cMax = (capacitance * (1 + tolerancePlus) * parallel) / series;
    const vSafe = input.requirement.safeVoltage;
    const vAlt = vSafe + share * (input.design.bus.maxVoltage - vSafe);
    const requirement = useCharge ? { ...input.requirement, maxCharge: cMax * vAlt } : { ...input.requirement, maxEnergy: 0.5 * cMax * vAlt * vAlt };
    const result = computeDischarge({ requirement, design: input.design });
    const run = await simulate(spiceNetlist({ requirement, design: input.design }, 'worst'));
    const engine = result.worstCase?.timeToSafe ?? NaN;
    expect(result.worstCase?.safeThreshold).toBeGreaterThan(input.requirement.safeVoltage);
    expect(Math.abs(run.measures[SPICE_MEASURE] - engine) / engine).toBeLessThan(1e-3);
  });
});
