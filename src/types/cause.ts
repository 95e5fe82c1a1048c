/** Likely causes ranked by src/diagnose from the pattern of verdicts and measurements. */

export interface Cause {
  /** Stable id, e.g. 'current-mismatch', 'rail-clipping'. */
  readonly id: string;
  /** One line in trade words: 'charge/discharge current mismatch'. */
  readonly title: string;
  /** 0…1, used only for ranking and shown as a rough weight. */
  readonly score: number;
  /** What in the results triggered it, each a sentence with the numbers. */
  readonly evidence: readonly string[];
  /** The next measurement that would confirm or rule it out. */
  readonly confirm: string;
  /** Where to look on the board, in general words. */
  readonly where?: string;
  /** Ids of other causes the data cannot tell apart from this one. */
  readonly indistinguishableFrom?: readonly string[];
  /**
   * The same findings as data, for report to put into words with the shared formatter: per part,
   * what the captures imply against its design value. Added beside `evidence` (kept for JSON
   * readers); rules that have not been moved to facts yet leave it out.
   */
  readonly facts?: readonly CauseFact[];
}

/** One part's finding: the value the captures imply against the design's, and what would confirm it. */
export interface CauseFact {
  /** The part in the trade's words: 'timing capacitor'. */
  readonly part: string;
  /** What the captures imply for it, in SI units. */
  readonly observed: { readonly value: number; readonly unit: string };
  /** The design value and its tolerance band, when the spec gives them. */
  readonly design?: { readonly nominal: number; readonly lower: number; readonly upper: number; readonly unit: string };
  /** Share of the observed error this part alone would explain, 0…1, when computed. */
  readonly shareExplained?: number;
  /** The measurement that would confirm it. */
  readonly confirm: string;
}

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

export interface CircuitView {
  readonly condition: string;
  readonly figures: readonly CircuitFigure[];
  readonly summary: readonly string[];
}

export interface Diagnosis {
  readonly causes: readonly Cause[];
  readonly circuit?: readonly CircuitView[];
}
