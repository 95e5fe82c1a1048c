/**
 * Likely causes ranked by src/diagnose from the pattern of verdicts and measurements. A cause carries
 * its findings as data (`facts`, `remarks`): quantities with their unit and uncertainty, the design
 * value or nominal they are set against, the share of the deviation a part explains. Only src/report
 * puts them into words, through the shared formatter (src/types/quantityText.ts).
 */

export interface Cause {
  /** Stable id, e.g. 'current-mismatch', 'rail-clipping'. */
  readonly id: string;
  /** The cause's name in trade words: 'charge/discharge current mismatch'. */
  readonly title: string;
  /** 0…1, used only for ranking and shown as a rough weight. */
  readonly score: number;
  /**
   * The findings in words, one line each, kept for JSON readers of earlier versions. Written by
   * src/report from `facts` and `remarks` (`describeDiagnosis`); src/diagnose leaves it empty. Runs
   * stored before the facts existed have only this.
   */
  readonly evidence: readonly string[];
  /** The next measurement that would confirm or rule it out. */
  readonly confirm: string;
  /** Where to look on the board, in general words. */
  readonly where?: string;
  /** Ids of other causes the data cannot tell apart from this one. */
  readonly indistinguishableFrom?: readonly string[];
  /** What the captures show, as data, in the order report writes them. */
  readonly facts?: readonly CauseFact[];
  /** Reasoning that ties the facts to the cause, as ids report writes in words (see CauseRemark). */
  readonly remarks?: readonly CauseRemark[];
}

/** A quantity as data: the value in SI units (or %, dBc, a ratio) and its expanded uncertainty. */
export interface FactQuantity {
  readonly value: number;
  readonly unit: string;
  /** Expanded uncertainty U (k = 2) in the same unit, when one is known. */
  readonly expandedUncertainty?: number;
}

/** What a fact is: a part's value on the board, a measured quantity, or a figure derived from measured ones. */
export type CauseFactKind = 'part' | 'measured' | 'derived';

/** What an `expected` value is: the spec's nominal, the design value, or a prediction from other facts. */
export type ExpectedBasis = 'nominal' | 'design' | 'predicted';

/**
 * One finding: a part or quantity, the value the captures show or imply (with U where known), what it
 * is set against (the design band, or an expected value), and for a part the share of the observed
 * deviation it alone would explain and the measurement that would confirm it.
 */
export interface CauseFact {
  /** The part or quantity in the trade's words: 'timing capacitor', 'switching delay'. For a measured quantity, the display label of `measurement`. */
  readonly part: string;
  /** 'part' when absent (the first facts had no kind). */
  readonly kind?: CauseFactKind;
  /** The measurement id, for a measured quantity (its display name comes from the label table). */
  readonly measurement?: string;
  /** The output the quantity was measured on. */
  readonly output?: string;
  /** The condition it was measured at. */
  readonly condition?: string;
  /** A mean over this many conditions, when it is one. */
  readonly averagedOver?: number;
  /** What the captures show or imply, in SI units. */
  readonly observed: FactQuantity;
  /** The design value and its tolerance band, when the spec gives them. */
  readonly design?: { readonly nominal: number; readonly lower: number; readonly upper: number; readonly unit: string };
  /** A value the observation is set against that has no band: the nominal here, or a prediction. */
  readonly expected?: FactQuantity & { readonly basis: ExpectedBasis };
  /** Share of the observed deviation this part alone would explain, 0…1, when computed. */
  readonly shareExplained?: number;
  /** The measurement that would confirm it (part facts). */
  readonly confirm?: string;
  /** A part the captures cannot tell from the cause's own part: what it would have to be instead. */
  readonly alternative?: boolean;
  /** The pattern rule this fact came from, when a part's cause took the rule over. */
  readonly pattern?: { readonly id: string; readonly title: string };
}

/**
 * Reasoning remarks, a closed list so that report words them (one sentence each):
 * - 'same-ratio-everywhere': the frequency is off by one ratio at every condition;
 * - 'swing-not-the-cause': the swing is on design, so the thresholds do not explain the frequency;
 * - 'error-grows-with-frequency' / 'error-largest-at-low-end': the shape of the frequency error;
 * - 'period-longer-by-4td': each period is longer by four delays;
 * - 'swing-grows-with-frequency': ramps run past the thresholds longer at high frequency;
 * - 'duty-follows-slopes': the pulse duty is what the slope ratio predicts;
 * - 'no-even-harmonics': a symmetric triangle has no even harmonics;
 * - 'swing-set-by-thresholds', 'frequency-follows-swing': f ∝ 1/Vpp;
 * - 'core-runs-on': the frequency is within tolerance everywhere, only the output clips;
 * - 'one-side-flat': one side flat, where a threshold fault would move both turns;
 * - 'flat-inside-rails': a flat level well inside the design rails;
 * - 'levels-withheld': levels and slopes of a clipped trace are withheld;
 * - 'no-flat-clipping': a low level that is not clipped flat;
 * - 'slope-ratio-cancels-c': the current comparison comes from the slope ratio, where C cancels;
 * - 'attribution': a part's share comes from χ² of the captures against the design.
 */
export type CauseRemark =
  | 'same-ratio-everywhere'
  | 'swing-not-the-cause'
  | 'error-grows-with-frequency'
  | 'error-largest-at-low-end'
  | 'period-longer-by-4td'
  | 'swing-grows-with-frequency'
  | 'duty-follows-slopes'
  | 'no-even-harmonics'
  | 'swing-set-by-thresholds'
  | 'frequency-follows-swing'
  | 'core-runs-on'
  | 'one-side-flat'
  | 'flat-inside-rails'
  | 'levels-withheld'
  | 'no-flat-clipping'
  | 'slope-ratio-cancels-c'
  | 'attribution';

/** Figures back-computed from the captures and the spec's design section (issue: design-aware diagnosis). */
export interface CircuitFigure {
  readonly id: string;
  readonly label: string;
  readonly value: number;
  readonly unit: string;
  readonly uncertainty: number | null;
  readonly design?: number;
  readonly designTolerance?: number;
  /** Relative deviation from design in % (signed), when a design value exists. */
  readonly deviation?: number;
  readonly withinTolerance?: boolean;
  readonly note?: string;
}

/** Why a circuit figure could not be computed at a condition, as data (report words it). */
export interface CircuitGap {
  /** 'current-not-carried': the design current holds at another condition and cannot be carried here; 'current-no-condition': it names no condition. */
  readonly code: 'current-not-carried' | 'current-no-condition';
  /** The design key, e.g. 'chargeCurrent'. */
  readonly key: string;
  /** The condition the design value holds at, when it names one. */
  readonly at?: string;
}

export interface CircuitView {
  readonly condition: string;
  readonly figures: readonly CircuitFigure[];
  /**
   * The view's findings in words, kept for JSON readers: written by src/report from `figures` and
   * `gaps` (`describeDiagnosis`); src/diagnose leaves it empty.
   */
  readonly summary: readonly string[];
  /** What could not be computed here, and why. */
  readonly gaps?: readonly CircuitGap[];
}

export interface Diagnosis {
  readonly causes: readonly Cause[];
  readonly circuit?: readonly CircuitView[];
}
