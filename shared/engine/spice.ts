// Plain SPICE netlist of the passive discharge network at one corner, element by element as built, so an
// engineer can re-check the figure in any simulator. The tests run this exact text through ngspice.
import type { Design, Requirement } from '../schema/discharge';
import { describeScenario, describeThreshold, q } from './describe';
import { type Corner, scenario } from './scenario';

/** Node the bank and the bleeders share; the other end is ground (0). */
export const SPICE_BUS_NODE = 'bus';
/** Name of the `.meas` result: time at which the bus crosses the safe threshold. */
export const SPICE_MEASURE = 't_safe';

/** Comments in plain ASCII: several simulators read netlists as 8-bit text and garble µ, Ω or °. */
function ascii(text: string): string {
  return text
    .replace(/[µμ]/g, 'u')
    .replace(/Ω/g, 'Ohm')
    .replace(/°C/g, 'degC')
    .replace(/[−–]/g, '-')
    .replace(/×/g, 'x')
    .replace(/[^\x20-\x7e]/g, '?');
}

function num(value: number): string {
  return Number(value.toPrecision(12)).toString();
}

/** Elements of `parallel` strings of `series` equal parts from the bus to ground. */
function strings(prefix: 'C' | 'R', series: number, parallel: number, value: number, ic?: number): string[] {
  const lines: string[] = [];
  for (let k = 1; k <= parallel; k += 1) {
    for (let j = 1; j <= series; j += 1) {
      const from = j === 1 ? SPICE_BUS_NODE : `${prefix.toLowerCase()}${k}_${j - 1}`;
      const to = j === series ? '0' : `${prefix.toLowerCase()}${k}_${j}`;
      lines.push(`${prefix}${k}_${j} ${from} ${to} ${num(value)}${ic === undefined ? '' : ` IC=${num(ic)}`}`);
    }
  }
  return lines;
}

export function spiceNetlist(input: { readonly requirement: Requirement; readonly design: Design }, corner: Corner): string {
  const { requirement, design } = input;
  const s = scenario(requirement, design, corner);
  const { capacitors, bleeder } = design;
  // Past the safe instant and the time limit (the latter capped at 20 decay scales so a far limit does
  // not cost millions of steps), with a maximum step fine enough to resolve the crossing far below 0.1 %.
  const scale = Math.max(s.passiveTimeToSafe, s.tau);
  const stop = 1.5 * Math.max(scale, Math.min(requirement.maxTime, 20 * scale));
  const maxStep = scale / 2000;
  const comments = [
    `* Capacitor discharge network, ${corner === 'worst' ? 'worst-case' : 'nominal'} corner`,
    `* ${describeScenario({ ...s, main: s.passive }, design)}`,
    `* Safe threshold: ${describeThreshold(s.threshold, requirement, s.capacitance)}; limit ${q(requirement.maxTime, 's')}`,
    `* Bank: ${capacitors.parallel} string(s) of ${capacitors.series} × ${q(s.capacitorUnit, 'F')}, each charged to ${q(s.initialVoltage / capacitors.series, 'V')}`,
    `* Bleeder: ${bleeder.parallel} string(s) of ${bleeder.series} × ${q(s.resistorUnit, 'Ω')}`,
    ...(design.active === null ? [] : ['* The active discharge circuit is not modelled: this is the bleeders-alone fallback.']),
  ].map(ascii);
  const lines = [
    ...comments,
    ...strings('C', capacitors.series, capacitors.parallel, s.capacitorUnit, s.initialVoltage / capacitors.series),
    ...strings('R', bleeder.series, bleeder.parallel, s.resistorUnit),
    `.tran ${num(maxStep)} ${num(stop)} 0 ${num(maxStep)} UIC`,
    `.meas tran ${SPICE_MEASURE} WHEN v(${SPICE_BUS_NODE})=${num(s.threshold.voltage)} FALL=1`,
    '.end',
  ];
  return `${lines.join('\n')}\n`;
}
