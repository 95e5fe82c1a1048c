/** A capture as read from a CSV export: provenance, timing and one Float64Array per channel in SI units. */

export type Delimiter = ',' | ';' | '\t' | ' ';
export type DecimalMark = '.' | ',';

export interface ColumnLayout {
  /** Name as written in the header (or `ch1…chN` when there is none). */
  readonly name: string;
  /** Unit as written (e.g. `mV`, `µs`), '' when none. Kept for display. */
  readonly unit: string;
  /** Factor that converts the written unit to the SI base unit (mV → 1e-3). */
  readonly scale: number;
  /** The SI base unit after conversion (`V`, `A`, `s`, or '' when unknown). */
  readonly siUnit: string;
}

export interface CaptureLayout {
  readonly delimiter: Delimiter;
  readonly decimalMark: DecimalMark;
  /** 1-based line of the header row, null when the data has none. */
  readonly headerLine: number | null;
  /** 1-based line of the first data row. */
  readonly firstDataLine: number;
  /** 1-based line of the last data row. */
  readonly lastDataLine: number;
  readonly columns: readonly ColumnLayout[];
  /** Index into columns of the time column, null when there is none. */
  readonly timeColumn: number | null;
  /** Index into columns of a sample-index column, null when there is none. */
  readonly indexColumn: number | null;
  /** Where the sample interval came from. */
  readonly timing: 'time-column' | 'metadata' | 'option';
  /** True when non-uniform time steps were resampled onto a uniform grid. */
  readonly resampled: boolean;
  readonly compressed: boolean;
  readonly bom: boolean;
  readonly lineEnding: 'lf' | 'crlf' | 'cr' | 'mixed';
  /** How the file was understood, line by line and column by column (added with `inspect`). */
  readonly reading?: CaptureReading;
}

/** What the reader made of a file: which lines are what, where each number came from. */
export interface CaptureReading {
  /** The reading profile used (its name and path, or `spec` for a spec's `captures.reading`), null for none. */
  readonly profile: string | null;
  /** Reading settings in force (profile and flags merged). */
  readonly settings: ReadingSettings;
  readonly skippedLines: number;
  readonly preambleLines: readonly number[];
  readonly headerLines: readonly number[];
  readonly unitsLine: number | null;
  /** Data rows that also carry preamble entries in their empty columns. */
  readonly sharedLines: readonly number[];
  /** Columns (0-based) that are empty in the data, or an index beside a time column: not read. */
  readonly ignoredColumns: readonly number[];
  /** Preamble keys understood, as written, with what they gave. */
  readonly recognised: readonly { readonly key: string; readonly meaning: string; readonly value: number | string }[];
  /** How the x column was found: by name, by unit, because it rises, by option; null without one. */
  readonly xFoundBy: string | null;
  /** Where the sample interval came from, in words (`time column`, `preamble key "Sample Interval"`). */
  readonly intervalSource: string;
  /** Per kept channel: where its unit and scale came from, and the scale and offset applied. */
  readonly channels: readonly { readonly name: string; readonly unitFrom: string; readonly scale: number; readonly offset: number }[];
  /** Acquisitions found in the file (time restarting), and which one was read (1-based). */
  readonly segments: number;
  readonly segmentRead: number;
  /** The readings weighed while sniffing, in words with their scores, and which were chosen. */
  readonly weighed?: readonly { readonly what: string; readonly score: number; readonly chosen: boolean }[];
}

/** How to read a capture when inference cannot tell, from flags, a reading profile or a spec. */
export interface ReadingSettings {
  readonly delimiter?: Delimiter;
  readonly decimalMark?: DecimalMark;
  /** File lines to drop before looking for the layout. */
  readonly skipRows?: number;
  /** Header rows just above the data: 0, 1 (names) or 2 (names, then units). */
  readonly headerRows?: number;
  /** The x column: 1-based number, name, or 'none'. */
  readonly timeColumn?: number | string;
  /** Unit of channels that state none: one for all, or per channel name or 1-based number. */
  readonly channelUnit?: string | Readonly<Record<string, string>>;
  /** Factor from the file's numbers to the channel's unit: one for all, or per channel. */
  readonly scale?: number | Readonly<Record<string, number>>;
  /** Which acquisition to read when the file holds several (1-based). */
  readonly segment?: number;
  readonly sampleRate?: number;
  readonly interval?: number;
}

export interface CaptureWarning {
  /** Stable code: `invalid-samples`, `clipped`, `resampled`, `footer`, `aliasing`, … */
  readonly code: string;
  readonly message: string;
  readonly line?: number;
  readonly channel?: string;
}

export interface CaptureChannel {
  readonly name: string;
  /** SI unit of the samples (`V`, `A`, or '' when unknown). */
  readonly unit: string;
  /** Unit as written in the file, for display. */
  readonly displayUnit: string;
  /** Samples in SI units on a uniform grid; invalid samples are NaN (and counted). */
  readonly samples: Float64Array;
  /** Count of invalid samples (empty, NaN, ±inf, overflow markers), stored as NaN. */
  readonly invalidCount: number;
  /** 1-based file line of the first invalid sample, when there is one. */
  readonly firstInvalidLine?: number;
  /**
   * The channel's full-scale limits in SI units, when the capture states them (e.g. from the vertical
   * range and offset in a preamble); analysis tells the scope's clipping from circuit saturation by them.
   */
  readonly fullScale?: { readonly low: number; readonly high: number };
  /** Where fullScale came from: the vertical setting the preamble states (src/capture/fullScale.ts). */
  readonly fullScaleFrom?: 'preamble';
  /** The preamble keys fullScale was worked out from, as written. */
  readonly fullScaleKeys?: readonly string[];
}

export interface Capture {
  readonly path: string;
  readonly sha256: string;
  /** Size of the file in bytes as stored (compressed size for .csv.gz). */
  readonly size: number;
  readonly layout: CaptureLayout;
  /** Every preamble `key,value` line, keys as written. */
  readonly metadata: Readonly<Record<string, string>>;
  /** Time of the first sample in seconds (relative to the trigger when the file says so). */
  readonly startTime: number;
  /** Uniform sample interval in seconds. */
  readonly sampleInterval: number;
  readonly length: number;
  readonly channels: readonly CaptureChannel[];
  readonly warnings: readonly CaptureWarning[];
}

/** Options a user can give the reader on the command line (or a reading profile). */
export interface ReadCaptureOptions extends ReadingSettings {
  /** Name of the reading profile the settings came from, recorded with the capture. */
  readonly profile?: string;
  /** Sample rate in Hz, used when the file has no time column or metadata. */
  readonly sampleRate?: number;
  /** Sample interval in seconds, the same purpose as sampleRate. */
  readonly interval?: number;
  /** Channel name or 1-based index to keep; all channels when absent. */
  readonly channel?: string;
  /** Called with bytes read so far, for progress display. */
  readonly onProgress?: (bytesRead: number, totalBytes: number) => void;
  /** Most megabytes (10^6 bytes) a .csv.gz may unpack to; by default 100× its stored size, at least 256 MiB. */
  readonly unpackLimitMB?: number;
}
