import type { Command } from 'commander';
import type { CommandContext } from '../context.js';
import { parsePositive } from '../options.js';
import { addDataOption } from '../dataOptions.js';
import type { StoreFlags } from '../dataOptions.js';
import { BenchError } from '../../types/index.js';

interface ServeOptions extends StoreFlags {
  spec?: string;
  watch?: string;
  port?: string;
  host?: string;
  settle: string;
  maxUploadMb: string;
  maxFiles: string;
  requireToken?: boolean;
}

export function registerServe(program: Command, ctx: CommandContext): Command {
  const cmd = program
    .command('serve')
    .description('the bench page: a local web page to drop captures, follow each unit live, and open records with plots')
    .option('--spec <file>', 'the design spec dropped captures are checked against (YAML or JSON)')
    .option('--watch <dir>', 'also check and record each capture landing in this folder, as `benchproof watch` does')
    .option('--port <n>', 'port to listen on (default: a free one)')
    .option('--host <address>', 'listen on this interface instead of this computer only; an access token is then required')
    .option('--require-token', 'ask for the access token on this computer too (one that several people log in to)')
    .option('--operator <name>', 'who runs the tests (default: BENCHPROOF_OPERATOR, else the login name)')
    .option('--settle <ms>', 'with --watch: a file is read once its size and time have held still this long', '1000')
    .option('--max-upload-mb <n>', 'largest capture the page accepts, in MiB', '512')
    .option('--max-files <n>', 'most files in one drop', '24');
  return addDataOption(cmd)
    .addHelpText(
      'after',
      `
Examples:
  benchproof serve --spec samples/fh210-spec.yaml --data bench-data
  benchproof serve --spec samples/fh210-spec.yaml --watch /media/usb-stick
  benchproof serve --spec samples/fh210-spec.yaml --host 0.0.0.0 --port 8400

Open the printed address in a browser on this computer. With --host the address carries an access
token (kept in the data folder); requests without it are refused. Ctrl-C stops the server after
the capture in hand. With --watch, a folder that is missing or unreadable is refused at the start,
and one removed or made unreadable while serving stops the server too (exit status 2, saying so).`,
    )
    .action(async (opts: ServeOptions) => {
      const port = parsePort(opts.port);
      const maxMb = parsePositive('--max-upload-mb', opts.maxUploadMb) ?? 512;
      const maxFiles = parsePositive('--max-files', opts.maxFiles) ?? 24;
      const settleMs = parsePositive('--settle', opts.settle) ?? 1000;
      if (opts.watch !== undefined && opts.spec === undefined) throw needsSpec();
      const [{ startBenchServer }, inside] = await Promise.all([import('../../server/benchServer.js'), import('../../server/watchInside.js')]);
      // A folder that cannot be watched is refused before the page starts (as `watch` refuses it).
      const folderProblem = opts.watch === undefined ? undefined : inside.watchFolderProblem(ctx, opts.watch);
      if (folderProblem) throw folderProblem;
      const server = await startBenchServer(ctx, {
        host: opts.host ?? '127.0.0.1',
        port,
        flags: opts,
        ...(opts.spec !== undefined ? { specFile: opts.spec } : {}),
        requireToken: Boolean(opts.requireToken),
        limits: { maxFileBytes: Math.round(maxMb * 1024 * 1024), maxFiles: Math.max(1, Math.floor(maxFiles)) },
      });
      const watch = opts.watch === undefined || opts.spec === undefined ? undefined : inside.startInsideWatch(ctx, opts.watch, opts.spec, server.setup.flags, server.setup.hub, settleMs);
      ctx.io.stderr(`benchproof: the bench page is at ${server.url}${server.needsToken ? ' (the address carries the access token; keep it to yourself)' : ''}; records in ${server.setup.location.shown}; Ctrl-C stops\n`);
      // Ctrl-C, or the watched folder failing: then serve stops too and exits 2 with what happened.
      const signal = untilSignal();
      const ended = await Promise.race([signal.then(() => undefined), watch?.failed ?? new Promise<never>(() => {})]);
      signal.cancel();
      await watch?.stop();
      await server.close();
      if (ended) {
        ctx.io.stderr('benchproof: the bench page has stopped: the folder watch cannot go on\n');
        throw ended;
      }
      ctx.io.stderr('benchproof: the bench page has stopped\n');
      ctx.exitCode = 0;
    });
}

function parsePort(raw: string | undefined): number {
  if (raw === undefined) return 0;
  const n = Number(raw);
  if (Number.isInteger(n) && n >= 0 && n <= 65535) return n;
  throw new BenchError({ code: 'usage.bad-port', file: '-', problem: `--port got "${raw}", which is not a port number`, expected: 'a whole number from 1 to 65535 (0 or none: a free port)', fix: 'leave out --port, or give e.g. --port 8400' });
}

function needsSpec(): BenchError {
  return new BenchError({ code: 'usage.missing-spec', file: '-', problem: '--watch was given without --spec', expected: 'the spec the watched captures are checked against', fix: 'add --spec samples/fh210-spec.yaml (or your own spec)' });
}

/** Ctrl-C or SIGTERM; a second one ends the process at once (each stored run is its own transaction). */
function untilSignal(): Promise<void> & { cancel(): void } {
  let onSignal: () => void = () => {};
  const waiting = new Promise<void>((done) => {
    onSignal = (): void => {
      process.off('SIGINT', onSignal);
      process.off('SIGTERM', onSignal);
      process.once('SIGINT', () => process.exit(130));
      process.once('SIGTERM', () => process.exit(143));
      done();
    };
    process.on('SIGINT', onSignal);
    process.on('SIGTERM', onSignal);
  });
  return Object.assign(waiting, {
    // Stopped for another reason: Ctrl-C is no longer ours to catch.
    cancel: () => {
      process.off('SIGINT', onSignal);
      process.off('SIGTERM', onSignal);
    },
  });
}
