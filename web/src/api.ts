// The server's JSON routes, typed as the page uses them.
export interface BenchErrorView {
  readonly code: string;
  readonly file?: string;
  readonly line?: number;
  readonly problem: string;
  readonly expected?: string;
  readonly fix?: string;
  /** The three lines `check` prints for the same error. */
  readonly message?: string;
}

export interface BoardRow {
  readonly unit: string;
  readonly status: string;
  readonly word: string;
  /** Conditions an INCOMPLETE unit still waits for. */
  readonly waitingFor: readonly string[];
  readonly attempts: number | null;
  readonly unverified: number;
  readonly runs: number;
  readonly lastTestedAt: string;
}

export interface Board {
  readonly spec: { name: string; revision: string; file: string } | null;
  readonly specProblem: BenchErrorView | null;
  readonly data: string;
  readonly canDrop: boolean;
  readonly units: readonly BoardRow[];
}

export interface ChannelView {
  readonly name: string;
  readonly unit: string;
  readonly shape: string;
  readonly marks: {
    readonly highLevel: number | null;
    readonly lowLevel: number | null;
    readonly midReference: number | null;
    readonly crossings: readonly number[];
    readonly slopeFits: readonly { t1: number; v1: number; t2: number; v2: number }[];
    readonly excerpt: { from: number; to: number } | null;
  };
  readonly harmonics: readonly { n: number; frequency: number; dbc: number }[];
  readonly spectrum: { binWidth: number; bins: number; window: string; reference: string } | null;
}

export interface CaptureView {
  readonly sha256: string;
  readonly path: string;
  readonly condition: string;
  readonly samples: number | null;
  readonly channels: readonly ChannelView[];
  readonly outputs: readonly { output: string; channel: string }[];
}

export interface RunView {
  readonly id: number;
  readonly startedAt: string;
  readonly operator: string;
  readonly statement: string;
  readonly word: string;
  readonly intact: boolean;
  readonly captures: readonly CaptureView[];
}

export interface AttemptView {
  readonly number: number;
  readonly state: string;
  readonly statement: string;
  readonly word: string;
  readonly notes: readonly string[];
  readonly startedAt: string;
}

export interface UnitView {
  readonly unit: string;
  readonly status: string;
  readonly word: string;
  readonly waitingFor: readonly string[];
  readonly attempts: readonly AttemptView[];
  readonly spec: { name: string; revision: string };
  readonly runs: readonly RunView[];
}

export interface PlotData {
  readonly t: number[];
  readonly min: (number | null)[];
  readonly max: (number | null)[];
  readonly from: number;
  readonly to: number;
  readonly whole: { from: number; to: number };
  readonly samples: number;
  readonly step: number;
  readonly unit: string;
}

export class ApiError extends Error {
  constructor(readonly status: number, readonly error: BenchErrorView) {
    super(error.message ?? error.problem);
  }
}

export async function getJson<T>(url: string, signal?: AbortSignal): Promise<T> {
  const res = await fetch(url, { headers: { Accept: 'application/json' }, ...(signal ? { signal } : {}) });
  const body = (await res.json()) as T & { error?: BenchErrorView };
  if (!res.ok) throw new ApiError(res.status, body.error ?? { code: 'serve.unknown', problem: `HTTP ${res.status}` });
  return body;
}
