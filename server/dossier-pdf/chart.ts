// The decay chart as an SVG string, which pdfmake draws as PDF vector paths and text (no raster image),
// so an assessor can zoom into the measured traces and the text stays searchable.
import { scaleLinear } from 'd3-scale';

interface ChartPoint {
  t: number;
  v: number;
}

export interface ChartSeries {
  label: string;
  /** Model curves set the time span; measured traces are drawn within it. */
  kind: 'model' | 'measured';
  points: readonly ChartPoint[];
  color: string;
  width: number;
  dash?: string;
}

interface DecayChartInput {
  series: readonly ChartSeries[];
  safeVoltage: number | null;
  maxTime: number | null;
  width: number;
  height: number;
  fontFamily: string;
}

const PREFIXES: Record<number, string> = { [-12]: 'p', [-9]: 'n', [-6]: 'µ', [-3]: 'm', 0: '', 3: 'k', 6: 'M', 9: 'G' };

/** One SI prefix per axis, chosen from the largest tick, so the labels stay short and the unit sits in the title. */
function axisPrefix(maxAbs: number): { scale: number; prefix: string } {
  if (!(maxAbs > 0) || !Number.isFinite(maxAbs)) return { scale: 1, prefix: '' };
  const exponent = Math.min(9, Math.max(-12, Math.floor(Math.log10(maxAbs) / 3) * 3));
  return { scale: 10 ** exponent, prefix: PREFIXES[exponent] };
}

// Typographic minus, as in the rest of the dossier.
const tickText = (value: number, scale: number) => String(Number((value / scale).toPrecision(6))).replace('-', '−');

const escapeXml = (text: string) => text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');

const num = (value: number) => value.toFixed(2);

/**
 * At most the first, lowest, highest and last point of each 1-pt column, in their order: the drawn line
 * looks the same (its extremes are kept), and the SVG renderer, which dominates the PDF's build time,
 * draws a few hundred segments instead of thousands.
 */
function perColumn(points: ReadonlyArray<readonly [number, number]>): Array<readonly [number, number]> {
  const out: Array<readonly [number, number]> = [];
  let i = 0;
  while (i < points.length) {
    const column = Math.floor(points[i][0]);
    let j = i;
    let lo = i;
    let hi = i;
    while (j < points.length && Math.floor(points[j][0]) === column) {
      if (points[j][1] < points[lo][1]) lo = j;
      if (points[j][1] > points[hi][1]) hi = j;
      j += 1;
    }
    for (const k of [...new Set([i, lo, hi, j - 1])].sort((a, b) => a - b)) out.push(points[k]);
    i = j;
  }
  return out;
}

export function decayChartSvg(input: DecayChartInput): string {
  const { width, height, fontFamily } = input;
  // The legend sits below the axis title, outside the plot, so no curve or limit line can cross it.
  const legendColumns = 2;
  const legendRows = Math.ceil(input.series.length / legendColumns);
  const rowH = 11;
  const margin = { left: 52, right: 12, top: 10, bottom: 40 + legendRows * rowH + 6 };
  const plotW = width - margin.left - margin.right;
  const plotH = height - margin.top - margin.bottom;

  const all = input.series.flatMap((s) => s.points).filter((p) => Number.isFinite(p.t) && Number.isFinite(p.v));
  const curveEnd = Math.max(0, ...input.series.filter((s) => s.kind === 'model').flatMap((s) => s.points.map((p) => p.t)));
  const tMax = Math.max(curveEnd, (input.maxTime ?? 0) * 1.15, 1e-9);
  const tMin = Math.min(0, ...all.map((p) => p.t).filter((t) => t >= -0.25 * tMax));
  const vMax = Math.max(1e-9, (input.safeVoltage ?? 0) * 1.2, ...all.filter((p) => p.t <= tMax).map((p) => p.v)) * 1.05;

  const x = scaleLinear().domain([tMin, tMax]).range([0, plotW]).nice(8);
  const y = scaleLinear().domain([0, vMax]).range([plotH, 0]).nice(6);
  const [x0, x1] = x.domain();
  const [, y1] = y.domain();
  const xTicks = x.ticks(8);
  const yTicks = y.ticks(6);
  const tAxis = axisPrefix(Math.max(Math.abs(x0), Math.abs(x1)));
  const vAxis = axisPrefix(y1);

  const parts: string[] = [];
  parts.push(
    `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" font-family="${fontFamily}" font-size="7.5">`,
  );
  parts.push(`<g transform="translate(${margin.left},${margin.top})">`);

  for (const t of xTicks) {
    const px = num(x(t));
    parts.push(`<line x1="${px}" y1="0" x2="${px}" y2="${plotH}" stroke="#e3e3e3" stroke-width="0.5"/>`);
    parts.push(`<line x1="${px}" y1="${plotH}" x2="${px}" y2="${plotH + 3}" stroke="#333" stroke-width="0.6"/>`);
    parts.push(`<text x="${px}" y="${plotH + 11}" text-anchor="middle" fill="#333">${tickText(t, tAxis.scale)}</text>`);
  }
  for (const v of yTicks) {
    const py = num(y(v));
    parts.push(`<line x1="0" y1="${py}" x2="${plotW}" y2="${py}" stroke="#e3e3e3" stroke-width="0.5"/>`);
    parts.push(`<line x1="-3" y1="${py}" x2="0" y2="${py}" stroke="#333" stroke-width="0.6"/>`);
    parts.push(`<text x="-5" y="${num(y(v) + 2.6)}" text-anchor="end" fill="#333">${tickText(v, vAxis.scale)}</text>`);
  }
  parts.push(`<rect x="0" y="0" width="${plotW}" height="${plotH}" fill="none" stroke="#333" stroke-width="0.8"/>`);
  parts.push(
    `<text x="${num(plotW / 2)}" y="${plotH + 26}" text-anchor="middle" font-size="8.5" fill="#111">Time after disconnection (${tAxis.prefix}s)</text>`,
  );
  parts.push(
    `<text transform="translate(-38,${num(plotH / 2)}) rotate(-90)" text-anchor="middle" font-size="8.5" fill="#111">Voltage (${vAxis.prefix}V)</text>`,
  );

  const clampX = (t: number) => Math.min(plotW, Math.max(0, x(t)));
  const clampY = (v: number) => Math.min(plotH, Math.max(0, y(v)));

  if (input.safeVoltage !== null && input.safeVoltage <= y1) {
    const py = num(y(input.safeVoltage));
    parts.push(`<line x1="0" y1="${py}" x2="${plotW}" y2="${py}" stroke="#2e7d32" stroke-width="1" stroke-dasharray="5 3"/>`);
    parts.push(
      `<text x="${num(plotW - 4)}" y="${num(y(input.safeVoltage) - 3)}" text-anchor="end" fill="#2e7d32">safe voltage ${tickText(input.safeVoltage, vAxis.scale)} ${vAxis.prefix}V</text>`,
    );
  }
  if (input.maxTime !== null && input.maxTime <= x1) {
    const px = num(x(input.maxTime));
    parts.push(`<line x1="${px}" y1="0" x2="${px}" y2="${plotH}" stroke="#444" stroke-width="1" stroke-dasharray="2 2"/>`);
    parts.push(
      `<text transform="translate(${num(x(input.maxTime) + 9)},${num(plotH * 0.62)}) rotate(-90)" text-anchor="middle" fill="#444">time limit ${tickText(input.maxTime, tAxis.scale)} ${tAxis.prefix}s</text>`,
    );
  }

  for (const s of input.series) {
    const inside = s.points.filter((p) => Number.isFinite(p.t) && Number.isFinite(p.v) && p.t >= x0 && p.t <= x1);
    const pts = perColumn(inside.map((p) => [clampX(p.t), clampY(p.v)] as const)).map(([px, py]) => `${num(px)},${num(py)}`);
    if (pts.length < 2) continue;
    const dash = s.dash ? ` stroke-dasharray="${s.dash}"` : '';
    parts.push(`<polyline points="${pts.join(' ')}" fill="none" stroke="${s.color}" stroke-width="${s.width}" stroke-linejoin="round"${dash}/>`);
  }

  const legendTop = plotH + 36;
  const columnW = plotW / legendColumns;
  input.series.forEach((s, i) => {
    const lx = (i % legendColumns) * columnW;
    const cy = legendTop + Math.floor(i / legendColumns) * rowH;
    const dash = s.dash ? ` stroke-dasharray="${s.dash}"` : '';
    parts.push(
      `<line x1="${num(lx)}" y1="${cy}" x2="${num(lx + 18)}" y2="${cy}" stroke="${s.color}" stroke-width="${Math.max(1.4, s.width)}"${dash}/>`,
    );
    parts.push(`<text x="${num(lx + 23)}" y="${cy + 2.6}" fill="#111">${escapeXml(s.label)}</text>`);
  });

  parts.push('</g></svg>');
  return parts.join('');
}
