/**
 * The re-test flow on the command line: `compare` of a unit's attempts, and a calibration between
 * two checks (its note stored, the hint to re-check, the record saying its status predates the trim).
 * Captures are the shipped demo files (invented scenario): FK-0104 has its timing capacitor 6 % high
 * and fails; samples/calibration/after holds its captures after trimming, which meet the limits.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import { openStore } from '../../src/records/index.js';
import { makeTempDir, removeTempDir } from '../records/helpers/tempData.js';
import { runCli } from '../helpers/cliHarness.js';

const SPEC = 'samples/fh210-spec.yaml';
const captures = (unit: string): string[] => ['low', 'mid', 'high'].map((c) => `samples/captures/${unit}_${c}.csv`);
let root: string;
let data: string;
beforeEach(() => {
  root = makeTempDir('benchproof-compare-');
  data = join(root, 'data');
});
afterEach(() => removeTempDir(root));

describe('benchproof compare', () => {
  it('refuses a unit with one attempt, naming what it has', async () => {
    await runCli(['check', ...captures('FK-0104'), '--spec', SPEC, '--data', data]);
    const r = await runCli(['compare', 'FK-0104', '--data', data]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatchInlineSnapshot(`
      "-: FK-0104 has 1 test attempt(s); a comparison needs two
        expected: two of its attempt numbers: 1
        fix: test FK-0104 again (benchproof check … --note "what was changed"), then compare
      "
    `);
  });

  it('compares the last two attempts by default and writes HTML with --out', async () => {
    await runCli(['check', ...captures('FK-0104'), '--spec', SPEC, '--data', data]);
    await runCli(['check', ...captures('FK-0104'), '--spec', SPEC, '--data', data, '--new-attempt']);
    const r = await runCli(['compare', 'FK-0104', '--data', data]);
    expect(r.code).toBe(0);
    // The same captures twice: nothing moves, and the text says so.
    expect(r.stdout).toContain('What changed\n  nothing beyond the measurement uncertainty\n');
    const html = await runCli(['compare', 'FK-0104', '1', '2', '--data', data, '--format', 'html', '--out', join(root, 'cmp.html')], { cwd: root });
    expect(html.code).toBe(0);
    expect(html.stderr).toContain('wrote the comparison of attempts #1 and #2 of FK-0104 to');
  });
});

describe('a calibration between two checks', () => {
  it('stores the note, hints at a re-check, and the next check opens a new attempt after the calibration', async () => {
    await runCli(['check', 'samples/captures/FK-0104_mid.csv', '--spec', SPEC, '--data', data]);
    const after = readdirSync('samples/calibration/after').filter((n) => n.startsWith('FK-0104')).map((n) => `samples/calibration/after/${n}`);
    const cal = await runCli(['calibrate', '--spec', SPEC, '--unit', 'FK-0104', '--note', 'scale trimmer turned', '--data', data, ...after]);
    expect(cal.code).toBe(0);
    expect(cal.stderr).toContain('next: re-check the unit: capture it at every condition, then benchproof check FK-0104_low.csv FK-0104_mid.csv FK-0104_high.csv --spec samples/fh210-spec.yaml');
    const md = await runCli(['record', 'FK-0104', '--data', data]);
    expect(md.stdout).toMatch(/The unit met its calibration limits on .+, after its latest check: the status above predates the trim; re-check the unit/);
    expect(md.stdout).toContain('What was done before it: scale trimmer turned');
    const html = await runCli(['record', 'FK-0104', '--format', 'html', '--data', data]);
    expect(html.stdout).toContain('<p class="attempt-note">What was done before it: scale trimmer turned</p>');
    // The attempt waiting for low and high is closed by the calibration: the next check starts attempt #2.
    const again = await runCli(['check', 'samples/captures/FK-0104_low.csv', '--spec', SPEC, '--data', data]);
    expect(again.stderr).toContain('stored run 2 of FK-0104, attempt #2 (');
    const store = openStore(data, { mode: 'read' });
    try {
      expect(store.calibrations('FK-0104')[0].iterations[0].result.note).toBe('scale trimmer turned');
      expect(store.unitRecord('FK-0104')!.attempts!.map((a) => a.reason)).toEqual(['first', 'after-calibration']);
    } finally {
      store.close();
    }
  });
});
