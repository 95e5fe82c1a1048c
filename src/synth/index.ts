export { createRandom } from './random.js';
export type { Random } from './random.js';
export { synthesize } from './waveform.js';
export type { EdgeShape, SynthShape, SynthSignal, SynthSpec } from './waveform.js';
export { writeCsv, writeCsvChunks } from './writeCsv.js';
export type { CsvChannel, CsvLayoutOptions, CsvNumberFormat } from './writeCsv.js';
export { KESTREL_CONDITIONS, KESTREL_UNITS, kestrelCapture, kestrelSampleFiles } from './scenario.js';
export type { ScenarioCapture, ScenarioCondition, ScenarioFile, UnitTraits } from './scenario.js';
