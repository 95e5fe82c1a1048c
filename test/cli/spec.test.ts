import { describe, it, expect, beforeAll } from 'vitest';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { runCli } from '../helpers/cliHarness.js';
import { tempFolder } from '../helpers/tempFolders.js';

const SPEC = 'samples/fh210-spec.yaml';
const unitFiles = (serial: string): string[] => ['low', 'mid', 'high'].map((c) => `samples/captures/${serial}_${c}.csv`);
let dir = '';

beforeAll(() => {
  dir = tempFolder('benchproof-spec-');
});

describe('benchproof spec validate', () => {
  it('exits 0 and summarises a valid spec on stdout', async () => {
    const r = await runCli(['spec', 'validate', SPEC]);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    expect(r.stdout).toBe('samples/fh210-spec.yaml: valid: FH-210 Kestrel VCO rev C, 2 outputs, 3 conditions, 24 checks (guarded decisions)\n');
  });

  it('prints the validated spec as one JSON document with --json', async () => {
    const r = await runCli(['spec', 'validate', SPEC, '--json']);
    const doc = JSON.parse(r.stdout);
    expect([doc.schemaVersion, doc.valid, doc.spec.conditions.length]).toEqual([1, true, 3]);
  });

  it('exits 2 and lists every problem with its path and line', async () => {
    const bad = join(dir, 'bad.yaml');
    writeFileSync(bad, 'name: x\nrevision: A\noutputs:\n  tri:\n    channel: 1\n    shape: triangel\n    checks:\n      - measure: frequency\n        nominal: 100 Hz\n');
    const r = await runCli(['spec', 'validate', bad]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr.replaceAll(bad, 'bad.yaml')).toMatchInlineSnapshot(`
      "bad.yaml: 2 problems in the spec
        expected: a spec whose every field is valid (listed below with their lines)
        fix: correct each one, then run \`benchproof spec validate bad.yaml\`
      bad.yaml:6: outputs.tri.shape: "triangel" is not valid here
        expected: one of sine, triangle, square, pulse, sawtooth, unknown
        fix: did you mean "triangle"?
      bad.yaml:8: outputs.tri.checks[0]: nominal 100 Hz has no tolerance
        expected: min, max, or nominal with tolerance
        fix: add \`tolerance:\` (e.g. "2 %"), or give min/max
      "
    `);
  });
});

describe('benchproof spec usage', () => {
  it('exits 2 without a command, and suggests the nearest one when it is misspelt', async () => {
    expect((await runCli(['spec'])).code).toBe(2);
    const r = await runCli(['spec', 'validat', SPEC]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatchInlineSnapshot(`
      "-: spec has no command "validat"
        expected: benchproof spec validate FILE, or benchproof spec init --from CAPTURE… -o FILE
        fix: did you mean \`benchproof spec validate\`?
      "
    `);
  });
});

describe('benchproof spec init', () => {
  it('drafts a spec from a good unit that passes it and fails a faulty unit with the right cause first', async () => {
    const out = join(dir, 'kestrel.yaml');
    const init = await runCli(['spec', 'init', '--from', ...unitFiles('FK-0101'), '--tolerance', '2%', '--out', out]);
    expect(init.code).toBe(0);
    expect(init.stdout).toBe('');
    expect(init.stderr).toContain(`wrote ${out}: 2 outputs, 3 conditions`);
    expect(readFileSync(out, 'utf8')).toContain('pattern: "{unit}_{condition}.csv"');
    const good = await runCli(['check', ...unitFiles('FK-0101'), '--spec', out]);
    expect(good.stdout).toMatch(/^✓ PASS {2}FK-0101 · /);
    expect(good.code).toBe(0);
    const faulty = await runCli(['check', ...unitFiles('FK-0104'), '--spec', out, '--json']);
    expect(faulty.code).toBe(1);
    expect(JSON.parse(faulty.stdout).units[0].diagnosis.causes[0].id).toBe('timing-scale');
  });

  it('never overwrites an existing file without --force', async () => {
    const out = join(dir, 'exists.yaml');
    writeFileSync(out, 'my own notes\n');
    const r = await runCli(['spec', 'init', '--from', 'samples/captures/FK-0101_mid.csv', '-o', out]);
    expect(r.code).toBe(2);
    expect(readFileSync(out, 'utf8')).toBe('my own notes\n');
    expect(r.stderr).toContain('the output file exists already and is left untouched');
    const forced = await runCli(['spec', 'init', '--from', 'samples/captures/FK-0101_mid.csv', '-o', out, '--force']);
    expect(forced.code).toBe(0);
    expect(readFileSync(out, 'utf8')).toContain('benchproof spec init');
  });

  it('exits 2 for a tolerance that is not a percentage, writing nothing', async () => {
    const out = join(dir, 'never.yaml');
    const r = await runCli(['spec', 'init', '--from', 'samples/captures/FK-0101_mid.csv', '--tolerance', '2', '-o', out]);
    expect(r.code).toBe(2);
    expect(existsSync(out)).toBe(false);
    expect(r.stderr).toMatchInlineSnapshot(`
      "-: --tolerance got "2", which is not a percentage between 0 and 100
        expected: a percentage such as 2% or 1.5 %
        fix: write --tolerance 2%
      "
    `);
  });

  it('exits 2 when no output file is given', async () => {
    const r = await runCli(['spec', 'init', '--from', 'samples/captures/FK-0101_mid.csv']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('spec init needs a file to write the spec to');
  });
});
