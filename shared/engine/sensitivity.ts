// Sensitivity of the worst-case time to each input: forward finite difference with a +1 % step, i.e.
// literally "what the time does when this input is 1 % higher".
import type { Design, Requirement, Sensitivity } from '../schema/discharge';
import { worstCaseTime } from './scenario';

interface SensitivityInput {
  input: string;
  label: string;
}

const INPUTS: readonly SensitivityInput[] = [
  { input: 'design.capacitors.capacitance', label: 'Capacitance per unit' },
  { input: 'design.capacitors.tolerancePlus', label: 'Capacitance tolerance (+)' },
  { input: 'design.bleeder.resistance', label: 'Resistance per resistor' },
  { input: 'design.bleeder.tolerance', label: 'Resistor tolerance' },
  { input: 'design.bleeder.tcrPpmPerK', label: 'Resistor TCR' },
  { input: 'design.bleeder.drift', label: 'Resistor life drift' },
  { input: 'design.bus.maxVoltage', label: 'Maximum bus voltage' },
  { input: 'design.active.current', label: 'Active discharge current' },
  { input: 'design.active.resistance', label: 'Active discharge resistance' },
  { input: 'design.active.delay', label: 'Activation delay' },
  { input: 'requirement.safeVoltage', label: 'Safe voltage' },
  { input: 'requirement.maxCharge', label: 'Charge limit' },
  { input: 'requirement.maxEnergy', label: 'Energy limit' },
];

type Tree = { readonly [key: string]: unknown };

const isTree = (value: unknown): value is Tree => typeof value === 'object' && value !== null && !Array.isArray(value);

function read(root: Tree, path: readonly string[]): unknown {
  let node: unknown = root;
  for (const key of path) node = isTree(node) ? node[key] : undefined;
  return node;
}

/** A copy of `root` with the number at `path` multiplied by `factor`; the original is untouched. */
function scaled(root: Tree, path: readonly string[], factor: number): Tree {
  const [key, ...rest] = path;
  const child = root[key];
  return { ...root, [key]: rest.length ? scaled(isTree(child) ? child : {}, rest, factor) : (child as number) * factor };
}

export function sensitivity(requirement: Requirement, design: Design): Sensitivity {
  const of = 'worst-case time to safe on the declared discharge path';
  const base = worstCaseTime(requirement, design);
  if (!(base > 0)) return { of: `${of} (none: already safe at the start)`, entries: [] };
  const root: Tree = { requirement, design };
  const entries = INPUTS.flatMap(({ input, label }) => {
    const path = input.split('.');
    const value = read(root, path);
    if (typeof value !== 'number' || value === 0) return [];
    const bumped = scaled(root, path, 1.01);
    // The bumped tree has the same shape as the validated input; only one number changed.
    const time = worstCaseTime(bumped.requirement as Requirement, bumped.design as Design);
    return [{ input, label, percentPerPercent: ((time - base) / base) * 100 }];
  });
  return { of, entries };
}
