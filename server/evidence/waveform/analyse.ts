// What a discharge capture proves (docs/DOMAIN.md §5.2): the disconnect instant t0, V0, the
// time until the voltage falls below the safe level and stays there, and the time constant of the decay.
//
// One full pass builds a bounded summary (summary.ts); every later step works on that summary, and
// where it needs finer detail than the summary's buckets it re-reads only the short byte range involved
// (a "zoom", context.ts). Memory stays bounded whatever the file size; the file is read about once.
import type { AnalysisOptions, ChannelRef, TracePoint, WaveformAnalysis } from '../../../shared/schema/waveform';
import { warn, type Context } from './context';
import { measureCrossings, type Crossings } from './crossings';
import { fitDecay, type DecayFit } from './decay';
import { scanSource } from './encoding';
import { WaveformError } from './errors';
import { readLayout, type CaptureLayout } from './layout';
import { readPass, type PassResult } from './samples';
import type { ByteSource } from './source';
import { Summary, type Series } from './summary';
import { findT0, refineT0, type Start } from './t0';

/** Buckets of the whole-file summary (2^14: 2.5 MB, and fine enough to locate every feature). */
const SUMMARY_BUCKETS = 1 << 14;
const MIN_SAMPLES = 10;
const TRACE_POINTS = 2000;

const ENCODING_WORDS = { 'utf-16le': 'UTF-16 LE', 'utf-16be': 'UTF-16 BE' } as const;

/** analyseSource: read the layout, pick the channels, summarise every sample, find t0, fit the decay, measure the crossings. */
export async function analyseSource(file: ByteSource, options: AnalysisOptions): Promise<WaveformAnalysis> {
  const layout = await readLayout(file);
  const channels = selectChannels(layout, options);
  const { ctx, samples, skipped } = await summarise(scanSource(file, layout.encoding), layout, channels, options);
  const start = await findT0(ctx, options, channels.markerName);
  const decay = await fitDecay(ctx, start.t0, start.v0);
  const t0 = refineT0(ctx, start, decay.fit, decay.good);
  const crossings = await measureCrossings(ctx, t0, options);
  return { samples, skipped, ...report(ctx, channels, { ...start, t0 }, decay, crossings, options) };
}

interface Channels {
  /** Index into the layout's channels of the voltage channel, and its name. */
  channel: number;
  name: string;
  marker: number | null;
  markerName: string | null;
}

function pickChannel(layout: CaptureLayout, ref: ChannelRef, what: string): number {
  if (typeof ref === 'number') {
    if (ref < layout.channelColumns.length) return ref;
    throw new WaveformError(
      'CHANNEL_NOT_FOUND',
      `The ${what} index ${ref} does not exist; the file has ${layout.channelColumns.length} channel(s): ${layout.channelNames.join(', ')}.`,
    );
  }
  const wanted = ref.trim().toLowerCase();
  const index = layout.channelColumns.findIndex((column, i) => {
    const info = layout.columns[column];
    return layout.channelNames[i].toLowerCase() === wanted || (info.header?.base ?? '').toLowerCase() === wanted;
  });
  if (index >= 0) return index;
  throw new WaveformError('CHANNEL_NOT_FOUND', `The ${what} "${ref}" is not in the file; its channels are: ${layout.channelNames.join(', ')}.`);
}

/** The voltage channel (default the first) and the marker channel, when one is named. */
function selectChannels(layout: CaptureLayout, options: AnalysisOptions): Channels {
  const channel = pickChannel(layout, options.channel ?? 0, 'channel');
  const marker = options.markerChannel === undefined ? null : pickChannel(layout, options.markerChannel, 'marker channel');
  if (marker === channel) {
    throw new WaveformError('CHANNEL_NOT_FOUND', 'The marker channel must be a different channel from the one analysed.');
  }
  return { channel, name: layout.channelNames[channel], marker, markerName: marker === null ? null : layout.channelNames[marker] };
}

/** The full pass: every sample into the bounded summary, and what the pass found said in notes. */
async function summarise(source: ByteSource, layout: CaptureLayout, channels: Channels, options: AnalysisOptions) {
  const unit = layout.channelScales[channels.channel];
  const scale = options.scale ?? 1;
  const columns = [layout.channelColumns[channels.channel]];
  const scales = [unit * scale];
  if (channels.marker !== null) {
    columns.push(layout.channelColumns[channels.marker]);
    scales.push(1);
  }
  const summary = new Summary(SUMMARY_BUCKETS);
  const withMarker = channels.marker !== null;
  const pass = await readPass(source, layout, columns, scales, { from: layout.dataOffset, to: source.size, firstRow: 0 }, (batch) =>
    summary.pushBatch(batch.data, batch.stride, withMarker, batch.offsets, batch.rows, 0, batch.count),
  );
  summary.finish();
  if (pass.samples < MIN_SAMPLES) {
    throw new WaveformError(
      'TOO_FEW_SAMPLES',
      `Only ${pass.samples} usable sample(s) in the file (${pass.skipped} row(s) skipped); at least ${MIN_SAMPLES} are needed.`,
    );
  }
  const tStart = summary.tfirst[0];
  const tEnd = summary.tlast[summary.count - 1];
  const ctx: Context = {
    source,
    layout,
    columns,
    scales,
    summary,
    bucketSize: summary.size,
    tStart,
    tEnd,
    dt: (tEnd - tStart) / Math.max(1, pass.samples - 1),
    polarity: 'positive',
    notes: [...layout.notes],
    warnings: [],
  };
  notePass(ctx, channels, pass, scale);
  return { ctx, samples: pass.samples, skipped: pass.skipped };
}

/** What the pass met on the way (decoding, units, the probe, skipped rows), said in the analysis's notes and warnings. */
function notePass(ctx: Context, channels: Channels, pass: PassResult, scale: number): void {
  const { layout } = ctx;
  const unit = layout.channelScales[channels.channel];
  const notes = ctx.notes;
  if (layout.encoding !== 'utf-8') notes.push(`The file was decoded from ${ENCODING_WORDS[layout.encoding]} text (byte-order mark).`);
  if (unit !== 1) notes.push(`"${channels.name}" values were converted to volts (×${unit}).`);
  if (scale !== 1) notes.push(`"${channels.name}" values were multiplied by ${scale}, the voltage scale entered with the capture.`);
  if (layout.probeRatio !== null) warn(ctx, probeWarning(layout.probeRatio, scale));
  if (layout.timeColumn !== null && layout.timeScale !== 1) notes.push(`Time values were converted to seconds (×${layout.timeScale}).`);
  if (pass.skipped > 0) {
    notes.push(`${pass.skipped} row(s) skipped: NaN, overflow or empty values, malformed rows or an incomplete last line.`);
  }
  if (pass.truncatedLastLine) notes.push('The last line of the file is incomplete (the export was cut off); it was left out.');
  if (pass.repeatedTimes > 0) {
    notes.push(`${pass.repeatedTimes} sample(s) repeat the previous time stamp: the export's time resolution is coarser than its sample interval.`);
  }
}

/** A probe ratio written in the file is never applied: whether the export already holds it is unknowable from the file. */
function probeWarning(probe: string, scale: number): string {
  const stated = `The file's metadata states a probe setting "${probe}"; it was not applied.`;
  return scale === 1
    ? `${stated} If the exported values are probe-side volts, upload the capture again with that ratio as the voltage scale.`
    : `${stated} The voltage scale ×${scale} entered with the capture was applied; if the instrument had already applied the probe ratio, the voltages are overstated by that factor.`;
}

/** Min/max-decimated trace for plotting: the lowest and highest sample of each group of buckets. */
function trace(s: Series): TracePoint[] {
  const points: TracePoint[] = [];
  const group = Math.ceil(s.count / (TRACE_POINTS / 2));
  for (let g = 0; g < s.count; g += group) {
    let lo = g;
    let hi = g;
    for (let i = g + 1; i < Math.min(g + group, s.count); i++) {
      if (s.vmin[i] < s.vmin[lo]) lo = i;
      if (s.vmax[i] > s.vmax[hi]) hi = i;
    }
    const a = { t: s.tmin[lo], v: s.vmin[lo] };
    const b = { t: s.tmax[hi], v: s.vmax[hi] };
    if (a.t === b.t) points.push(a);
    else if (a.t < b.t) points.push(a, b);
    else points.push(b, a);
  }
  return points;
}

function report(
  ctx: Context,
  channels: Channels,
  start: Start,
  decay: DecayFit,
  crossings: Crossings,
  options: AnalysisOptions,
): Omit<WaveformAnalysis, 'samples' | 'skipped'> {
  const { fit, good, window } = decay;
  return {
    channel: channels.name,
    channels: ctx.layout.channelNames,
    t0: start.t0,
    t0Source: start.source,
    v0: start.v0,
    safeVoltage: options.safeVoltage,
    timeToSafe: crossings.timeToSafe,
    ...(crossings.vAtLimit === undefined ? {} : { vAtLimit: crossings.vAtLimit }),
    tau: fit && good ? fit.tau : null,
    rSquared: fit && Number.isFinite(fit.rSquared) ? fit.rSquared : null,
    residualRms: fit && Number.isFinite(fit.residualRms) ? fit.residualRms : null,
    fitWindow: window,
    offset: fit && good ? fit.offset : null,
    fit: good ? 'good' : 'poor',
    trace: trace(ctx.summary),
    notes: ctx.notes,
    polarity: ctx.polarity,
    scale: options.scale ?? 1,
    probeRatio: ctx.layout.probeRatio,
    encoding: ctx.layout.encoding,
    warnings: ctx.warnings,
  };
}
