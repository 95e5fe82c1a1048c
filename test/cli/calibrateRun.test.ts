import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { calibrateCapture } from '../../src/cli/calibrateRun.js';
import type { CalibrationSession, MeasuredStep } from '../../src/cli/calibrateRun.js';
import { loadSpec } from '../../src/cli/checkRun.js';
import { createContext } from '../../src/cli/context.js';
import type { CliIo } from '../../src/cli/io.js';
import { openStore } from '../../src/records/index.js';
import { isBenchError } from '../../src/types/index.js';
import { makeTempDir, removeTempDir } from '../records/helpers/tempData.js';
import { expectWithin } from '../helpers/expectWithin.js';

// Demo data only: samples/calibration/before holds FK-0104 (fictional) as found.
let root: string;
let err: string;
beforeEach(() => {
  root = makeTempDir();
  err = '';
});
afterEach(() => removeTempDir(root));

const io = (): CliIo => ({ stdout: () => {}, stderr: (s) => (err += s), stdoutIsTTY: false, stderrIsTTY: false, env: { BENCHPROOF_DATA: join(root, 'data'), BENCHPROOF_OPERATOR: 'jo' }, cwd: process.cwd() });

describe('calibrateCapture, the per-capture step a watcher calls', () => {
  it('calibrateCapture decides each capture as it arrives and stores the iteration once the set is complete', async () => {
    const ctx = createContext(io());
    const { spec, text } = loadSpec(ctx, 'samples/fh210-spec.yaml');
    const session: CalibrationSession = { spec, specText: text, unit: 'FK-0104', timing: {}, flags: {}, steps: new Map<number, MeasuredStep>() };
    const order = [3, 0, 5, 1, 4, 2];
    const outcomes = [];
    for (const v of order) outcomes.push(await calibrateCapture(ctx, session, `samples/calibration/before/FK-0104_cv${v}.csv`));
    expect(outcomes[0].step.label).toBe('3');
    expect(outcomes[0].missing).toEqual(['0', '1', '2', '4', '5']);
    expectWithin(outcomes[1].step.cents, 1200 * Math.log2(1 / 1.06), { abs: 1.5 }, 'demo scenario: timing capacitor 6 % high');
    expect(outcomes.slice(0, 5).every((o) => o.iteration === undefined)).toBe(true);
    const last = outcomes[5];
    expect(last.missing).toEqual([]);
    expect(last.iteration?.steps.map((s) => s.label)).toEqual(['0', '1', '2', '3', '4', '5']);
    expect(last.place).toEqual({ calibrationId: 1, number: 1, startedRun: true });
    expect(session.steps.size).toBe(0);
    expect(err).toMatch(/stored iteration 1 of calibration run #1 of FK-0104/);
    const store = openStore(join(root, 'data'), { mode: 'read' });
    expect(store.calibrations('FK-0104')[0].iterations).toHaveLength(1);
    store.close();
  });

  it('calibrateCapture refuses a file of another unit with a BenchError', async () => {
    const ctx = createContext(io());
    const { spec, text } = loadSpec(ctx, 'samples/fh210-spec.yaml');
    const session: CalibrationSession = { spec, specText: text, unit: 'FK-0105', timing: {}, flags: { store: false }, steps: new Map() };
    const e = await calibrateCapture(ctx, session, 'samples/calibration/before/FK-0104_cv0.csv').catch((x: unknown) => x);
    expect(isBenchError(e) && e.code).toBe('calibration.name-unmatched');
  });
});
