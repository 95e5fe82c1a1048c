/** Runs the command line in-process with captured stdout/stderr, as the CLI tests need. */
import { run } from '../../src/cli/main.js';
import type { CliIo } from '../../src/cli/io.js';

export interface CliResult {
  readonly code: number;
  readonly stdout: string;
  readonly stderr: string;
}

export async function runCli(
  argv: readonly string[],
  options: { cwd?: string; env?: Record<string, string | undefined>; tty?: boolean } = {},
): Promise<CliResult> {
  let stdout = '';
  let stderr = '';
  const io: CliIo = {
    stdout: (s) => {
      stdout += s;
    },
    stderr: (s) => {
      stderr += s;
    },
    stdoutIsTTY: options.tty ?? false,
    stderrIsTTY: options.tty ?? false,
    env: { ...options.env },
    cwd: options.cwd ?? process.cwd(),
  };
  const code = await run(argv, io);
  return { code, stdout, stderr };
}
