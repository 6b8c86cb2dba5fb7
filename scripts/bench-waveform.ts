// Benchmark of the capture reader: ingest + analysis of a generated 10-million-row capture, against the
// parse-only throughput of two general CSV parsers on the same file. Targets (issue 5): at least 3× the
// throughput of uDSV, and peak RSS under 128 MB for our reader. The same capture written as UTF-16 LE
// (issue 18) measures the cost of transcoding in the stream, beside the UTF-8 figure.
//
//   node --import tsx scripts/bench-waveform.ts [rows] [runs]
//
// Each contender runs in a fresh child process (so peak RSS is its own), several times, interleaved; the
// median is reported. The file is read once beforehand so that every run finds it in the page cache.
import { spawnSync } from 'node:child_process';
import { closeSync, createReadStream, existsSync, openSync, readFileSync, statSync, writeSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

type Outcome = { rows: number; summary: string };
/** Loads a contender's modules (outside the timing) and returns its run. */
type Contender = () => Promise<(path: string) => Promise<Outcome>>;

interface RunResult {
  contender: string;
  seconds: number;
  cpuSeconds: number;
  rows: number;
  peakRssMb: number;
  summary: string;
}

// The generated decay: 400 V plateau, disconnect at t = 0, τ = 0.5 s, 0.5 V rms noise; a relay marker
// channel drops from 5 V to 0 at t = 0.
const TAU = 0.5;
const V0 = 400;
const START = -0.5;
const DURATION = 5;
const METADATA_LINES = 4;

function generate(path: string, rows: number): void {
  const interval = DURATION / rows;
  const fd = openSync(path, 'w');
  let seed = 12345;
  const rand = () => {
    seed = (seed * 1103515245 + 12345) % 2147483648;
    return seed / 2147483648;
  };
  let text =
    `Instrument,synthetic capture\nSample interval,${interval.toExponential(4)}\nRecord length,${rows}\nTrigger,relay channel falling edge\n` +
    'Time (s),CH1 (V),CH2 (V)\n';
  for (let i = 0; i < rows; i++) {
    const t = START + i * interval;
    const clean = t < 0 ? V0 : V0 * Math.exp(-t / TAU);
    // Sum of four uniforms: near-Gaussian noise, cheap enough for 10⁷ rows.
    const noise = (rand() + rand() + rand() + rand() - 2) * 0.87;
    text += `${t.toExponential(7)},${(clean + noise).toExponential(5)},${t < 0 ? '5.00000e+0' : '0.00000e+0'}\n`;
    if (text.length > 1 << 20) {
      writeSync(fd, text);
      text = '';
    }
  }
  writeSync(fd, text);
  closeSync(fd);
}

/** The UTF-8 capture as UTF-16 LE with a byte-order mark, transcoded chunk by chunk (the capture is ASCII). */
async function writeUtf16(from: string, to: string): Promise<void> {
  const fd = openSync(to, 'w');
  writeSync(fd, Buffer.from([0xff, 0xfe]));
  for await (const chunk of createReadStream(from, { highWaterMark: 1 << 20 })) {
    writeSync(fd, Buffer.from((chunk as Buffer).toString('latin1'), 'utf16le'));
  }
  closeSync(fd);
}

function voltfall(markerChannel: string | undefined): Contender {
  return async () => {
    const { analyseCaptureFile } = await import('../server/evidence/waveform/reader');
    return async (path) => {
      const result = await analyseCaptureFile(path, { safeVoltage: 60, maxTime: 3, channel: 'CH1', markerChannel });
      return {
        rows: result.samples,
        summary: `t0 ${result.t0.toExponential(3)} s (${result.t0Source}), τ ${result.tau?.toPrecision(6)} s, to 60 V ${result.timeToSafe?.toPrecision(6)} s, ${result.trace.length} trace points`,
      };
    };
  };
}

/** The reader loaded and nothing read: the process's own share of the peak RSS. */
const idle: Contender = async () => {
  await import('../server/evidence/waveform/reader');
  return async () => ({ rows: 0, summary: 'reader module loaded, no file read' });
};

/** Header and data of the file: the metadata lines are cut off the first chunk for the CSV parsers. */
function withoutMetadata(chunk: string): string {
  let at = 0;
  for (let i = 0; i < METADATA_LINES; i++) at = chunk.indexOf('\n', at) + 1;
  return chunk.slice(at);
}

const udsv: Contender = async () => {
  const { inferSchema, initParser } = await import('udsv');
  return async (path) => {
    let parser: ReturnType<typeof initParser> | null = null;
    let rows = 0;
    let sum = 0;
    for await (const chunk of createReadStream(path, { highWaterMark: 1 << 20 })) {
      let text = (chunk as Buffer).toString();
      if (!parser) {
        text = withoutMetadata(text);
        parser = initParser(inferSchema(text));
      }
      parser.chunk<number[]>(text, parser.typedArrs, (row) => {
        rows++;
        sum += row[1];
      });
    }
    parser?.end();
    return { rows, summary: `sum of CH1 ${sum.toExponential(6)}` };
  };
};

const papaparse: Contender = async () => {
  const { default: Papa } = await import('papaparse');
  return async (path) => {
    let rows = 0;
    let sum = 0;
    let header = true;
    await new Promise<void>((resolve, reject) => {
      Papa.parse<number[]>(createReadStream(path, { highWaterMark: 1 << 20 }), {
        dynamicTyping: true,
        skipEmptyLines: true,
        beforeFirstChunk: withoutMetadata,
        chunk: (results) => {
          for (const row of results.data) {
            if (header) {
              header = false;
              continue;
            }
            rows++;
            sum += row[1];
          }
        },
        complete: () => resolve(),
        error: (error) => reject(error),
      });
    });
    return { rows, summary: `sum of CH1 ${sum.toExponential(6)}` };
  };
};

type FileKind = 'utf-8' | 'utf-16le';

const CONTENDERS: Record<string, { label: string; load: Contender; file: FileKind }> = {
  voltfall: { label: 'Voltfall reader, CH1 + marker CH2', load: voltfall('CH2'), file: 'utf-8' },
  'voltfall-ch1': { label: 'Voltfall reader, CH1 only', load: voltfall(undefined), file: 'utf-8' },
  'voltfall-utf16': { label: 'Voltfall reader, UTF-16 LE, CH1 + CH2', load: voltfall('CH2'), file: 'utf-16le' },
  udsv: { label: 'uDSV, typed rows (parse only)', load: udsv, file: 'utf-8' },
  papaparse: { label: 'papaparse, dynamicTyping (parse only)', load: papaparse, file: 'utf-8' },
  idle: { label: 'idle: tsx + reader loaded, no file', load: idle, file: 'utf-8' },
};
type ContenderName = keyof typeof CONTENDERS & string;

async function child(name: ContenderName, path: string): Promise<void> {
  const run = await CONTENDERS[name].load();
  const cpu = process.cpuUsage();
  const started = performance.now();
  const outcome = await run(path);
  const seconds = (performance.now() - started) / 1000;
  const used = process.cpuUsage(cpu);
  const result: RunResult = {
    contender: name,
    seconds,
    cpuSeconds: (used.user + used.system) / 1e6,
    peakRssMb: process.resourceUsage().maxRSS / 1024,
    ...outcome,
  };
  process.stdout.write(`${JSON.stringify(result)}\n`);
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

function versionOf(pkg: string): string {
  const file = join(dirname(fileURLToPath(import.meta.url)), '..', 'node_modules', pkg, 'package.json');
  return (JSON.parse(readFileSync(file, 'utf8')) as { version: string }).version;
}

async function main(): Promise<void> {
  const rows = Number(process.argv[2] ?? 10_000_000);
  const runs = Number(process.argv[3] ?? 3);
  const paths: Record<FileKind, string> = {
    'utf-8': join(tmpdir(), `voltfall-bench-${rows}.csv`),
    'utf-16le': join(tmpdir(), `voltfall-bench-${rows}-utf16le.csv`),
  };
  if (!existsSync(paths['utf-8'])) {
    process.stdout.write(`generating ${rows.toLocaleString('en')} rows in ${paths['utf-8']} …\n`);
    generate(paths['utf-8'], rows);
  }
  if (!existsSync(paths['utf-16le'])) {
    process.stdout.write(`writing the same capture as UTF-16 LE in ${paths['utf-16le']} …\n`);
    await writeUtf16(paths['utf-8'], paths['utf-16le']);
  }
  const megabytes = (kind: FileKind) => statSync(paths[kind]).size / 1e6;
  for (const path of Object.values(paths)) for await (const chunk of createReadStream(path, { highWaterMark: 1 << 22 })) void chunk;

  const names = Object.keys(CONTENDERS) as ContenderName[];
  const results = Object.fromEntries(names.map((name) => [name, [] as RunResult[]])) as Record<ContenderName, RunResult[]>;
  const self = fileURLToPath(import.meta.url);
  for (let run = 0; run < runs; run++) {
    for (const name of names) {
      const out = spawnSync(process.execPath, [...process.execArgv, self, '--contender', name, paths[CONTENDERS[name].file]], {
        encoding: 'utf8',
        maxBuffer: 1 << 20,
      });
      if (out.status !== 0) throw new Error(`${name} failed: ${out.stderr}`);
      results[name].push(JSON.parse(out.stdout.trim().split('\n').pop() ?? '{}') as RunResult);
    }
  }

  const line = (cells: string[]) => cells.map((c, i) => (i === 0 ? c.padEnd(40) : c.padStart(10))).join('');
  process.stdout.write(
    `\ncapture: ${paths['utf-8']}\n${rows.toLocaleString('en')} rows × 3 columns, ${megabytes('utf-8').toFixed(1)} MB (10^6 bytes) in UTF-8, ` +
      `${megabytes('utf-16le').toFixed(1)} MB in UTF-16 LE; ${runs} runs per contender, medians;` +
      ` Node ${process.version}, uDSV ${versionOf('udsv')}, papaparse ${versionOf('papaparse')}\n` +
      'Voltfall: ingest + full analysis (t0, V0, crossing, fit, trace); uDSV and papaparse: parse to numbers only.\n' +
      'MB/s is of the bytes of the file each contender reads.\n\n',
  );
  process.stdout.write(`${line(['contender', 'wall s', 'MB/s', 'CPU s', 'peak RSS', 'vs uDSV'])}\n`);
  const wall = (name: ContenderName) => median(results[name].map((r) => r.seconds));
  const cpu = (name: ContenderName) => median(results[name].map((r) => r.cpuSeconds));
  const peak = (name: ContenderName) => Math.max(...results[name].map((r) => r.peakRssMb));
  for (const name of names) {
    const reads = name !== 'idle';
    process.stdout.write(
      `${line([
        CONTENDERS[name].label,
        reads ? wall(name).toFixed(2) : '',
        reads ? (megabytes(CONTENDERS[name].file) / wall(name)).toFixed(0) : '',
        reads ? cpu(name).toFixed(2) : '',
        `${peak(name).toFixed(0)} MB`,
        reads ? `${(wall('udsv') / wall(name)).toFixed(2)}×` : '',
      ])}\n`,
    );
  }
  process.stdout.write('\n');
  for (const name of names) {
    const r = results[name][0];
    process.stdout.write(`${name}: ${r.rows.toLocaleString('en')} rows; ${r.summary}\n`);
  }
  const ratio = wall('udsv') / wall('voltfall');
  const best = wall('udsv') / Math.min(...results.voltfall.map((r) => r.seconds));
  const rss = Math.max(peak('voltfall'), peak('voltfall-ch1'), peak('voltfall-utf16'));
  const expected = TAU * Math.log(V0 / 60);
  const utf16 = wall('voltfall-utf16');
  const sameResult = results['voltfall-utf16'].every((r) => r.summary === results.voltfall[0].summary && r.rows === results.voltfall[0].rows);
  process.stdout.write(
    `\ntruth: τ ${TAU} s, to 60 V ${expected.toPrecision(6)} s after t0 = 0\n` +
      `target ≥ 3× uDSV (CH1 + marker, all three columns parsed): ${ratio >= 3 ? 'met' : 'MISSED'} — ` +
      `${ratio.toFixed(2)}× by wall time (best run ${best.toFixed(2)}×), ${(cpu('udsv') / cpu('voltfall')).toFixed(2)}× by CPU time\n` +
      `UTF-16 LE beside UTF-8 (same capture, CH1 + marker): ${(megabytes('utf-16le') / utf16).toFixed(0)} MB/s of UTF-16 bytes against ` +
      `${(megabytes('utf-8') / wall('voltfall')).toFixed(0)} MB/s of UTF-8 bytes; the same capture in ${(utf16 / wall('voltfall')).toFixed(2)}× the UTF-8 wall time, ` +
      `${(cpu('voltfall-utf16') / cpu('voltfall')).toFixed(2)}× its CPU time (${(cpu('udsv') / cpu('voltfall-utf16')).toFixed(2)}× uDSV on the UTF-8 file by CPU time); ` +
      `same result as UTF-8: ${sameResult ? 'yes' : 'NO'}\n` +
      `target peak RSS < 128 MB: ${rss < 128 ? 'met' : 'MISSED'} — ${rss.toFixed(0)} MB, of which ${peak('idle').toFixed(0)} MB is the idle process (Node + tsx + modules)\n`,
  );
}

if (process.argv[2] === '--contender') {
  await child(process.argv[3] as ContenderName, process.argv[4]);
} else {
  await main();
}
