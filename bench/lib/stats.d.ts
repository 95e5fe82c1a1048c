// Types of stats.js for the harness's own tests (test/bench).
export declare function median(values: readonly number[]): number | null;
export declare function ratio(a: number | null | undefined, b: number | null | undefined): number | null;
export declare const MIB: number;
export declare function fmtSeconds(s: number | null | undefined): string;
export declare function fmtMiB(bytes: number | null | undefined): string;
export declare function fmtRatio(r: number | null | undefined, digits?: number): string;
export declare function fmtRate(bytesPerSecond: number | null | undefined): string;
export declare function fmtSampleRate(perSecond: number | null | undefined): string;
export declare function markdownTable(header: readonly string[], rows: readonly (readonly string[])[]): string;
export declare function textTable(header: readonly string[], rows: readonly (readonly string[])[]): string;
