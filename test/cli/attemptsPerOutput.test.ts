/**
 * With one file per output (pattern `{unit}_{condition}_{output}.csv`), an output not captured yet at
 * a captured condition is waited for too: the unit is INCOMPLETE and names it, never NOT MEASURED.
 * The single-output files are the shipped FK-0101 captures split by column here (time with channel 1
 * for the triangle, with channel 2 for the pulse).
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { makeTempDir, removeTempDir } from '../records/helpers/tempData.js';
import { runCli } from '../helpers/cliHarness.js';

let root: string;
beforeEach(() => {
  root = makeTempDir('benchproof-per-output-');
  const spec = readFileSync('samples/fh210-spec.yaml', 'utf8').replace('pattern: "{unit}_{condition}.csv"', 'pattern: "{unit}_{condition}_{output}.csv"');
  writeFileSync(join(root, 'spec.yaml'), spec);
  for (const condition of ['low', 'mid', 'high']) {
    const rows = readFileSync(`samples/captures/FK-0101_${condition}.csv`, 'utf8').trim().split('\n').map((l) => l.split(','));
    writeFileSync(join(root, `FK-0101_${condition}_triangle.csv`), `${rows.map((r) => `${r[0]},${r[1]}`).join('\n')}\n`);
    writeFileSync(join(root, `FK-0101_${condition}_pulse.csv`), `${rows.map((r) => `${r[0]},${r[2]}`).join('\n')}\n`);
  }
});
afterEach(() => removeTempDir(root));

describe('attempts with one file per output', () => {
  it('waits for an output missing at a captured condition, and completes once it lands', async () => {
    const data = join(root, 'data');
    const at = { cwd: root };
    const one = await runCli(['check', 'FK-0101_mid_triangle.csv', '--spec', 'spec.yaml', '--data', data, '--json'], at);
    expect(one.code).toBe(4);
    expect(JSON.parse(one.stdout).units[0]).toMatchObject({ state: 'incomplete', waitingFor: ['low', 'mid (pulse)', 'high'], statement: 'not-measured' });
    const rest = ['low', 'high'].flatMap((c) => [`FK-0101_${c}_triangle.csv`, `FK-0101_${c}_pulse.csv`]);
    const two = await runCli(['check', ...rest, '--spec', 'spec.yaml', '--data', data, '--summary'], at);
    expect(two.code).toBe(4);
    expect(two.stdout).toMatch(/^FK-0101 {2}… INCOMPLETE +waiting for mid \(pulse\); so far PASS/);
    const three = await runCli(['check', 'FK-0101_mid_pulse.csv', '--spec', 'spec.yaml', '--data', data, '--summary'], at);
    expect(three.code).toBe(0);
    expect(three.stdout).toMatch(/^FK-0101 {2}✓ PASS +0 of 24 checks not passed/);
    expect(three.stderr).toContain('stored run 3 of FK-0101, attempt #1 (PASS)');
  });
});
