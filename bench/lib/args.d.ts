// Types of args.js for the harness's own tests (test/bench).
export declare const DEFAULT_SIZES: number[];
export declare function parseSize(text: string): number;
export declare function sizeLabel(rows: number): string;
export interface BenchOptions {
  sizes: number[];
  runs: number | null;
  peer: boolean;
  synth: boolean;
  page: boolean;
  regenerate: boolean;
  strict: boolean;
  help: boolean;
}
export declare function parseArgs(argv: readonly string[]): BenchOptions;
export declare function helpText(): string;
export declare function runsFor(rows: number, requested: number | null): number;
