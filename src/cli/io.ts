/** What a command may touch of the outside world; tests inject their own. */
export interface CliIo {
  readonly stdout: (s: string) => void;
  readonly stderr: (s: string) => void;
  readonly stdoutIsTTY: boolean;
  readonly stderrIsTTY: boolean;
  /** Columns of the terminal stdout writes to, when it is one. */
  readonly stdoutColumns?: number;
  readonly env: Readonly<Record<string, string | undefined>>;
  readonly cwd: string;
}

export function processIo(): CliIo {
  return {
    stdout: (s) => void process.stdout.write(s),
    stderr: (s) => void process.stderr.write(s),
    stdoutIsTTY: Boolean(process.stdout.isTTY),
    stderrIsTTY: Boolean(process.stderr.isTTY),
    stdoutColumns: process.stdout.columns,
    env: process.env,
    cwd: process.cwd(),
  };
}
