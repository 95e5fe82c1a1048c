// Types for bench/lib/targets.js, so that the harness tests type-check.
export interface Target {
  readonly id: string;
  readonly label: string;
  readonly status: 'PASS' | 'FAIL' | 'SKIP';
  readonly value: number | null;
  readonly limit: number | null;
  readonly note: string;
}
export const LIMITS: {
  readonly speedVsPeer: number;
  readonly ingestMBps: number;
  readonly fixedSeconds: number;
  readonly memoryBefore: Readonly<Record<number, number>>;
  readonly growth: number;
  readonly memory10M: number;
  readonly fftSeconds: number;
};
export function evaluateTargets(results: unknown): Target[];
