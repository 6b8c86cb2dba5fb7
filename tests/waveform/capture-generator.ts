// Synthetic discharge captures with known parameters. The parameters are the truth the tests check
// against: the decay laws below are the textbook ones (common practice), never the reader's own code.

export type Shape = 'exponential' | 'constant-current' | 'constant-power';

export interface DecaySpec {
  shape?: Shape;
  /** Pre-trigger (plateau) voltage above the offset, V. */
  v0: number;
  /** Exponential: τ, s. */
  tau?: number;
  /** Constant current: dV/dt = −slope, V/s (I/C). */
  slope?: number;
  /** Constant power: P/C, W/F (V² falls by 2·P/C per second). */
  powerPerFarad?: number;
  /** Level the decay settles to (probe offset, leakage path), V. */
  offset?: number;
  /** Disconnect instant, s. */
  t0: number;
  /** Time of the first sample and the sample interval, s. */
  start: number;
  interval: number;
  samples: number;
  /** Standard deviation of Gaussian noise, V. */
  noise?: number;
  seed?: number;
}

/** Noise-free voltage of the spec at time t. */
export function voltageAt(spec: DecaySpec, t: number): number {
  const offset = spec.offset ?? 0;
  const x = t - spec.t0;
  if (x <= 0) return spec.v0 + offset;
  switch (spec.shape ?? 'exponential') {
    case 'exponential':
      // V = V0·e^(−t/τ) (common practice)
      return spec.v0 * Math.exp(-x / (spec.tau ?? 1)) + offset;
    case 'constant-current':
      // C·dV/dt = −I: a straight ramp (docs/DOMAIN.md §3.8)
      return Math.max(0, spec.v0 - (spec.slope ?? 1) * x) + offset;
    case 'constant-power':
      // C·V·dV/dt = −P (energy balance, common practice): V² = V0² − 2·(P/C)·t
      return Math.sqrt(Math.max(0, spec.v0 ** 2 - 2 * (spec.powerPerFarad ?? 1) * x)) + offset;
  }
}

/** Time after t0 at which the noise-free voltage reaches `level` (analytic inverse of `voltageAt`). */
export function timeToLevel(spec: DecaySpec, level: number): number {
  const above = level - (spec.offset ?? 0);
  switch (spec.shape ?? 'exponential') {
    case 'exponential':
      return (spec.tau ?? 1) * Math.log(spec.v0 / above);
    case 'constant-current':
      return (spec.v0 - above) / (spec.slope ?? 1);
    case 'constant-power':
      return (spec.v0 ** 2 - above ** 2) / (2 * (spec.powerPerFarad ?? 1));
  }
}

/** Small, seedable PRNG (mulberry32) so every capture is reproducible. */
export function random(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal deviates by the Box–Muller transform. */
export function gaussian(rand: () => number): () => number {
  return () => Math.sqrt(-2 * Math.log(1 - rand())) * Math.cos(2 * Math.PI * rand());
}

export interface Samples {
  time: number[];
  volts: number[];
}

export function sampleDecay(spec: DecaySpec): Samples {
  const normal = gaussian(random(spec.seed ?? 1));
  const time: number[] = [];
  const volts: number[] = [];
  for (let i = 0; i < spec.samples; i++) {
    const t = spec.start + i * spec.interval;
    time.push(t);
    volts.push(voltageAt(spec, t) + (spec.noise ?? 0) * normal());
  }
  return { time, volts };
}

export interface Column {
  header: string;
  values: readonly number[];
  /** The file holds value / scale (e.g. 1e-3 for a column in ms or mV). */
  scale?: number;
  format?: (x: number) => string;
}

export interface CaptureText {
  sep?: ',' | ';' | '\t';
  decimalComma?: boolean;
  eol?: '\n' | '\r\n';
  /** Lines before the header row, written as given. */
  metadata?: string[];
  /** Extra header rows under the names (e.g. units); null to omit the header row altogether. */
  headerRows?: string[][] | null;
  quote?: boolean;
  bom?: boolean;
  trailingNewline?: boolean;
  /** Replaces the cell of `column` in data row `row` with `text` (NaN markers, empty cells). */
  replace?: { row: number; column: number; text: string }[];
}

export const scientific =
  (digits = 7) =>
  (x: number) =>
    x.toExponential(digits);

/** Writes columns as a scope-style text export. */
export function captureText(columns: readonly Column[], options: CaptureText = {}): string {
  const sep = options.sep ?? ',';
  const eol = options.eol ?? '\n';
  const wrap = (cell: string) => (options.quote ? `"${cell}"` : cell);
  const lines: string[] = [...(options.metadata ?? [])];
  if (options.headerRows !== null) {
    lines.push(columns.map((c) => wrap(c.header)).join(sep));
    for (const row of options.headerRows ?? []) lines.push(row.map(wrap).join(sep));
  }
  const replacements = new Map((options.replace ?? []).map((r) => [`${r.row}:${r.column}`, r.text]));
  const rows = columns[0]?.values.length ?? 0;
  for (let r = 0; r < rows; r++) {
    const cells = columns.map((c, k) => {
      const replaced = replacements.get(`${r}:${k}`);
      if (replaced !== undefined) return wrap(replaced);
      let text = (c.format ?? scientific())(c.values[r] / (c.scale ?? 1));
      if (options.decimalComma) text = text.replace('.', ',');
      return wrap(text);
    });
    lines.push(cells.join(sep));
  }
  const body = lines.join(eol) + (options.trailingNewline === false ? '' : eol);
  return (options.bom ? '\ufeff' : '') + body;
}

export type Encoding = 'utf-8' | 'utf-8-bom' | 'utf-16le' | 'utf-16be';

/** The bytes of `text` as a file in `encoding`, byte-order mark included where the encoding has one (Node's own encoders). */
export function encodeText(text: string, encoding: Encoding): Buffer {
  switch (encoding) {
    case 'utf-8':
      return Buffer.from(text, 'utf8');
    case 'utf-8-bom':
      return Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(text, 'utf8')]);
    case 'utf-16le':
      return Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(text, 'utf16le')]);
    case 'utf-16be':
      return Buffer.concat([Buffer.from([0xfe, 0xff]), Buffer.from(text, 'utf16le').swap16()]);
  }
}
