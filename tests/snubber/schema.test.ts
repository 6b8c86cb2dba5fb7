// Bad input to the snubber sizing helper and to a design's snubber list must come back as errors on
// the field at fault (the API turns them into a 400 with paths), never as a number.
import { describe, expect, it } from 'vitest';
import { ringingInputSchema, snubberSchema } from '../../shared/schema/snubber';

const good = { f0: 20e6, cAdd: 300e-12, f1: 10e6 };

/** Field paths of the issues, joined with dots. */
function errorPaths(result: { success: boolean; error?: { issues: { path: PropertyKey[] }[] } }): string[] {
  expect(result.success).toBe(false);
  return (result.error?.issues ?? []).map((i) => i.path.map(String).join('.'));
}

describe('ringing input', () => {
  it('accepts the E12 measurement and defaults the multiple to 3.5 (common practice 3–4 × C_par)', () => {
    const parsed = ringingInputSchema.parse(good);
    expect(parsed).toEqual({ ...good, multiple: 3.5 });
  });

  it('f1 ≥ f0 is an error on f1', () => {
    expect(errorPaths(ringingInputSchema.safeParse({ ...good, f1: 20e6 }))).toEqual(['f1']);
    const swapped = ringingInputSchema.safeParse({ ...good, f1: 30e6 });
    expect(errorPaths(swapped)).toEqual(['f1']);
    expect(swapped.error?.issues[0].message).toMatch(/below f0/);
  });

  it.each([
    ['zero f0', { f0: 0 }, 'f0'],
    ['negative added capacitance', { cAdd: -300e-12 }, 'cAdd'],
    ['NaN f1', { f1: Number.NaN }, 'f1'],
    ['infinite f0', { f0: Number.POSITIVE_INFINITY }, 'f0'],
    ['1e15 Hz', { f0: 1e15 }, 'f0'],
    ['a ring below 1 kHz', { f1: 10 }, 'f1'],
    ['1 F added', { cAdd: 1 }, 'cAdd'],
    ['a text frequency', { f0: '20 MHz' }, 'f0'],
    ['multiple 0.5', { multiple: 0.5 }, 'multiple'],
    ['multiple 30', { multiple: 30 }, 'multiple'],
    ['negative switching voltage', { switchingVoltage: -48 }, 'switchingVoltage'],
  ])('%s is an error on its own field', (_, change, path) => {
    expect(errorPaths(ringingInputSchema.safeParse({ ...good, ...change }))).toEqual([path]);
  });

  it('several bad fields are all reported, each on its path', () => {
    const paths = errorPaths(ringingInputSchema.safeParse({ f0: 0, cAdd: Number.NaN, f1: -1 }));
    expect(paths.sort()).toEqual(['cAdd', 'f0', 'f1']);
  });

  it('a missing field is named', () => {
    expect(errorPaths(ringingInputSchema.safeParse({ f0: 20e6, f1: 10e6 }))).toEqual(['cAdd']);
  });
});

describe('snubber in a design', () => {
  const rc = {
    name: 'R2/C5',
    location: 'across Q1',
    kind: 'rc',
    resistance: 82,
    capacitance: 330e-12,
    capacitanceTolerance: 0.1,
    powerRating: 0.25,
    derating: 0.5,
    capacitorVoltageRating: 100,
    switchingVoltage: 48,
    overshoot: 0.3,
    switchingFrequency: 250e3,
    accessible: true,
  };

  it('accepts an RC snubber, with or without its parasitics', () => {
    expect(snubberSchema.parse(rc)).toEqual(rc);
    expect(snubberSchema.safeParse({ ...rc, parasiticInductance: 633e-9, parasiticCapacitance: 100e-12 }).success).toBe(true);
  });

  it('an unknown kind is an error on kind', () => {
    expect(errorPaths(snubberSchema.safeParse({ ...rc, kind: 'rlc' }))).toEqual(['kind']);
  });

  it.each([
    ['zero resistance', { resistance: 0 }, 'resistance'],
    ['negative capacitance', { capacitance: -1e-9 }, 'capacitance'],
    ['tolerance given as a percentage', { capacitanceTolerance: 10 }, 'capacitanceTolerance'],
    ['derating of zero', { derating: 0 }, 'derating'],
    ['NaN overshoot', { overshoot: Number.NaN }, 'overshoot'],
    ['1e15 Hz switching', { switchingFrequency: 1e15 }, 'switchingFrequency'],
    ['an empty name', { name: ' ' }, 'name'],
  ])('%s is an error on its own field', (_, change, path) => {
    expect(errorPaths(snubberSchema.safeParse({ ...rc, ...change }))).toEqual([path]);
  });

  it('an RCD clamp whose clamp voltage is not above the reflected voltage is an error on clampVoltage', () => {
    const clamp = { ...rc, kind: 'rcd-clamp', clampVoltage: 90, reflectedVoltage: 100 };
    expect(errorPaths(snubberSchema.safeParse(clamp))).toEqual(['clampVoltage']);
  });

  it("an empty form field arrives as null and counts as not entered; one kind's extras are dropped from another", () => {
    const parsed = snubberSchema.parse({ ...rc, parasiticInductance: null, clampVoltage: 150 });
    expect(parsed).toEqual({ ...rc, parasiticInductance: null });
  });
});
