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
import { BenchError, isBenchError, type ErrorCode } from '../types/index.js';
import { processIo } from './io.js';
import { terminalSafeIo } from './terminalText.js';
import type { CliIo } from './io.js';
import { createContext, loadTextStyle } from './context.js';
import type { CommandContext } from './context.js';
import { COMMANDS } from './commands/index.js';
import type { CommandEntry } from './commands/index.js';
import { TOOL_VERSION } from './version.js';

export async function run(argv: readonly string[], io: CliIo = processIo()): Promise<number> {
  // Everything written passes one filter: control characters from file names and the like are shown escaped.
  const ctx = createContext(terminalSafeIo(io));
  const program = buildProgram(ctx, argv);
  // Nothing asked: the help is the answer, on stdout (commander would print it as an error).
  if (argv.length === 0) {
    ctx.io.stdout(program.helpInformation());
    return 0;
  }
  try {
    await program.parseAsync([...argv], { from: 'user' });
    return ctx.exitCode;
  } catch (err) {
    return handleError(err, ctx, argv);
  }
}

export function buildProgram(ctx: CommandContext, argv: readonly string[] = []): Command {
  const program = new Command('benchproof')
    .description('Bench test assistant for oscillator builders: measure captures, check them against a design spec, keep a record of every unit.')
    .version(TOOL_VERSION, '--version', 'print the version')
    .option('--no-color', 'never colour the output')
    .showSuggestionAfterError(true)
    .configureOutput(parserOutput(ctx))
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
  for (const { register } of commandsFor(argv)) {
    const cmd = register(program, ctx);
    cmd.exitOverride().configureOutput(parserOutput(ctx));
    cmd.showSuggestionAfterError(true);
  }
  return program;
}

/**
 * The commands to set up for a run: only the one it starts with, when it starts with a command's name
 * (setting up all thirteen, with their options and help, is a measurable part of every start, issue
 * 21); all of them for anything else (the program's help and version, a mistyped command, an option
 * before the command), so that the command list and the nearest-match suggestions stay complete.
 */
function commandsFor(argv: readonly string[]): readonly CommandEntry[] {
  const named = COMMANDS.find((c) => c.name === argv[0]);
  return named === undefined ? COMMANDS : [named];
}

function handleError(err: unknown, ctx: CommandContext, argv: readonly string[]): number {
  if (err instanceof CommanderError) {
    // Help and version are successes; every usage mistake is a BenchError like any other, exit 2.
    if (err.code === 'commander.helpDisplayed' || err.code === 'commander.version' || err.code === 'commander.help') return 0;
    if (err.exitCode === 0) return 0;
    err = usageError(err);
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
 * commander writes help through `writeOut`; its own error texts are dropped here, because
 * handleError renders every parser error as a BenchError (three lines, or JSON with --json).
 */
function parserOutput(ctx: CommandContext): { writeOut: (s: string) => void; writeErr: (s: string) => void; outputError: () => void } {
  return { writeOut: ctx.io.stdout, writeErr: ctx.io.stderr, outputError: () => undefined };
}

/** The parser's mistakes in the tool's own error form: a stable code, what was expected, a fix. */
function usageError(err: CommanderError): BenchError {
  const said = err.message.replace(/^error:\s*/, '').split('\n');
  const problem = said[0] ?? err.message;
  const hint = said.slice(1).join(' ').trim();
  const quoted = /'([^']*)'/.exec(problem)?.[1] ?? '';
  const fields = USAGE[err.code] ?? { code: 'usage.invalid', expected: 'the command line that --help shows', fix: 'run benchproof --help' };
  const nearest = /Did you mean ([^?]+)\?/.exec(hint)?.[1];
  let fix = nearest !== undefined ? `did you mean ${nearest}? (benchproof --help lists every command and option)` : fields.fix;
  if (quoted && (err.code === 'commander.optionMissingArgument' || err.code === 'commander.missingMandatoryOptionValue')) fix = `write ${quoted}, with its value`;
  const choices = /Allowed choices are ([^.]+)\./.exec(problem)?.[1];
  const expected = choices !== undefined ? `one of ${choices}` : fields.expected;
  // A file whose name starts with a dash (`-x.csv`) reads as an option; options never hold a dot.
  if (err.code === 'commander.unknownOption' && quoted.includes('.')) fix = `a file name that starts with "-" reads as an option: write ./${quoted}, or put -- before the file names`;
  return new BenchError({ code: fields.code, file: '-', problem: problem.replace(/\s*Allowed choices are [^.]+\./, ''), expected, fix });
}

const USAGE: Readonly<Record<string, { code: ErrorCode; expected: string; fix: string }>> = {
  'commander.unknownCommand': { code: 'usage.unknown-command', expected: 'one of the commands that benchproof --help lists', fix: 'run benchproof --help' },
  'commander.unknownOption': { code: 'usage.unknown-option', expected: "an option that the command's --help lists", fix: 'run the command with --help to see its options' },
  'commander.missingMandatoryOptionValue': { code: 'usage.missing-option', expected: 'every required option given', fix: 'add the option named above' },
  'commander.optionMissingArgument': { code: 'usage.missing-value', expected: 'a value after the option', fix: 'write the value after the option, e.g. --spec samples/fh210-spec.yaml' },
  'commander.missingArgument': { code: 'usage.missing-argument', expected: 'the arguments the command needs', fix: 'run the command with --help to see its arguments' },
  'commander.excessArguments': { code: 'usage.extra-argument', expected: 'no more arguments than the command takes', fix: 'remove the extra arguments, or quote a name that holds spaces' },
  'commander.invalidArgument': { code: 'usage.invalid-value', expected: 'one of the values the option accepts', fix: 'run the command with --help to see the accepted values' },
  'commander.conflictingOption': { code: 'usage.conflicting-options', expected: 'at most one of the options named', fix: 'keep one of the two options' },
};
