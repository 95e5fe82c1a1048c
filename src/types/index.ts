export { BenchError, renderBenchError, isBenchError } from './benchError.js';
export type { BenchErrorFields } from './benchError.js';
export { ERROR_CODES } from './errorCodes.js';
export type { CaptureErrorName, ErrorCode } from './errorCodes.js';
export { nearestName, nearestNames, suggestionReach } from './nearestNames.js';
export type {
  Capture,
  CaptureChannel,
  CaptureLayout,
  CaptureReading,
  CaptureWarning,
  ColumnLayout,
  DecimalMark,
  Delimiter,
  ReadCaptureOptions,
  ReadingSettings,
} from './capture.js';
export { MEASUREMENT_IDS, MEASUREMENT_UNITS, SHAPES, isMeasurementId } from './measurement.js';
export type {
  ChannelReport,
  FlatTop,
  Harmonic,
  MeasureReport,
  MeasureResult,
  Measurement,
  MeasurementBound,
  MeasurementId,
  Shape,
  SpectrumPlot,
  WaveformPlot,
  WithheldReason,
} from './measurement.js';
export { INCOMPLETE_WORD, STATEMENT_WORDS, verdictState, waitingConditions } from './verdict.js';
export type {
  CheckVerdict,
  CheckedCapture,
  ConditionVerdict,
  DecisionRule,
  SpecIdentity,
  Statement,
  UnitVerdict,
  VerdictState,
} from './verdict.js';
export type { Cause, CauseFact, CauseFactKind, CauseRemark, CircuitFigure, CircuitGap, CircuitView, Diagnosis, ExpectedBasis, FactQuantity } from './cause.js';
export type {
  AttemptComparison,
  AttemptReason,
  AttemptSummary,
  ComparedAttempt,
  ComparedCheck,
  BatchReport,
  BatchUnit,
  Capability,
  DocumentSource,
  MeasurementStats,
  BatchRemark,
  NewCapture,
  NewRun,
  RunKind,
  RunSpec,
  SpecBatch,
  StoredCapture,
  StoredRun,
  UnitRecord,
  UnitSummary,
  YieldFigure,
} from './record.js';
export type {
  CalibrationDrift,
  CalibrationFigure,
  CalibrationIteration,
  CalibrationLaw,
  CalibrationLawKind,
  CalibrationLimits,
  CalibrationStepResult,
  NewCalibrationIteration,
  StoredCalibrationIteration,
  StoredCalibrationRun,
  TrackingFigures,
  TrimAdjustment,
  TrimAdvice,
  TrimBasis,
  TrimRemark,
} from './calibration.js';
export { MEASUREMENT_LABELS, measurementLabel, measurementLabelsOf } from './measurementLabels.js';
export {
  MINUS,
  PREFIXABLE_UNITS,
  PREFIX_EXPONENTS,
  SI_PREFIXES,
  formatInPrefix,
  formatLimitsIn,
  formatMarginIn,
  formatMeasured,
  formatMeasuredLabelled,
  formatSignificant,
  group,
  prefixExponent,
  prefixSymbol,
  prefixedUnit,
  quantityParts,
  uncertaintyLabel,
} from './quantityText.js';
export type { Coverage, QuantityParts, TextOptions } from './quantityText.js';
export { systemErrorWords } from './systemErrorWords.js';
