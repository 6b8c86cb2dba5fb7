// Public entry points of the capture reader. Files are streamed in bounded memory; the text variants are
// for small inputs (tests, pasted samples).
import { analysisOptionsSchema, type AnalysisOptions, type WaveformAnalysis } from '../../../shared/schema/waveform';
import { analyseSource } from './analyse';
import { scanSource } from './encoding';
import { readLayout } from './layout';
import { readPass } from './samples';
import { memorySource, openFileSource, type ByteSource } from './source';

export { WaveformError, type WaveformErrorCode } from './errors';

async function withFile<T>(path: string, use: (source: ByteSource) => Promise<T>): Promise<T> {
  const source = await openFileSource(path);
  try {
    return await use(source);
  } finally {
    await source.close();
  }
}

/** A capture in memory: text (as UTF-8), or the bytes of a file in any encoding the reader takes. */
type CaptureContent = string | Uint8Array;

const textSource = (content: CaptureContent) => memorySource(typeof content === 'string' ? Buffer.from(content, 'utf8') : content);

/**
 * Reads and analyses a capture file. Throws `WaveformError` when the file is not a usable capture, and
 * a zod error when `options` are invalid. A capture that never reaches the safe voltage is a valid
 * result (`timeToSafe: null`), not an error.
 */
export async function analyseCaptureFile(path: string, options: AnalysisOptions): Promise<WaveformAnalysis> {
  const parsed = analysisOptionsSchema.parse(options);
  return withFile(path, (source) => analyseSource(source, parsed));
}

/** As `analyseCaptureFile`, for a capture already in memory. */
export async function analyseCaptureText(text: CaptureContent, options: AnalysisOptions): Promise<WaveformAnalysis> {
  return analyseSource(textSource(text), analysisOptionsSchema.parse(options));
}

interface CaptureOutline {
  /** Channel names in column order (the time column excluded), for picking the voltage and marker. */
  channels: string[];
  /** Label of the time column, or null when time comes from the metadata's start + increment. */
  timeColumn: string | null;
  notes: string[];
}

/** Channels and time base of a capture, read from its head only. */
export async function outlineCaptureFile(path: string): Promise<CaptureOutline> {
  return withFile(path, async (source) => {
    const layout = await readLayout(source);
    return {
      channels: layout.channelNames,
      timeColumn: layout.timeColumn === null ? null : layout.columns[layout.timeColumn].label,
      notes: layout.notes,
    };
  });
}

interface CaptureTable {
  channels: string[];
  /** Seconds. */
  time: number[];
  /** One array per channel, volts (unit hints applied). */
  values: number[][];
  skipped: number;
  truncatedLastLine: boolean;
}

/** Every sample of a small capture, all channels. Holds everything in memory: not for large files. */
export async function readCaptureText(text: CaptureContent): Promise<CaptureTable> {
  const source = textSource(text);
  const layout = await readLayout(source);
  const table: CaptureTable = {
    channels: layout.channelNames,
    time: [],
    values: layout.channelColumns.map(() => []),
    skipped: 0,
    truncatedLastLine: false,
  };
  const pass = await readPass(
    scanSource(source, layout.encoding),
    layout,
    layout.channelColumns,
    layout.channelScales,
    { from: layout.dataOffset, to: source.size, firstRow: 0 },
    ({ data, stride, count }) => {
      for (let r = 0; r < count; r++) {
        table.time.push(data[r * stride]);
        table.values.forEach((column, k) => column.push(data[r * stride + 1 + k]));
      }
    },
  );
  table.skipped = pass.skipped;
  table.truncatedLastLine = pass.truncatedLastLine;
  return table;
}
