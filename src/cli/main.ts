/**
 * The command line: parses flags, reads files, calls the stages in order, writes output and picks the
 * exit code. It computes nothing. Only here are errors caught: a BenchError prints its three lines
 * (or one JSON object with --json) to stderr and exits 2; anything else is an internal error, exit 3,
 * with a debug log (BENCHPROOF_DEBUG=1 adds the stack).
 */
import { Command, CommanderError } from 'commander';
import { writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { BenchError, isBenchError } from '../types/index.js';
import { processIo } from './io.js';
import type { CliIo } from './io.js';
import { createContext, loadTextStyle } from './context.js';
import type { CommandContext } from './context.js';
import { COMMANDS } from './commands/index.js';
import { TOOL_VERSION } from './version.js';

export async function run(argv: readonly string[], io: CliIo = processIo()): Promise<number> {
  const ctx = createContext(io);
  const program = buildProgram(ctx);
  try {
    await program.parseAsync([...argv], { from: 'user' });
    return ctx.exitCode;
  } catch (err) {
    return handleError(err, ctx, argv);
  }
}

export function buildProgram(ctx: CommandContext): Command {
  const program = new Command('benchproof')
    .description('Bench test assistant for oscillator builders: measure captures, check them against a design spec, keep a record of every unit.')
    .version(TOOL_VERSION, '--version', 'print the version')
    .option('--no-color', 'never colour the output')
    .showSuggestionAfterError(true)
    .configureOutput({ writeOut: ctx.io.stdout, writeErr: ctx.io.stderr })
    .exitOverride();
  program.addHelpText(
    'after',
    `
Examples:
  benchproof measure samples/captures/FK-0101_mid.csv
  benchproof check samples/captures/FK-0103_*.csv --spec samples/fh210-spec.yaml
  benchproof record FK-0103 --format md

Start with \`npm run demo\`; each command has --help with examples.`,
  );
  // Styled text needs the report stage and chalk; `measure --json`, the scripted hot path, prints none.
  program.hook('preAction', async (_program, action) => {
    if (!(action.name() === 'measure' && action.opts().json === true)) await loadTextStyle();
  });
  for (const register of COMMANDS) {
    const cmd = register(program, ctx);
    cmd.exitOverride().configureOutput({ writeOut: ctx.io.stdout, writeErr: ctx.io.stderr });
    cmd.showSuggestionAfterError(true);
  }
  return program;
}

function handleError(err: unknown, ctx: CommandContext, argv: readonly string[]): number {
  if (err instanceof CommanderError) {
    // Help and version are successes; every usage mistake exits 2 (commander would use 1).
    if (err.code === 'commander.helpDisplayed' || err.code === 'commander.version' || err.code === 'commander.help') return 0;
    if (err.exitCode === 0) return 0;
    if (err.code === 'commander.unknownOption') hintFileLikeOption(err.message, ctx);
    return 2;
  }
  const wantsJson = ctx.json || argv.includes('--json');
  if (isBenchError(err)) {
    ctx.io.stderr(wantsJson ? `${JSON.stringify({ error: (err as BenchError).toJSON() })}\n` : `${err.message}\n`);
    return 2;
  }
  const log = join(tmpdir(), `benchproof-debug-${process.pid}-${Date.now()}.log`);
  const detail = err instanceof Error ? `${err.stack ?? err.message}` : String(err);
  try {
    writeFileSync(log, `benchproof ${TOOL_VERSION}\nargv: ${JSON.stringify(argv)}\n${detail}\n`);
  } catch {
    // The notice below still tells the user something went wrong.
  }
  ctx.io.stderr(`benchproof: internal error (${err instanceof Error ? err.message.split('\n')[0] : 'unknown'}); details in ${log}\n`);
  if (ctx.io.env.BENCHPROOF_DEBUG === '1') ctx.io.stderr(`${detail}\n`);
  return 3;
}

/**
 * A file whose name starts with a dash (`-x.csv`, `--json.csv`) reads as an option; options never
 * hold a dot, so one that does was meant as a file: say how to name it.
 */
function hintFileLikeOption(message: string, ctx: CommandContext): void {
  const option = /'(-[^']*)'/.exec(message)?.[1];
  if (!option || !option.includes('.')) return;
  ctx.io.stderr(`  fix: a file name that starts with "-" reads as an option: write ./${option}, or put -- before the file names\n`);
}
