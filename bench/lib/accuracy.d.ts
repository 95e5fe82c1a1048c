// Types of accuracy.js for the harness's own tests (test/bench).
export interface ToolValues {
  frequency: number | null;
  peakToPeak: number | null;
  dcOffset: number | null;
  riseSlope?: number | null;
  fallSlope?: number | null;
  slopeRatio?: number | null;
  thd?: number | null;
  harmonicsCounted?: number | null;
}
export type Verdict = 'better' | 'equal' | 'tie' | 'worse' | 'missing' | 'neither';
export interface AccuracyRow {
  channel: 'ch1' | 'ch2';
  quantity: string;
  truthBenchproof: number | null;
  truthPeer: number | null;
  benchproof: number | null;
  peer: number | null;
  errBenchproof: number | null;
  errPeer: number | null;
  verdict: Verdict;
  atLeastAsAccurate: boolean;
}
export declare const TIE: number;
export declare function triangleHarmonic(n: number, A: number, r: number): number;
export declare function triangleThdPercent(H: number, r: number): number;
export declare function genCaptureTruth(): {
  ch1: { frequency: number; peakToPeak: number; dcOffset: number; riseSlope: number; fallSlope: number; slopeRatio: number };
  ch2: { frequency: number; peakToPeak: number; dcOffset: number };
};
export declare function fromBenchproof(doc: unknown): Record<'ch1' | 'ch2', ToolValues>;
export declare function fromPeer(doc: unknown): Record<'ch1' | 'ch2', ToolValues>;
export declare function compareAccuracy(bp: Record<string, ToolValues> | null, peer: Record<string, ToolValues> | null): AccuracyRow[];
export declare function rank(eBp: number | null, ePeer: number | null): Verdict;
