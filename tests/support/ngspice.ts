// Runs Debian's ngspice (an independent, general-purpose circuit simulator) in batch mode.
// The netlist is the caller's; this only appends a control block that runs it and writes the
// requested vectors and measurements, then reads them back.
import { execFile } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';

const run = promisify(execFile);

export const NGSPICE = '/usr/bin/ngspice';

export interface SpiceRun {
  /** Time points of the transient analysis, in seconds. */
  time: number[];
  /** Each requested vector (e.g. "v(n1)") sampled at `time`. */
  vectors: Record<string, number[]>;
  /** Each `meas` result by its (lower-case) name; missing when ngspice could not measure it. */
  measures: Record<string, number>;
  stdout: string;
}

/**
 * Simulates `netlist` (a complete deck with title line, elements and a `.tran` line, without `.end`)
 * and returns the requested vectors and `.meas`-style measurements (`meas tran name WHEN …` lines).
 */
export async function simulate(netlist: string, options: { vectors?: string[]; measures?: string[] } = {}): Promise<SpiceRun> {
  const dir = mkdtempSync(join(tmpdir(), 'vf-spice-'));
  try {
    const vectors = options.vectors ?? [];
    const dataFile = join(dir, 'out.txt');
    const control = [
      '.control',
      'set filetype=ascii',
      'set wr_singlescale',
      'set wr_vecnames',
      'run',
      ...(vectors.length ? [`wrdata ${dataFile} ${vectors.join(' ')}`] : []),
      ...(options.measures ?? []),
      'quit',
      '.endc',
      '.end',
    ].join('\n');
    const deck = join(dir, 'deck.cir');
    writeFileSync(deck, `${netlist.trimEnd().replace(/\n\.end\s*$/i, '')}\n${control}\n`);
    const { stdout, stderr } = await run(NGSPICE, ['-b', deck], { maxBuffer: 64 * 1024 * 1024 });
    const text = `${stdout}\n${stderr}`;
    const measures: Record<string, number> = {};
    for (const m of text.matchAll(/^\s*([a-z_][\w]*)\s*=\s*([-+0-9.eE]+)/gim)) {
      measures[m[1].toLowerCase()] = Number(m[2]);
    }
    const time: number[] = [];
    const series: Record<string, number[]> = Object.fromEntries(vectors.map((v) => [v, [] as number[]]));
    if (vectors.length) {
      const lines = readFileSync(dataFile, 'utf8').trim().split('\n');
      for (const line of lines.slice(1)) {
        const cols = line.trim().split(/\s+/).map(Number);
        time.push(cols[0]);
        vectors.forEach((v, i) => series[v].push(cols[i + 1]));
      }
    }
    return { time, vectors: series, measures, stdout: text };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
