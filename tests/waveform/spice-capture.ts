// A discharge capture produced by ngspice (an independent circuit simulator): a bus held at V0 by a
// relay that opens at `open`, then discharged by the bleeder. Written out as a scope-style CSV with the
// relay drive as a marker channel.
import { simulate } from '../support/ngspice';
import { captureText } from './capture-generator';

export interface BleederCircuit {
  /** Bus voltage before the relay opens, V; negative for a negative rail. */
  v0: number;
  capacitance: number;
  resistance: number;
  /** Relay opening instant, s. */
  open: number;
  /** Simulated span and largest time step, s. */
  stop: number;
  step: number;
  /** Input resistance of the measuring instrument across the bank, Ω (none when absent). */
  probe?: number;
}

export interface SpiceCapture {
  text: string;
  /** ngspice's own measurement of |v| reaching `level`, s after the relay opened. */
  measuredCrossing: number;
}

export async function spiceCapture(circuit: BleederCircuit, level: number): Promise<SpiceCapture> {
  const { v0, capacitance, resistance, open, stop, step, probe } = circuit;
  const deck = [
    '* bleeder discharge after the supply relay opens',
    `V1 src 0 DC ${v0}`,
    'S1 src bus ctl 0 relay',
    `Vctl ctl 0 PWL(0 5 ${open} 5 ${open + 1e-4} 0)`,
    '.model relay SW(VT=2.5 VH=0.1 RON=0.01 ROFF=1e12)',
    `C1 bus 0 ${capacitance}`,
    `R1 bus 0 ${resistance}`,
    ...(probe === undefined ? [] : [`Rprobe bus 0 ${probe}`]),
    `.tran ${step} ${stop} 0 ${step}`,
  ].join('\n');
  const run = await simulate(deck, {
    vectors: ['v(ctl)', 'v(bus)'],
    measures: [
      v0 < 0 ? `meas tran tcross WHEN v(bus)=${-level} RISE=1` : `meas tran tcross WHEN v(bus)=${level} FALL=1`,
      'meas tran topen WHEN v(ctl)=2.5 FALL=1',
    ],
  });
  const text = captureText(
    [
      { header: 'Time (s)', values: run.time, format: String },
      { header: 'Relay (V)', values: run.vectors['v(ctl)'], format: String },
      { header: 'Bus (V)', values: run.vectors['v(bus)'], format: String },
    ],
    { metadata: ['Source,ngspice transient analysis', `Points,${run.time.length}`] },
  );
  return { text, measuredCrossing: run.measures.tcross - run.measures.topen };
}
