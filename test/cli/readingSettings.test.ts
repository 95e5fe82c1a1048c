/** Reading settings under `captures.reading` in a spec, and their checks (issue 14). */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll } from 'vitest';
import { parseSpec } from '../../src/design/index.js';
import { readingSettings } from '../../src/capture/index.js';
import { parse } from 'yaml';
import { runCli } from '../helpers/cliHarness.js';

const dir = mkdtempSync(join(tmpdir(), 'benchproof-reading-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const sample = readFileSync('samples/fh210-spec.yaml', 'utf8');
const withReading = (reading: string): string => sample.replace('  pattern: "{unit}_{condition}.csv"', `  pattern: "{unit}_{condition}.csv"\n  reading: ${reading}`);

describe('captures.reading in a spec', () => {
  it('parses into the spec’s reading settings, checked by the capture reader’s rules', () => {
    const spec = parseSpec(withReading('{ delimiter: comma, headerRows: 1, scale: { CH1: 1 } }'), 'kestrel.yaml');
    expect(spec.reading).toEqual({ delimiter: ',', headerRows: 1, scale: { CH1: 1 } });
    expect(() => parseSpec(withReading('{ delimiter: pipe, colour: red }'), 'kestrel.yaml')).toThrow(/captures\.reading\.delimiter: "pipe" is not a delimiter/);
  });

  it('reads every capture of a check with them: a scale of 2 doubles the triangle and fails its amplitude', async () => {
    const path = join(dir, 'kestrel.yaml');
    writeFileSync(path, withReading('{ scale: { CH1: 2 } }'));
    const files = ['low', 'mid', 'high'].map((c) => `samples/captures/FK-0101_${c}.csv`);
    const plain = await runCli(['check', ...files, '--spec', 'samples/fh210-spec.yaml', '--json', '--no-store']);
    const scaled = await runCli(['check', ...files, '--spec', path, '--json', '--no-store']);
    const p2p = (out: string): string[] =>
      (JSON.parse(out) as { units: { verdict: { conditions: { checks: { output: string; measurement: string; statement: string }[] }[] } }[] }).units[0].verdict.conditions
        .flatMap((c) => c.checks)
        .filter((c) => c.output === 'triangle' && c.measurement === 'peakToPeak')
        .map((c) => c.statement);
    expect(p2p(plain.stdout)).toEqual(['pass', 'pass', 'pass']);
    expect(p2p(scaled.stdout)).toEqual(['fail', 'fail', 'fail']);
    expect(scaled.code).toBe(1);
    // Each capture's stored layout names the settings it was read with.
    const layouts = (JSON.parse(scaled.stdout) as { units: { verdict: { captures: { layout: string }[] } }[] }).units[0].verdict.captures.map((c) => c.layout);
    expect(layouts.every((l) => l.endsWith(`read with profile ${path} captures.reading`))).toBe(true);
  });

  it('accepts the reading profile the README shows, as written', () => {
    const readme = readFileSync('README.md', 'utf8');
    const start = readme.indexOf('```yaml\nreading: 1');
    expect(start).toBeGreaterThan(0);
    const text = readme.slice(start + '```yaml\n'.length, readme.indexOf('```', start + 7));
    expect(readingSettings(parse(text), 'README.md')).toMatchObject({ delimiter: '\t', decimalMark: ',', headerRows: 2, timeColumn: 1, interval: 2e-6 });
  });
});
