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
    stdout: guardedWriter(process.stdout),
    stderr: guardedWriter(process.stderr),
    stdoutIsTTY: Boolean(process.stdout.isTTY),
    stderrIsTTY: Boolean(process.stderr.isTTY),
    stdoutColumns: process.stdout.columns,
    env: process.env,
    cwd: process.cwd(),
  };
}

/**
 * Writes to a stream until its reader goes away (`benchproof … | head` closes the pipe early): the
 * rest of the output is dropped and the command finishes its work (a run being stored is stored),
 * instead of dying on an unhandled EPIPE with a stack trace.
 */
function guardedWriter(stream: NodeJS.WriteStream): (s: string) => void {
  let open = true;
  stream.on('error', (err: NodeJS.ErrnoException) => {
    if (err.code === 'EPIPE' || err.code === 'ERR_STREAM_DESTROYED') open = false;
    else throw err;
  });
  return (s) => {
    if (open) stream.write(s);
  };
}
