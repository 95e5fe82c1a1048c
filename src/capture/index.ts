/**
 * src/capture: CSV capture files → Capture (provenance, time base, one Float64Array per channel in SI units).
 *
 * BenchError codes (exit 2), for the README:
 *   capture.unreadable            no file at the path, no permission, or a folder
 *   capture.corrupt-gzip          a .gz capture whose stream is damaged or cut short
 *   capture.empty                 the file holds no text
 *   capture.binary                control bytes: not a text export
 *   capture.unsupported-encoding  UTF-16 text
 *   capture.line-too-long         a line longer than 1 MiB
 *   capture.too-many-columns      more than 1024 columns
 *   capture.header-only           a header but no data rows
 *   capture.no-numeric-data       no rows of numbers in the first 64 KiB
 *   capture.ambiguous-layout      the rows read as numbers in more than one way (e.g. "0,5")
 *   capture.spectrum-export       a frequency column with levels in dB: a spectrum, not a waveform
 *   capture.unknown-segment       --segment asks for an acquisition the file does not hold
 *   capture.bad-profile           a reading profile (or a spec's captures.reading) with a wrong setting
 *   capture.no-channels           a time column and nothing else
 *   capture.no-time-base          no time column, no interval in the preamble and no flag
 *   capture.conflicting-options   --interval and --sample-rate disagree
 *   capture.unknown-channel       --channel names no channel of the capture
 *   capture.ragged-row            a row with another field count, followed by more data
 *   capture.text-in-data          a row of text, followed by more data
 *   capture.invalid-time          an empty or non-numeric time (or index) in a data row
 *   capture.time-backwards        the time column decreases
 *   capture.time-repeated         the time column repeats a value
 *   capture.too-few-rows          fewer than two data rows
 *   capture.resample-too-large    time steps so uneven that the median-step grid would explode
 *   capture.too-large             more than 2^28 samples (2 GiB), or than half the machine's memory, over the kept channels
 *   capture.unpack-limit          a .gz that unpacks past 100× its size (at least 256 MiB), or past --unpack-limit
 *   capture.blank-run             more than 100 000 blank or comment lines in a row
 *
 * Capture warning codes: invalid-samples, resampled, footer, option-ignored,
 * interval-mismatch, record-length-mismatch, time-rebuilt, dropouts, clock-times, segments, spliced,
 * raw-counts.
 */
export { readCapture } from './readCapture.js';
export { readCaptureLines } from './readCapture.js';
export type { PieceOptions } from './readCapture.js';
export { PIECE_BYTES, pieceHelpersOn } from './parallelRead.js';
export type { PieceHelpers } from './parallelRead.js';
export { isPieceMessage, PieceServer } from './pieceServer.js';
export type { PieceMessage } from './pieceServer.js';
export { inspectCapture, inspectFailure } from './inspect.js';
export type { FailedInspection, Inspection, InspectedLine, LineRole } from './inspect.js';
export { mergeSettings, parseReadingProfile, readingSettings, delimiterOf, decimalMarkOf } from './readingOptions.js';
