/** The text exports the reader takes, named in every refusal of a file that is not one of them. */
export const TEXT_EXPORTS =
  'CSV (comma or semicolon separated), TSV (tab separated) or TXT, encoded as ASCII, UTF-8 or UTF-16 with a byte-order mark';

/** Why a capture could not be read. Every code is a problem with the file itself (the API answers 422). */
export type WaveformErrorCode =
  | 'EMPTY'
  | 'NOT_TEXT'
  | 'UNSUPPORTED_ENCODING'
  | 'NO_NUMERIC_COLUMNS'
  | 'NO_TIME_BASE'
  | 'CHANNEL_NOT_FOUND'
  | 'LINE_TOO_LONG'
  | 'TIME_NOT_INCREASING'
  | 'TOO_FEW_SAMPLES'
  | 'T0_OUT_OF_RANGE';

export class WaveformError extends Error {
  constructor(
    readonly code: WaveformErrorCode,
    message: string,
  ) {
    super(message);
    this.name = 'WaveformError';
  }
}
