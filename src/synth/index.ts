export { createRandom } from './random.js';
export type { Random } from './random.js';
export { synthesize } from './waveform.js';
export type { EdgeShape, SynthShape, SynthSignal, SynthSpec } from './waveform.js';
