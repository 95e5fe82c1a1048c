// Public names of the diagnose stage, one per line. Other stages import from here only.
export { diagnoseUnit } from './diagnoseUnit.js';
export { CAUSE_RULES } from './diagnoseUnit.js';
export type { CauseRule } from './rule.js';
