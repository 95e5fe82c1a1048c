/**
 * `measure` for a whole capture: every channel measured in the time domain (measureChannel.ts), then
 * in the frequency domain (spectralAnalysis.ts), assembled into the schemaVersion 1 JSON contract of
 * src/types/measurement.ts. Uncertainties are standard uncertainties (k = 1, JCGM 100:2008).
 *
 * Invalid samples (NaN from the reader): the longest finite run is measured when it holds at least
 * half the record, with a warning; otherwise every measurement is withheld with a note. Nothing is
 * interpolated across a gap.
 */
import type { Capture, CaptureChannel, CaptureWarning, ChannelReport, MeasureReport, Measurement, MeasurementId, MeasureResult } from '../types/index.js';
import { MEASUREMENT_IDS } from '../types/index.js';
import { MIN_SAMPLES, measureChannel } from './measureChannel.js';
import type { HarmonicSet } from './spectrum/harmonicAnalysis.js';
import { analyzeSpectrum, spectralBufferLength } from './spectrum/spectralAnalysis.js';
import { unitFor } from './measurementUnits.js';
import { validRun } from './levels/validRun.js';
import { waveformPlot } from './plots/waveformPlot.js';

export interface MeasureCaptureOptions {
  /** Include waveform and spectrum excerpts for plotting. */
  readonly plotData?: boolean;
  /** Harmonics THD and the other sums take: every one below Nyquist unless a design states a count or bandwidth. */
  readonly harmonicSet?: HarmonicSet;
}

const MIN_VALID_SHARE = 0.5;
const BASE_IDS: readonly MeasurementId[] = ['frequency', 'period', 'maximum', 'minimum', 'peakToPeak', 'dcOffset', 'rms', 'acRms'];

export function measureCapture(capture: Capture, options: MeasureCaptureOptions = {}): MeasureReport {
  const { plotData = false, harmonicSet = {} } = options;
  const dt = capture.sampleInterval;
  if (!(dt > 0)) throw new RangeError(`measureCapture: sample interval ${dt} must be positive`);
  // One transform buffer for every channel: fresh memory is slow to touch (shared/peer/MEASURED.md).
  const buffer = new Float64Array(spectralBufferLength(capture.length));
  return {
    schemaVersion: 1,
    file: capture.path,
    sha256: capture.sha256,
    sampleInterval: dt,
    samples: capture.length,
    duration: capture.length * dt,
    // The reader's "clipped" warnings are replaced by each channel's own finding (measureChannel.ts).
    warnings: capture.warnings.filter((w) => w.code !== 'clipped'),
    channels: capture.channels.map((ch) => channelReport(ch, capture, { plotData, harmonicSet }, buffer)),
  };
}

function channelReport(ch: CaptureChannel, capture: Capture, options: { plotData: boolean; harmonicSet: HarmonicSet }, buffer: Float64Array): ChannelReport {
  const { plotData, harmonicSet } = options;
  const dt = capture.sampleInterval;
  const warnings: CaptureWarning[] = [];
  if (ch.unit === '') warnings.push({ code: 'unit-assumed', channel: ch.name, message: `channel ${ch.name} has no unit in the file; its values are taken as volts` });
  const run = validRun(ch.samples);
  const n = ch.samples.length;
  if (run.length < n) {
    if (run.length < MIN_VALID_SHARE * n || run.length < MIN_SAMPLES) return unusable(ch, warnings, run.length);
    warnings.push({
      code: 'invalid-samples',
      channel: ch.name,
      message: `${n - run.length} samples are invalid${ch.firstInvalidLine ? ` (the first on line ${ch.firstInvalidLine})` : ''}; measured the longest valid run, samples ${run.start + 1}–${run.start + run.length} (${Math.round((100 * run.length) / n)} % of the record)`,
    });
  }
  if (run.length < MIN_SAMPLES) return unusable(ch, warnings, run.length);
  const x = ch.samples.subarray(run.start, run.start + run.length);
  // The reader's pinned-run count (ch.clipped) is not used: flatTops.ts tells the scope's clipping,
  // whose values are withheld, from the circuit's saturation, which is a finding.
  const a = measureChannel(x, dt, { unit: ch.unit, ...(ch.fullScale ? { fullScale: ch.fullScale } : {}) });
  const clipped = a.flatTops.some((f) => f.cause === 'scope-range') ? true : undefined;
  const duty = a.results.dutyCycle;
  const spectral = analyzeSpectrum(x, dt, a.fundamental, a.shape, {
    plot: plotData,
    buffer,
    harmonicSet,
    clipped: clipped !== undefined,
    ...(a.shape === 'pulse' && duty?.ok ? { dutyCycle: duty.value } : {}),
  });
  const measurements = toMeasurements({ ...a.results, ...spectral.measurements }, ch.unit);
  warnings.push(...a.warnings.map((w) => ({ ...w, channel: ch.name })));
  const period = a.fundamental ? 1 / (a.fundamental * dt) : null;
  const report: ChannelReport = {
    name: ch.name,
    unit: ch.unit,
    shape: a.shape,
    measurements,
    harmonics: spectral.harmonics,
    harmonicsMethod: spectral.harmonicsMethod,
    warnings,
    ...(a.flatTops.length ? { flatTops: a.flatTops } : {}),
  };
  if (!plotData) return report;
  const waveform = waveformPlot(x, dt, capture.startTime + run.start * dt, a.marks, period);
  return { ...report, plot: { waveform, ...(spectral.spectrum ? { spectrum: spectral.spectrum } : {}) } };
}

function unusable(ch: CaptureChannel, warnings: CaptureWarning[], valid: number): ChannelReport {
  const why: MeasureResult = {
    ok: false,
    reason: valid < MIN_SAMPLES && ch.invalidCount === 0 ? 'too-few-samples' : 'invalid-samples',
    detail:
      ch.invalidCount > 0
        ? `${ch.invalidCount} of ${ch.samples.length} samples are invalid and the longest valid run holds only ${valid}; check the export for blank or overflow cells${ch.firstInvalidLine ? ` from line ${ch.firstInvalidLine}` : ''}`
        : `the capture holds only ${valid} samples; at least ${MIN_SAMPLES} are needed`,
  };
  const results = Object.fromEntries(BASE_IDS.map((id) => [id, why]));
  return { name: ch.name, unit: ch.unit, shape: 'unknown', measurements: toMeasurements(results, ch.unit), harmonics: [], warnings };
}

/** MeasureResult → Measurement in MEASUREMENT_IDS order; a non-finite number never reaches the output. */
function toMeasurements(results: Partial<Record<MeasurementId, MeasureResult>>, channelUnit: string): Partial<Record<MeasurementId, Measurement>> {
  const out: Partial<Record<MeasurementId, Measurement>> = {};
  for (const id of MEASUREMENT_IDS) {
    const r = results[id];
    if (!r) continue;
    const unit = unitFor(id, channelUnit);
    if (r.ok && Number.isFinite(r.value)) {
      const u = r.uncertainty !== null && Number.isFinite(r.uncertainty) ? r.uncertainty : null;
      out[id] = { value: r.value, unit: r.unit || unit, uncertainty: u, method: r.method };
    } else if (r.ok) {
      out[id] = { value: null, unit, uncertainty: null, reason: 'fit-failed', note: `the method gave no finite value (${r.method})` };
    } else {
      const bound = r.bound && Number.isFinite(r.bound.value) ? { bound: r.bound, ...(r.method ? { method: r.method } : {}) } : {};
      out[id] = { value: null, unit, uncertainty: null, reason: r.reason, note: r.detail, ...bound };
    }
  }
  return out;
}
