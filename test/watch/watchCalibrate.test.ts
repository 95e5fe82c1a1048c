/**
 * `watch --calibrate` on a real folder: the demo calibration captures of FK-0104 (invented scenario,
 * src/syntheticCaptures/calibrationScenario.ts: scale and offset off before trimming) land one by one; each is
 * placed at its step with its error in cents, and the full set becomes one stored iteration with
 * trim guidance, as `benchproof calibrate` gives. Cents: 1200·log2(f/f_expected) (REFERENCES §9).
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { copyFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { openStore } from '../../src/records/index.js';
import { calibrateEachCapture } from '../../src/cli/watchCalibration.js';
import { makeTempDir, removeTempDir } from '../records/helpers/tempData.js';
import { makeDrop, startSession, waitFor } from './helpers/session.js';

let root: string;
let drop: string;
beforeEach(() => {
  root = makeTempDir('benchproof-watchcal-');
  drop = makeDrop(root);
});
afterEach(() => removeTempDir(root));

describe('watch --calibrate', { timeout: 180_000 }, () => {
  it('places each landed capture at its step and stores the full set as one iteration with guidance', async () => {
    const data = join(root, 'data');
    const s = startSession(root, { onCapture: calibrateEachCapture('FK-0104', { data }, 'as built', 'R12 replaced') });
    await s.ready;
    const files = readdirSync('samples/calibration/before').sort();
    for (const [i, f] of files.entries()) {
      copyFileSync(join('samples/calibration/before', f), join(drop, f));
      await waitFor(() => s.lines().filter((l) => l.startsWith('FK-0104_cv')).length >= i + 1, `step line ${i + 1}`, s.err);
    }
    await waitFor(() => s.out().includes('iteration 1 of calibration run #1'), 'the iteration', s.err);
    await s.stop();
    expect(s.lines()[0]).toMatch(/^FK-0104_cv0\.csv {2}FK-0104 {2}step 0 {2}−\d+\.\d cents {2}FAIL {2}\(waiting for 1, 2, 3, 4, 5\)$/);
    expect(s.out()).toContain('scale: raise by');
    const store = openStore(data, { mode: 'read' });
    try {
      const runs = store.calibrations('FK-0104');
      expect(runs).toHaveLength(1);
      expect(runs[0].iterations).toHaveLength(1);
      expect(runs[0].iterations[0].result.steps).toHaveLength(6);
      expect(runs[0].iterations[0].captures).toHaveLength(6);
      expect(runs[0].iterations[0].result.note).toBe('R12 replaced');
    } finally {
      store.close();
    }
  });
});
