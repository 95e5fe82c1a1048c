import { describe, it, expect, beforeAll } from 'vitest';
import { copyFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { runCli } from '../helpers/cliHarness.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { tempFolder } from '../helpers/tempFolders.js';

// Demo captures (invented scenario, src/syntheticCaptures/scenario.ts) and the demo spec in samples/.
const SPEC = 'samples/fh210-spec.yaml';
const unitFiles = (serial: string): string[] => ['low', 'mid', 'high'].map((c) => `samples/captures/${serial}_${c}.csv`);

let dir = '';
/** A spec that checks only the triangle's frequency at mid, with the given limit lines. */
function triangleSpec(name: string, limit: string): string {
  const path = join(dir, name);
  writeFileSync(path, `name: FH-210 Kestrel VCO\nrevision: C\noutputs:\n  triangle:\n    channel: 1\n    checks:\n      - measure: frequency\n${limit}\nconditions:\n  mid: {}\n`);
  return path;
}

beforeAll(() => {
  dir = tempFolder('benchproof-check-');
});

describe('benchproof check on the demo captures', () => {
  it('exits 0 and prints PASS for a good unit', async () => {
    const r = await runCli(['check', '--no-store', ...unitFiles('FK-0101'), '--spec', SPEC, '--detail']);
    expect(r.stderr).toBe('');
    expect(r.stdout).toContain('FK-0101: ✓ PASS');
    expect(r.code).toBe(0);
  });

  it('exits 1 for a unit with a large timing capacitor, naming it as the first likely cause', async () => {
    const r = await runCli(['check', '--no-store', ...unitFiles('FK-0104'), '--spec', SPEC, '--detail']);
    expect(r.code).toBe(1);
    expect(r.stdout).toMatch(/frequency +61\.70\d+ Hz ± [\d.]+ Hz +64\.42\d+ Hz … 66\.39\d+ Hz +−2\.7\d Hz +✗ FAIL/);
    expect(r.stdout).toMatch(/Likely causes\n {2}1\. timing capacitor off its value/);
    expect(r.stdout).toMatch(/· timing capacitor, effective: 4\.98\d+ nF ± 0\.\d+ nF \(U, k = 2\) against 4\.7 nF design \(4\.465 nF … 4\.935 nF\) \(\+[56]\.\d\d %\), above its tolerance/);
    expect(r.stdout).toContain('the captures cannot tell it from: reference current off (both currents by the same ratio)');
    expect(r.stdout).toContain('FK-0104: ✗ FAIL');
  });

  it('shows the circuit view block with the back-computed figures when the spec has a design section', async () => {
    const r = await runCli(['check', '--no-store', ...unitFiles('FK-0104'), '--spec', SPEC, '--detail']);
    const block = r.stdout.slice(r.stdout.indexOf('Circuit view'), r.stdout.indexOf('Likely causes'));
    expect(block).toMatch(/ {2}mid\n {4}figure +from the captures +design +deviation +note\n/);
    expect(block).toMatch(/timing capacitance, I\/\(dV\/dt\) from both ramps +4\.98\d nF ± 0\.0\d+ nF +4\.7 nF ± 0\.24 nF \(5 %\) +\+[56]\.\d\d % outside/);
    expect(block).toMatch(/· charging at 13\.9\d µA ± 0\.81 µA \(U, k = 2\), discharging at 13\.9\d µA ± 0\.81 µA \(U, k = 2\) \(taking C from the design\): matched within 0\.\d %/);
    expect(block).toMatch(/· frequency 246\.724 Hz ± 0\.012 Hz \(U, k = 2\) measured against 261\.7\d* Hz from the design values \(−5\.7 %\)/);
  });

  it('checks several units in one run, grouped by unit, and prints one JSON document with --json', async () => {
    const r = await runCli(['check', '--no-store', ...unitFiles('FK-0103'), ...unitFiles('FK-0106'), '--spec', SPEC, '--json']);
    expect(r.code).toBe(1);
    expect(r.stderr).toBe('');
    const doc = JSON.parse(r.stdout);
    expect(doc.schemaVersion).toBe(1);
    expect(doc.spec.name).toBe('FH-210 Kestrel VCO');
    expect(doc.units.map((u: { unit: string }) => u.unit)).toEqual(['FK-0103', 'FK-0106']);
    const mirror = doc.units[0];
    expect(mirror.diagnosis.causes[0].id).toBe('current-mirror');
    const mid = mirror.diagnosis.circuit.find((v: { condition: string }) => v.condition === 'mid');
    const charge = mid.figures.find((f: { id: string }) => f.id === 'chargeCurrent');
    // FK-0103: rise share 1/(1 + 1.0833) at 261.63 Hz, C = 4.7 nF, 6 Vpp; I = C·Vpp·f/r (capacitor law).
    expectWithin(charge.value, (4.7e-9 * 6 * 261.63 * 2.0833), { rel: 0.01 }, 'planted scenario FK-0103, capacitor law');
    expect(charge).toMatchObject({ unit: 'A', withinTolerance: false });
    const ratio = mirror.verdict.conditions[1].checks.find((c: { measurement: string; output: string }) => c.measurement === 'slopeRatio');
    expect(ratio).toMatchObject({ output: 'triangle', condition: 'mid', statement: 'fail', lower: 0.97, upper: 1.03, nominal: 1 });
    expect(doc.units[1].diagnosis.causes[0].id).toBe('switching-delay');
  });
});

describe('benchproof check decisions and exit codes', () => {
  it('allows a conditional pass (exit 0, flagged on stderr) unless --strict (exit 1)', async () => {
    const probe = await runCli(['check', '--no-store', 'samples/captures/FK-0101_mid.csv', '--spec', triangleSpec('wide.yaml', '        nominal: 261.63 Hz\n        tolerance: 10 %'), '--json']);
    const f = JSON.parse(probe.stdout).units[0].verdict.conditions[0].checks[0];
    // Upper limit half a guard band above the measured value: ILAC-G8 §4.2.3 conditional pass.
    const tight = triangleSpec('tight.yaml', `        max: ${f.value + f.expandedUncertainty / 2} Hz`);
    const loose = await runCli(['check', '--no-store', 'samples/captures/FK-0101_mid.csv', '--spec', tight]);
    expect(loose.code).toBe(0);
    expect(loose.stdout).toContain('COND. PASS');
    expect(loose.stderr).toBe(`note: FK-0101 passed conditionally: a value lies within its uncertainty of a limit in ${tight}; --strict would fail it\n`);
    const strict = await runCli(['check', '--no-store', 'samples/captures/FK-0101_mid.csv', '--spec', tight, '--strict']);
    expect(strict.code).toBe(1);
  });

  it('reports a unit with conditions not captured yet as INCOMPLETE, and exits 1 when what was captured already failed', async () => {
    const r = await runCli(['check', '--no-store', 'samples/captures/FK-0104_mid.csv', '--spec', SPEC, '--detail']);
    expect(r.code).toBe(1);
    expect(r.stdout).toContain('low  waiting for a capture: not checked yet');
    expect(r.stdout).toMatch(/FK-0104: … INCOMPLETE, waiting for low, high {2}\(so far FAIL: 2 failed/);
  });

  it('takes the unit and condition from --unit and --condition for a file named otherwise', async () => {
    const odd = join(dir, 'scope-export-07.csv');
    copyFileSync('samples/captures/FK-0101_mid.csv', odd);
    const spec = triangleSpec('mid-only.yaml', '        nominal: 261.63 Hz\n        tolerance: 1.5 %');
    const r = await runCli(['check', '--no-store', odd, '--spec', spec, '--unit', 'FK-0107', '--condition', 'mid', '--detail']);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('FK-0107: ✓ PASS');
  });
});

describe('benchproof check input errors', () => {
  it('exits 2 with the pattern it missed when a file name fits no unit and condition', async () => {
    const r = await runCli(['check', '--no-store', 'samples/captures/FK-0101-mid.csv', '--spec', SPEC]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatchInlineSnapshot(`
      "samples/captures/FK-0101-mid.csv: the file name "FK-0101-mid.csv" does not match the capture pattern "{unit}_{condition}.csv" of samples/fh210-spec.yaml
        expected: a name like "FK-0101_low.csv", with a condition among low, mid, high
        fix: rename the file to fit the pattern, or give --unit and --condition
      "
    `);
  });

  it('exits 2 listing every spec mistake with its path and line', async () => {
    const bad = join(dir, 'bad.yaml');
    writeFileSync(bad, 'name: x\nrevision: A\noutputs:\n  tri:\n    channel: 1\n    checks:\n      - measure: frequency\n        nominal: 2.5 kV\n        tolerance: 1 %\n      - measure: dutycycle\n        min: 48 %\n');
    const r = await runCli(['check', '--no-store', 'samples/captures/FK-0101_mid.csv', '--spec', bad]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr.replaceAll(bad, 'bad.yaml')).toMatchInlineSnapshot(`
      "bad.yaml: 2 problems in the spec
        expected: a spec whose every field is valid (listed below with their lines)
        fix: correct each one, then run \`benchproof spec validate bad.yaml\`
      bad.yaml:8: outputs.tri.checks[0].nominal: "2.5 kV" is in V, but frequency is in Hz
        expected: a value in Hz, e.g. "261.63 Hz"
        fix: write outputs.tri.checks[0].nominal as e.g. "261.63 Hz"
      bad.yaml:10: outputs.tri.checks[1].measure: "dutycycle" is not a measurement benchproof makes
        expected: one of frequency, period, peakToPeak, maximum, minimum, highLevel, lowLevel, amplitude, dcOffset, rms, acRms, riseSlope, fallSlope, slopeRatio, symmetry, linearity, dutyCycle, riseTime, fallTime, jitter, overshoot, undershoot, thd, snr, sinad, sfdr, enob, humFrequency, humLevel, shapeError, evenOddRatio, cycleToCycleJitter
        fix: did you mean "dutyCycle"?
      "
    `);
  });

  it('prints the error as one JSON object on stderr with --json, and nothing on stdout', async () => {
    const r = await runCli(['check', '--no-store', 'samples/captures/FK-0101_mid.csv', '--spec', join(dir, 'missing.yaml'), '--json']);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(JSON.parse(r.stderr).error).toMatchObject({ code: 'spec.unreadable', exitCode: 2 });
  });

  it('exits 2 when --spec is missing', async () => {
    const r = await runCli(['check', '--no-store', 'samples/captures/FK-0101_mid.csv']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain("required option '--spec <file>' not specified");
  });
});
