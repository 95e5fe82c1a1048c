/**
 * Spec validation against what no capture can ever satisfy (issue 22): a file-name pattern with a
 * folder part or "..", and nominals a quantity cannot physically take (duty cycle outside 0–100 %
 * by its definition in IEEE Std 181-2011 §3.1; a negative frequency). Each is a spec problem with its
 * line, exit 2. And a spec near the 1 MiB limit with thousands of conditions is validated (its keys
 * checked for duplicates with one set per map, not pairwise); speed itself is not asserted here.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { runCli } from '../helpers/cliHarness.js';
import { makeTempDir, removeTempDir } from '../records/helpers/tempData.js';

const SAMPLE = readFileSync('samples/fh210-spec.yaml', 'utf8');
let root: string;
beforeAll(() => {
  root = makeTempDir();
});
afterAll(() => removeTempDir(root));

async function validate(name: string, text: string): Promise<{ code: number; stderr: string }> {
  const file = join(root, name);
  writeFileSync(file, text);
  return runCli(['spec', 'validate', file]);
}

describe('spec validate refuses what can never match or never be met', () => {
  it.each(['../{unit}_{condition}.csv', 'captures/{unit}_{condition}.csv', '{unit}..{condition}.csv'])('refuses the pattern %s with its line', async (pattern) => {
    const r = await validate('pattern.yaml', SAMPLE.replace('pattern: "{unit}_{condition}.csv"', `pattern: "${pattern}"`));
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/pattern\.yaml:14: captures\.pattern: it holds/);
  });

  it('refuses a duty-cycle nominal of 500 % with its line', async () => {
    const r = await validate('duty.yaml', SAMPLE.replace('nominal: 50 %', 'nominal: 500 %'));
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('a nominal of 500 is impossible for dutyCycle, which is always at least 0 and at most 100');
    expect(r.stderr).toMatch(/duty\.yaml:\d+:/);
  });

  it('refuses a negative frequency nominal', async () => {
    const r = await validate('negative.yaml', SAMPLE.replace('nominal: 65.41 Hz', 'nominal: -65.41 Hz'));
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('impossible for frequency');
  });

  it('still accepts the shipped sample spec', async () => {
    const r = await validate('ok.yaml', SAMPLE);
    expect(r.code).toBe(0);
  });
});

describe('spec validate on large specs', () => {
  /** A spec with n conditions, each with its own frequency nominal. */
  const many = (n: number): string => {
    const lines = Array.from({ length: n }, (_, i) => `  c${i}:\n    setting: control voltage ${i} mV\n    expect:\n      triangle: { frequency: { nominal: ${100 + i} Hz } }\n      pulse: { frequency: { nominal: ${100 + i} Hz } }`);
    return `${SAMPLE.slice(0, SAMPLE.indexOf('conditions:'))}conditions:\n${lines.join('\n')}\n`;
  };

  it('validates a spec of several thousand conditions under the size limit', async () => {
    const text = many(4000);
    expect(Buffer.byteLength(text)).toBeLessThan(1 << 20);
    const r = await validate('many.yaml', text);
    expect(r.stderr).not.toContain('internal error');
    expect(r.code).toBe(0);
  });
});
