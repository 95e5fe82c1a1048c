/** Wraps synthesized signals into a Capture, as the reader would hand it to measureCapture. */
import type { Capture, CaptureChannel } from '../../src/types/index.js';
import type { SynthSignal } from '../../src/syntheticCaptures/index.js';
import { plainLayout } from '../helpers/plainLayout.js';

export interface ChannelSpec {
  readonly name?: string;
  readonly unit?: string;
  /** Full-scale limits the capture states for the channel. */
  readonly fullScale?: { readonly low: number; readonly high: number };
}

export function channelOf(signal: SynthSignal, spec: ChannelSpec = {}): CaptureChannel {
  let invalid = 0;
  for (const v of signal.values) if (!Number.isFinite(v)) invalid++;
  return {
    name: spec.name ?? 'ch1',
    unit: spec.unit ?? 'V',
    displayUnit: spec.unit ?? 'V',
    samples: signal.values,
    invalidCount: invalid,
    ...(spec.fullScale ? { fullScale: spec.fullScale } : {}),
  };
}

export function captureOf(signals: readonly SynthSignal[], specs: readonly ChannelSpec[] = []): Capture {
  const first = signals[0];
  const length = first.values.length;
  return {
    path: 'synthetic.csv',
    sha256: '0'.repeat(64),
    size: 0,
    layout: plainLayout(length),
    metadata: {},
    startTime: first.t0,
    sampleInterval: first.dt,
    length,
    channels: signals.map((s, i) => channelOf(s, { name: `ch${i + 1}`, ...specs[i] })),
    warnings: [],
  };
}

/** True when two sample arrays hold the same bits (fast, for "input left unmodified" checks). */
export function sameSamples(a: Float64Array, b: Float64Array): boolean {
  return Buffer.from(a.buffer, a.byteOffset, a.byteLength).equals(Buffer.from(b.buffer, b.byteOffset, b.byteLength));
}
