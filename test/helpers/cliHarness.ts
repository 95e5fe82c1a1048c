/** Runs the command line in-process with captured stdout/stderr, as the CLI tests need. */
import { tempFolder } from './tempFolders.js';
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
    // A test that runs in the checkout stores records in a fresh temporary folder, never in the
    // checkout itself; a test that gives its own working directory manages its own data folder.
    env: options.cwd === undefined ? { BENCHPROOF_DATA: tempFolder('benchproof-test-'), ...options.env } : { ...options.env },
    cwd: options.cwd ?? process.cwd(),
  };
  const code = await run(argv, io);
  return { code, stdout, stderr };
}
