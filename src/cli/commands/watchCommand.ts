import type { Command } from 'commander';
import type { CommandContext } from '../context.js';
import { parsePositive, parseSerial } from '../options.js';
import { addDataOption } from '../dataOptions.js';
import type { StoreFlags } from '../dataOptions.js';
import { BenchError } from '../../types/index.js';

interface WatchOptions extends StoreFlags {
  calibrate?: boolean;
  iteration?: string;
  spec: string;
  unit?: string;
  condition?: string;
  settle: string;
  newOnly?: boolean;
  poll?: boolean;
  reportDir?: string;
  json?: boolean;
  sampleRate?: string;
  interval?: string;
  note?: string;
  newAttempt?: boolean;
  forceUnit?: boolean;
}

export const DEFAULT_SETTLE_MS = 1000;

export function registerWatch(program: Command, ctx: CommandContext): Command {
  const cmd = program
    .command('watch')
    .description('check and record each capture as it lands in a folder: one line per file, until Ctrl-C')
    .argument('<dir>', 'folder the scope or copy tool saves captures into (files directly in it)')
    .requiredOption('--spec <file>', 'the design spec (YAML or JSON); its file-name pattern gives unit and condition')
    .option('--unit <serial>', 'serial number of every capture, for a single-unit session', parseSerial)
    .option('--force-unit', 'with --unit: record a file whose name names another unit under --unit anyway')
    .option('--condition <name>', 'condition of every capture, instead of the one in the file names')
    .option('--note <text>', "what was done to the units before this session (a repair, a trim): each unit's first file opens a new test attempt with it")
    .option('--new-attempt', "each unit's first file opens a new test attempt instead of continuing the open one")
    .option('--settle <ms>', 'a file is read once its size and time have not changed for this long', String(DEFAULT_SETTLE_MS))
    .option('--new-only', 'skip the files already in the folder at start (by default they are checked unless recorded)')
    .option('--poll', 'look at the folder twice a second instead of waiting for change notices (for network shares)')
    .option('--calibrate', 'a calibration is in progress: each capture is a step of --unit (the spec\'s calibration pattern); each full set is one iteration')
    .option('--iteration <label>', 'with --calibrate: a label for the iterations of this session')
    .option('--report-dir <dir>', "after each capture, write the unit's HTML record into this folder")
    .option('--json', 'one JSON object per line (NDJSON, schemaVersion 1) instead of text lines')
    .option('--operator <name>', 'who ran the tests (default: BENCHPROOF_OPERATOR, else the login name)')
    .option('--sample-rate <Hz>', 'sample rate, when a file has no time column or interval metadata')
    .option('--interval <s>', 'sample interval in seconds (instead of --sample-rate)');
  return addDataOption(cmd)
    .addHelpText(
      'after',
      `
Examples:
  benchproof watch samples/captures --spec samples/fh210-spec.yaml --new-only
  benchproof watch /media/usb-stick --spec samples/fh210-spec.yaml --report-dir /media/usb-stick
  benchproof watch /mnt/bench-share --spec samples/fh210-spec.yaml --poll --json

  benchproof watch /media/usb-stick --spec samples/fh210-spec.yaml --unit FK-0106 --note "C3 replaced"

Each unit has one open test attempt: a landed file joins it and is checked with the attempt's
captures of the other conditions, and stored like \`benchproof check\` on that set. Until every
condition has landed the unit is INCOMPLETE (the line says "FK-0101 2/3, waiting for high") and
likely causes wait for the rest; a complete attempt is closed, and the unit's next file opens a new
one. The same bytes for the same unit and condition are never stored twice.
Ctrl-C (or SIGTERM) stops after the file in hand and prints a summary; exit status 0, 2 bad input.`,
    )
    .action(async (dir: string, opts: WatchOptions, cmd: Command) => {
      const json = Boolean(opts.json);
      ctx.json = json;
      const settleMs = parsePositive('--settle', opts.settle) ?? DEFAULT_SETTLE_MS;
      const note = (await import('../attemptCompanions.js')).checkNote(opts.note);
      const attempt = note !== undefined || opts.newAttempt ? { ...(note !== undefined ? { note } : {}), ...(opts.newAttempt ? { newAttempt: true } : {}) } : undefined;
      const timing = { sampleRate: parsePositive('--sample-rate', opts.sampleRate), interval: parsePositive('--interval', opts.interval) };
      const { runWatchSession } = await import('../watchSession.js');
      const onCapture = opts.calibrate ? (await import('../watchCalibration.js')).calibrateEachCapture(requireUnit(opts.unit), opts, opts.iteration, note) : undefined;
      const stop = stopOnSignals();
      try {
        await runWatchSession(
          ctx,
          {
            dir, specFile: opts.spec, overrides: { unit: opts.unit, condition: opts.condition }, flags: opts, settleMs,
            newOnly: Boolean(opts.newOnly), poll: Boolean(opts.poll), reportDir: opts.reportDir, json, timing, style: ctx.styleFor(cmd),
            ...(onCapture ? { onCapture } : {}),
            ...(attempt ? { attempt } : {}),
            forceUnit: Boolean(opts.forceUnit),
          },
          stop.signal,
        );
      } finally {
        stop.release();
      }
      ctx.exitCode = 0;
    });
}

/** A calibration session belongs to one unit: --calibrate needs --unit. */
function requireUnit(unit: string | undefined): string {
  if (unit) return unit;
  throw new BenchError({
    code: 'usage.missing-unit',
    file: '-',
    problem: '--calibrate was given without --unit',
    expected: 'the serial of the unit being calibrated',
    fix: 'add --unit SERIAL, e.g. benchproof watch DIR --spec SPEC --calibrate --unit FK-0104',
  });
}

/**
 * SIGINT (Ctrl-C) and SIGTERM ask the session to stop after the file in hand. A second signal ends
 * the process at once: every stored run is its own transaction, so nothing is left half-written.
 */
function stopOnSignals(): { signal: AbortSignal; release(): void } {
  const controller = new AbortController();
  const onSignal = (name: NodeJS.Signals): void => {
    if (!controller.signal.aborted) return controller.abort(name);
    process.exit(name === 'SIGINT' ? 130 : 143);
  };
  process.on('SIGINT', onSignal);
  process.on('SIGTERM', onSignal);
  return {
    signal: controller.signal,
    release: () => {
      process.off('SIGINT', onSignal);
      process.off('SIGTERM', onSignal);
    },
  };
}
