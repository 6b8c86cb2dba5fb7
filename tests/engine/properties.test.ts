// Laws the engine must obey for every input (fast-check, fixed seeds).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  computeDischarge,
  eValueAbove,
  eValueAtOrBelow,
  eSeriesMantissas,
  pathVoltage,
  scenario,
  suggestBleeder,
  type SuggestDesign,
} from '../../shared/engine';
import type { Design, DischargeResult, Requirement } from '../../shared/schema/discharge';
import { designOf, logUniform, networkArb, requirement } from './fixtures';

const activeArb = fc.oneof(
  fc.constant(null),
  fc.record({
    mode: fc.constant('constant-current' as const),
    current: logUniform(0.01, 10),
    delay: fc.double({ min: 0, max: 1, noNaN: true }),
  }),
  fc.record({
    mode: fc.constant('switched-resistor' as const),
    resistance: logUniform(10, 1e5),
    pulseEnergy: logUniform(1, 1e4),
    delay: fc.double({ min: 0, max: 1, noNaN: true }),
    powerRating: fc.constant(null),
  }),
);

const inputArb = (active: fc.Arbitrary<Design['active']> = fc.constant(null)) =>
  fc
    .record({
      net: networkArb(20),
      safeVoltage: fc.double({ min: 10, max: 120, noNaN: true }),
      maxTime: logUniform(0.1, 600),
      maxCharge: fc.option(logUniform(1e-6, 1e-3), { nil: null }),
      maxEnergy: fc.option(logUniform(0.01, 10), { nil: null }),
      active,
    })
    .map((r): { requirement: Requirement; design: Design } => ({
      requirement: requirement({ safeVoltage: r.safeVoltage, maxTime: r.maxTime, maxCharge: r.maxCharge, maxEnergy: r.maxEnergy }),
      design: designOf(r.net, r.active),
    }));

const timeOf = (result: DischargeResult) => result.checks.find((c) => c.id === 'discharge-time')?.value ?? NaN;

const scaleBleeder = (design: Design, k: number): Design => ({
  ...design,
  bleeder: { ...design.bleeder, resistance: design.bleeder.resistance * k },
});
const scaleBank = (design: Design, k: number): Design => ({
  ...design,
  capacitors: { ...design.capacitors, capacitance: design.capacitors.capacitance * k },
});

describe('discharge laws', () => {
  it('time grows with R and with C (passive), and with C for every active path', () => {
    fc.assert(
      fc.property(inputArb(activeArb), fc.double({ min: 1.01, max: 3, noNaN: true }), (input, k) => {
        const base = computeDischarge(input);
        fc.pre(timeOf(base) > 0);
        const biggerC = computeDischarge({ ...input, design: scaleBank(input.design, k) });
        expect(timeOf(biggerC)).toBeGreaterThan(timeOf(base));
        if (input.design.active === null) {
          const biggerR = computeDischarge({ ...input, design: scaleBleeder(input.design, k) });
          expect(timeOf(biggerR)).toBeGreaterThan(timeOf(base));
        }
      }),
      { seed: 101, numRuns: 200 },
    );
  });

  it('times are never negative and the curve never goes below 0 V or above V0', () => {
    fc.assert(
      fc.property(inputArb(activeArb), (input) => {
        const result = computeDischarge(input);
        for (const c of result.checks.filter((c) => c.unit === 's')) expect(c.value).toBeGreaterThanOrEqual(0);
        expect(result.curve.length).toBeLessThanOrEqual(200);
        const lowest = Math.min(...result.curve.flatMap((p) => [p.t, p.v, p.vWorst]));
        const highest = Math.max(...result.curve.map((p) => p.vWorst));
        expect(lowest).toBeGreaterThanOrEqual(0);
        expect(highest).toBeLessThanOrEqual(input.design.bus.maxVoltage);
      }),
      { seed: 102, numRuns: 200 },
    );
  });

  it('is zero, passing and explained when the bus is already at or below the safe voltage', () => {
    fc.assert(
      fc.property(inputArb(activeArb), fc.double({ min: 0.05, max: 1, noNaN: true }), (input, share) => {
        const v = input.requirement.safeVoltage * share;
        const design = { ...input.design, bus: { nominalVoltage: v, maxVoltage: v } };
        const result = computeDischarge({ ...input, design });
        const time = result.checks.find((c) => c.id === 'discharge-time');
        expect(time?.value).toBe(0);
        expect(time?.pass).toBe(true);
        expect(time?.detail).toMatch(/already at or below/);
      }),
      { seed: 103, numRuns: 100 },
    );
  });

  it('V(t_safe) equals the safe threshold on every path and at both corners', () => {
    fc.assert(
      fc.property(inputArb(activeArb), (input) => {
        for (const corner of ['nominal', 'worst'] as const) {
          const s = scenario(input.requirement, input.design, corner);
          fc.pre(s.timeToSafe > 0);
          const v = pathVoltage(s.main, s.initialVoltage, s.timeToSafe);
          expect(Math.abs(v - s.threshold.voltage) / s.threshold.voltage).toBeLessThan(1e-9);
          const vp = pathVoltage(s.passive, s.initialVoltage, s.passiveTimeToSafe);
          expect(Math.abs(vp - s.threshold.voltage) / s.threshold.voltage).toBeLessThan(1e-9);
        }
      }),
      { seed: 104, numRuns: 200 },
    );
  });

  it('worst case is never faster than nominal', () => {
    fc.assert(
      fc.property(inputArb(activeArb), (input) => {
        const result = computeDischarge(input);
        expect(result.worstCase?.timeToSafe ?? NaN).toBeGreaterThanOrEqual(result.nominal?.timeToSafe ?? NaN);
        expect(result.worstCase?.passiveTimeToSafe ?? NaN).toBeGreaterThanOrEqual(result.nominal?.passiveTimeToSafe ?? NaN);
      }),
      { seed: 105, numRuns: 200 },
    );
  });

  it('the passive curve at t = τ is V0/e (common practice: one time constant leaves 36.8 %)', () => {
    fc.assert(
      fc.property(inputArb(), (input) => {
        const result = computeDischarge(input);
        const tau = result.nominal?.tau ?? NaN;
        const v0 = result.nominal?.initialVoltage ?? NaN;
        const point = result.curve.find((p) => p.t === tau);
        fc.pre(point !== undefined);
        expect(point?.v).toBeCloseTo(v0 / Math.E, 9);
        expect((point?.v ?? 0) / v0).toBeCloseTo(0.368, 3);
      }),
      { seed: 106, numRuns: 100 },
    );
  });
});

describe('sensitivity', () => {
  it('has the signs physics gives: + for C, R, V0 and tolerances; − for the safe voltage', () => {
    fc.assert(
      fc.property(inputArb(), (input) => {
        const plain = { ...input, requirement: { ...input.requirement, maxCharge: null, maxEnergy: null } };
        const result = computeDischarge(plain);
        fc.pre(timeOf(result) > 0);
        const of = (name: string) => result.sensitivity?.entries.find((e) => e.input === name)?.percentPerPercent;
        // t = R·C·ln(V0/Vs) is proportional to R and to C: exactly +1 % per +1 %.
        expect(of('design.capacitors.capacitance')).toBeCloseTo(1, 9);
        expect(of('design.bleeder.resistance')).toBeCloseTo(1, 9);
        expect(of('design.bus.maxVoltage')).toBeGreaterThan(0);
        expect(of('requirement.safeVoltage')).toBeLessThan(0);
        if (plain.design.capacitors.tolerancePlus > 1e-6) expect(of('design.capacitors.tolerancePlus')).toBeGreaterThan(0);
        if (plain.design.bleeder.tolerance > 1e-6) expect(of('design.bleeder.tolerance')).toBeGreaterThan(0);
      }),
      { seed: 107, numRuns: 100 },
    );
  });

  it('constant current: more current is faster, more delay is slower', () => {
    fc.assert(
      fc.property(inputArb(activeArb.filter((a) => a?.mode === 'constant-current')), (input) => {
        const result = computeDischarge(input);
        fc.pre(timeOf(result) > 0);
        const of = (name: string) => result.sensitivity?.entries.find((e) => e.input === name)?.percentPerPercent;
        expect(of('design.active.current')).toBeLessThan(0);
        if ((input.design.active?.delay ?? 0) > 1e-6) expect(of('design.active.delay')).toBeGreaterThan(0);
      }),
      { seed: 108, numRuns: 100 },
    );
  });
});

describe('inverse design (suggestBleeder)', () => {
  const family = fc.record({
    powerRating: fc.constantFrom(0.25, 0.5, 1, 2, 3),
    elementVoltage: fc.constantFrom(200, 350, 500, 1000),
    derating: fc.double({ min: 0.4, max: 1, noNaN: true }),
  });

  it('its answer passes when fed back, and the next larger preferred value does not', () => {
    fc.assert(
      fc.property(inputArb(activeArb), family, fc.boolean(), (input, part, withBalancing) => {
        const design: Design = {
          ...input.design,
          bleeder: { ...input.design.bleeder, ...part },
          balancing:
            withBalancing && input.design.capacitors.series > 1
              ? { leakageCurrent: 1e-4, capacitorVoltageRating: (1.2 * input.design.bus.maxVoltage) / input.design.capacitors.series }
              : null,
        };
        const req = { ...input.requirement, fallbackMaxTime: input.requirement.maxTime * 20 };
        const { resistance: _r, series: _s, parallel: _p, ...partFamily } = design.bleeder;
        const family: SuggestDesign = { ...design, bleeder: partFamily };
        const suggestion = suggestBleeder(req, family);
        fc.pre(suggestion.found);
        if (!suggestion.found) return;
        const relevant = ['discharge-time', 'passive-fallback-time', 'resistor-power', 'resistor-voltage', 'balancing'];
        const bleederChecks = (resistance: number) => {
          const fed = { ...design, bleeder: { ...design.bleeder, resistance, series: suggestion.series, parallel: suggestion.parallel } };
          const checks = computeDischarge({ requirement: req, design: fed }).checks;
          const ids = fed.active === null ? relevant : relevant.filter((id) => id !== 'discharge-time');
          return checks.filter((c) => ids.includes(c.id));
        };
        for (const option of [suggestion, ...suggestion.alternatives]) {
          expect(bleederChecks(option.resistance).every((c) => c.pass)).toBe(true);
        }
        fc.pre(suggestion.resistance < 1e8);
        const next = eValueAbove(suggestion.resistance, suggestion.eSeries);
        expect(bleederChecks(next).some((c) => !c.pass)).toBe(true);
      }),
      { seed: 109, numRuns: 150 },
    );
  });

  it('says plainly why when no passive bleeder can do it (E4 scenario: 600 µF, 450 V, 60 V in 2 s, 2 W parts)', () => {
    const design: SuggestDesign = {
      bus: { nominalVoltage: 450, maxVoltage: 450 },
      capacitors: { capacitance: 600e-6, series: 1, parallel: 1, toleranceMinus: 0, tolerancePlus: 0 },
      bleeder: { tolerance: 0, tcrPpmPerK: 0, drift: 0, powerRating: 0.25, elementVoltage: 500, derating: 0.5 },
      ambient: { min: 25, max: 25 },
      active: null,
    };
    const suggestion = suggestBleeder(requirement({ safeVoltage: 60, maxTime: 2 }), design);
    expect(suggestion.found).toBe(false);
    if (!suggestion.found) expect(suggestion.reason).toMatch(/active discharge|warning label/);
  });
});

describe('IEC 60063 series tables', () => {
  it('E96 is 10^(i/96) rounded to three figures (from memory of the standard)', () => {
    const values = eSeriesMantissas('E96');
    expect(values).toHaveLength(96);
    values.forEach((v, i) => expect(v).toBe(Math.round(100 * 10 ** (i / 96))));
  });

  it('eValueAtOrBelow / eValueAbove agree with a brute-force scan over every decade', () => {
    for (const series of ['E24', 'E96'] as const) {
      const digits = series === 'E24' ? 2 : 3;
      const all = Array.from({ length: 16 }, (_, d) => d - 3).flatMap((e) =>
        eSeriesMantissas(series).map((m) => Number((m * 10 ** (e - digits + 1)).toPrecision(digits))),
      );
      fc.assert(
        fc.property(fc.double({ min: -2, max: 11, noNaN: true }), (exponent) => {
          const x = 10 ** exponent;
          expect(eValueAtOrBelow(x, series)).toBe(all.filter((v) => v <= x).pop());
          expect(eValueAbove(x, series)).toBe(all.find((v) => v > x));
        }),
        { seed: 110, numRuns: 500 },
      );
      for (const v of all.slice(0, -1)) expect(eValueAtOrBelow(v, series)).toBe(v);
    }
  });

  it('E24 has 24 ascending values per decade, and its historic values differ from 10^(i/24)', () => {
    const values = eSeriesMantissas('E24');
    expect(values).toHaveLength(24);
    for (let i = 1; i < values.length; i += 1) expect(values[i]).toBeGreaterThan(values[i - 1]);
    // Known deviations of E24 from the geometric rule (from memory): 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 8.2.
    const deviating = values.filter((v, i) => v !== Math.round(10 * 10 ** (i / 24)));
    expect(deviating).toEqual([27, 30, 33, 36, 39, 43, 47, 82]);
  });
});
