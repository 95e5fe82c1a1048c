// Types of proc.js for the harness's own tests (test/bench).
export declare const GNU_TIME: string;
export interface TimedRun {
  ok: boolean;
  code: number | null;
  signal: string | null;
  wall: number | null;
  maxRss: number | null;
  /** User + system CPU seconds from GNU time, or null. */
  cpu: number | null;
  stdout: string;
  stderr: string;
  error: string | null;
}
export declare function parseMaxRss(report: string): number | null;
export declare function parseCpuSeconds(report: string): number | null;
export declare function runTimed(cmd: string, args: readonly string[], options?: { cwd?: string; timeoutMs?: number; useTime?: boolean }): Promise<TimedRun>;
export declare function parseJson(text: string): unknown;
