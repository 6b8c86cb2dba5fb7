// The wire schema turns nonsense into field-level errors and lets real designs through.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { computeDischarge } from '../../shared/engine';
import {
  designDraftSchema,
  designSchema,
  dischargeInputSchema,
  dischargeResultSchema,
  requirementSchema,
  type Design,
  type Requirement,
} from '../../shared/schema/discharge';

// docs/ARCHITECTURE.md §6.3 example body, read from the document itself so the two cannot differ.
const architecture = readFileSync(join(__dirname, '../../docs/ARCHITECTURE.md'), 'utf8');
const exampleBlock = /### 6\.3 [^]*?```json\n([^]*?)```/.exec(architecture);
if (!exampleBlock) throw new Error('docs/ARCHITECTURE.md §6.3 has no JSON example');
const example = JSON.parse(exampleBlock[1]) as { requirement: Requirement; design: Omit<Design, 'snubbers' | 'balancing'> };

function errorPaths(result: { success: boolean; error?: { issues: { path: PropertyKey[] }[] } }): string[] {
  return (result.error?.issues ?? []).map((i) => i.path.map(String).join('.'));
}

function withLeaf(path: string, value: unknown): unknown {
  const copy = structuredClone(example) as Record<string, unknown>;
  const keys = path.split('.');
  let node = copy;
  for (const key of keys.slice(0, -1)) node = node[key] as Record<string, unknown>;
  node[keys[keys.length - 1]] = value;
  return copy;
}

describe('dischargeInputSchema', () => {
  it('accepts the docs/ARCHITECTURE.md §6.3 example as written', () => {
    expect(dischargeInputSchema.safeParse(example).success).toBe(true);
    expect(designSchema.safeParse(example.design).success).toBe(true);
  });

  const nonsense: [string, unknown][] = [
    ['design.capacitors.capacitance', 0],
    ['design.capacitors.capacitance', -4.7e-4],
    ['design.capacitors.capacitance', Number.NaN],
    ['design.capacitors.capacitance', Number.POSITIVE_INFINITY],
    ['design.capacitors.capacitance', '470u'],
    ['design.capacitors.capacitance', 1e30],
    ['design.bleeder.resistance', 0],
    ['design.bleeder.resistance', -1],
    ['design.bleeder.resistance', 1e15],
    ['design.bleeder.series', 1.5],
    ['design.bleeder.parallel', 0],
    ['design.capacitors.series', -2],
    ['design.bleeder.tolerance', 1],
    ['design.bleeder.tolerance', -0.01],
    ['design.capacitors.tolerancePlus', 5],
    ['design.bleeder.derating', 0],
    ['design.bus.maxVoltage', 1e9],
    ['design.bus.maxVoltage', Number.NEGATIVE_INFINITY],
    ['requirement.safeVoltage', 0],
    ['requirement.maxTime', -5],
    ['requirement.maxTime', 1e12],
    ['requirement.maxCharge', 0],
    ['design.ambient.min', -300],
  ];

  it.each(nonsense)('rejects %s = %s with that field path', (path, value) => {
    const result = dischargeInputSchema.safeParse(withLeaf(path, value));
    expect(result.success).toBe(false);
    expect(errorPaths(result)).toContain(path);
    expect(result.error?.issues[0].message).toMatch(/^[A-Z]/);
  });

  it('says plainly what is wrong', () => {
    const zero = dischargeInputSchema.safeParse(withLeaf('design.capacitors.capacitance', 0));
    expect(zero.error?.issues[0].message).toBe('Capacitance per unit must be greater than zero');
    const huge = dischargeInputSchema.safeParse(withLeaf('design.capacitors.capacitance', 1e30));
    expect(huge.error?.issues[0].message).toMatch(/not a realistic value — check the unit/);
    const text = dischargeInputSchema.safeParse(withLeaf('design.bleeder.resistance', 'abc'));
    expect(text.error?.issues[0].message).toMatch(/must be a finite number in Ω/);
  });

  it('puts cross-field errors on the field to fix: nominal above maximum, ambient min above max', () => {
    const bus = dischargeInputSchema.safeParse(withLeaf('design.bus', { nominalVoltage: 700, maxVoltage: 622 }));
    expect(errorPaths(bus)).toEqual(['design.bus.maxVoltage']);
    const ambient = dischargeInputSchema.safeParse(withLeaf('design.ambient', { min: 90, max: 85 }));
    expect(errorPaths(ambient)).toEqual(['design.ambient.max']);
  });

  it('rejects an unknown active-discharge mode on the mode field', () => {
    const result = dischargeInputSchema.safeParse(withLeaf('design.active', { mode: 'magic', current: 1, delay: 0 }));
    expect(errorPaths(result)).toContain('design.active.mode');
  });

  it('rejects a requirement that is not an object, and a missing safe voltage, with paths', () => {
    expect(errorPaths(dischargeInputSchema.safeParse({ ...example, requirement: 'sixty volts' }))).toContain('requirement');
    expect(errorPaths(requirementSchema.safeParse({ maxTime: 5 }))).toContain('safeVoltage');
  });
});

describe('designDraftSchema and the incomplete verdict', () => {
  it('accepts an empty or partial draft, but not invalid values in it', () => {
    expect(designDraftSchema.safeParse({}).success).toBe(true);
    expect(designDraftSchema.safeParse({ bus: { maxVoltage: 622 }, bleeder: { resistance: null } }).success).toBe(true);
    const bad = designDraftSchema.safeParse({ capacitors: { capacitance: -1 } });
    expect(errorPaths(bad)).toEqual(['capacitors.capacitance']);
  });

  it('gives verdict "incomplete" and lists exactly the missing fields', () => {
    const design = structuredClone(example.design) as Record<string, Record<string, unknown> | null>;
    delete (design.bleeder as Record<string, unknown>).powerRating;
    (design.bus as Record<string, unknown>).maxVoltage = null;
    const result = computeDischarge({ requirement: example.requirement, design });
    expect(result.verdict).toBe('incomplete');
    expect(result.missing.sort()).toEqual(['design.bleeder.powerRating', 'design.bus.maxVoltage']);
    expect(result.checks).toEqual([]);
  });

  it('still suggests a bleeder when only its value and string counts are missing', () => {
    const bleeder = { ...example.design.bleeder } as Record<string, unknown>;
    delete bleeder.resistance;
    delete bleeder.series;
    delete bleeder.parallel;
    const result = computeDischarge({
      requirement: { ...example.requirement, maxTime: 600 },
      design: { ...example.design, bleeder },
    });
    expect(result.verdict).toBe('incomplete');
    expect(result.suggestion?.found).toBe(true);
    expect(dischargeResultSchema.safeParse(result).success).toBe(true);
  });
});

describe('dischargeResultSchema', () => {
  it('describes what computeDischarge returns, complete or not', () => {
    expect(dischargeResultSchema.safeParse(computeDischarge(example)).success).toBe(true);
    expect(dischargeResultSchema.safeParse(computeDischarge({ requirement: example.requirement, design: {} })).success).toBe(true);
    const active = computeDischarge({
      ...example,
      design: { ...example.design, active: { mode: 'switched-resistor', resistance: 1500, pulseEnergy: 100, delay: 0.1 } },
    });
    expect(dischargeResultSchema.safeParse(active).success).toBe(true);
    expect(active.checks.map((c) => c.id)).toEqual([
      'discharge-time',
      'passive-fallback-time',
      'resistor-power',
      'resistor-voltage',
      'stored-energy',
      'active-pulse-energy',
      'active-peak-power',
    ]);
  });
});
