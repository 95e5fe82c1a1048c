/**
 * `check --summary` on the demo captures (invented scenario, src/syntheticCaptures/scenario.ts): one line per
 * unit with its statement, the checks not passed and the first likely cause.
 */
import { describe, it, expect } from 'vitest';
import { readdirSync } from 'node:fs';
import { runCli } from '../helpers/cliHarness.js';

const captures = readdirSync('samples/captures').map((f) => `samples/captures/${f}`);

describe('benchproof check --summary', () => {
  it('prints one line per unit with its statement and first likely cause, and exits 1 when any unit fails', async () => {
    const r = await runCli(['check', ...captures, '--spec', 'samples/fh210-spec.yaml', '--summary', '--no-store'], { env: { COLUMNS: '200' } });
    expect(r.code).toBe(1);
    const lines = r.stdout.trim().split('\n');
    expect(lines).toHaveLength(7);
    expect(lines[0]).toMatch(/^FK-0101 {2}✓ PASS +0 of 24 checks not passed$/);
    expect(lines[6]).toBe('6 units: 2 ✓ PASS, 4 ✗ FAIL');
    expect(lines.find((l) => l.startsWith('FK-0104'))).toMatch(/FAIL .* likely cause: timing capacitor off its value$/);
    // FK-0105's triangle sits flat at 2.55 V inside the scope's ±10 V: the circuit saturates (issue 15), a FAIL.
    expect(lines.find((l) => l.startsWith('FK-0105'))).toMatch(/FAIL .* likely cause: output stage or rail saturation/);
  });

  it('exits 0 with only good units', async () => {
    const good = captures.filter((f) => /FK-010[12]_/.test(f));
    const r = await runCli(['check', ...good, '--spec', 'samples/fh210-spec.yaml', '--summary', '--no-store']);
    expect(r.code).toBe(0);
    expect(r.stdout.trim().split('\n').filter((l) => l.startsWith('FK-')).map((l) => l.split(/\s+/)[2])).toEqual(['PASS', 'PASS']);
  });
});
