// Public names of the diagnose stage, one per line. Other stages import from here only.
export { diagnoseUnit } from './diagnoseUnit.js';
export { CAUSE_RULES } from './diagnoseUnit.js';
export type { CauseRule } from './rule.js';
export { circuitView } from './circuitView.js';
export { coreReadings } from './coreReadings.js';
export type { CoreReading } from './coreReadings.js';
export { capacitanceFromRamps } from './circuitFormulas.js';
export { capacitanceFromSlope } from './circuitFormulas.js';
export { coreFrequency } from './circuitFormulas.js';
export { currentFromSlope } from './circuitFormulas.js';
export { octaves } from './circuitFormulas.js';
export { scaleToCondition } from './circuitFormulas.js';
export { toleranceU } from './circuitFormulas.js';
export type { Estimate } from './circuitFormulas.js';
export { guideTrim } from './trimGuidance.js';
