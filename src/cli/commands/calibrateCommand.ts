import type { Command } from 'commander';
import type { CommandContext } from '../context.js';
import type { CalibrationFlags, MeasuredStep } from '../calibrateRun.js';
import { parsePositive, parseSerial } from '../options.js';
import { createProgress } from '../progress.js';
import { addRecordingOptions } from '../dataOptions.js';

interface CalibrateOptions extends CalibrationFlags {
  spec: string;
  unit: string;
  iteration?: string;
  note?: string;
  json?: boolean;
  sampleRate?: string;
  interval?: string;
}

export function registerCalibrate(program: Command, ctx: CommandContext): Command {
  const cmd = program
    .command('calibrate')
    .description('one calibration iteration: error in cents at each step of the control law, fitted scale and offset, trim guidance')
    .argument('<captures...>', "one capture per calibration step, named after the spec's calibration pattern or given in step order")
    .requiredOption('--spec <file>', 'the design spec with a `calibration:` section')
    .requiredOption('--unit <serial>', 'serial number of the unit being calibrated', parseSerial)
    .option('--iteration <label>', 'a label for this iteration, e.g. "after scale trim"')
    .option('--new-run', "start a new calibration run even if the unit's latest one is still open")
    .option('--note <text>', 'what was done before this iteration (a part replaced, a trimmer turned); the next check of the unit opens a new test attempt')
    .option('--json', 'print one JSON document (schemaVersion 1) instead of tables')
    .option('--sample-rate <Hz>', 'sample rate, when a file has no time column or interval metadata')
    .option('--interval <s>', 'sample interval in seconds (instead of --sample-rate)')
    .addHelpText(
      'after',
      `
Examples:
  benchproof calibrate --spec samples/fh210-spec.yaml --unit FK-0104 samples/calibration/before/FK-0104_cv*.csv
  benchproof calibrate --spec samples/fh210-spec.yaml --unit FK-0104 --iteration "after scale and offset" samples/calibration/after/FK-0104_cv*.csv
  benchproof calibrate --spec samples/fh210-spec.yaml --unit FK-0104 --json --no-store samples/calibration/after/FK-0104_cv*.csv

Each invocation is one iteration of the unit's calibration run. A run continues until an iteration
meets the calibration limits; the next invocation after that, a changed spec, or --new-run starts a new run.
Exit status: 0 the unit meets the calibration limits, 1 it does not yet, 2 bad input.
Every iteration is stored in the records (./benchproof-data/, or BENCHPROOF_DATA / --data) unless --no-store.`,
    );
  return addRecordingOptions(cmd).action(async (files: string[], opts: CalibrateOptions, command: Command) => {
    const json = Boolean(opts.json);
    ctx.json = json;
    const timing = { sampleRate: parsePositive('--sample-rate', opts.sampleRate), interval: parsePositive('--interval', opts.interval) };
    const startedAt = new Date().toISOString();
    const { loadSpec } = await import('../checkRun.js');
    const { finishIteration, measureStep } = await import('../calibrateRun.js');
    const { planCalibration } = await import('../../design/index.js');
    const { calibrationDocument, renderCalibrationText } = await import('../../report/index.js');
    const { spec, text } = loadSpec(ctx, opts.spec);
    // Every file is placed at its step before any is read, so a misnamed file fails at once.
    const plan = planCalibration(spec, files, opts.unit);
    const note = (await import('../attemptCompanions.js')).checkNote(opts.note);
    const session = { spec, specText: text, unit: opts.unit, ...(opts.iteration ? { label: opts.iteration } : {}), ...(note !== undefined ? { note } : {}), timing, flags: opts, steps: new Map<number, MeasuredStep>() };
    const progress = createProgress(ctx, json);
    const measured: MeasuredStep[] = [];
    for (const entry of plan) measured.push(await measureStep(ctx, session, entry, progress));
    const { iteration, place } = finishIteration(ctx, session, measured, startedAt);
    ctx.io.stdout(json ? `${JSON.stringify(calibrationDocument(iteration, place), null, 2)}\n` : renderCalibrationText(iteration, ctx.styleFor(command), place));
    ctx.exitCode = iteration.meetsLimits ? 0 : 1;
  });
}
