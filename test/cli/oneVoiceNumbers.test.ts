import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from '../helpers/cliHarness.js';
import { expectWithin } from '../helpers/expectWithin.js';

// One capture of the demo scenario (samples/: FK-0101, condition mid, triangle output on CH1) shown by
// every report kind. The expected text is built here, independently of src/types/quantityText.ts, from
// JCGM 100:2008 (GUM) §7.2.6: U = k·u with k = 2 (§6.2.1), rounded UP to two significant digits, the
// value rounded to the same decimal place.
const files = ['low', 'mid', 'high'].map((c) => `samples/captures/FK-0101_${c}.csv`);
let data: string;
const env = (): { env: Record<string, string> } => ({ env: { BENCHPROOF_DATA: data } });

/** '261.829 Hz ± 0.012 Hz' for a value below 1000 Hz, by the GUM rule above. */
function expectedText(value: number, u: number): string {
  const U = 2 * u;
  const decimals = 1 - Math.floor(Math.log10(U));
  const shownU = (Math.ceil(U * 10 ** decimals - 1e-9) / 10 ** decimals).toFixed(decimals);
  return `${value.toFixed(decimals)} Hz ± ${shownU} Hz`;
}

const squeeze = (s: string): string => s.replace(/[ \t]+/g, ' ');

let value = 0;
let u = 0;
beforeAll(async () => {
  data = mkdtempSync(join(tmpdir(), 'benchproof-one-voice-'));
  const stored = await runCli(['check', ...files, '--spec', 'samples/fh210-spec.yaml'], env());
  expect(stored.code).toBe(0);
  const measured = await runCli(['measure', '--json', 'samples/captures/FK-0101_mid.csv'], env());
  const doc = JSON.parse(measured.stdout) as { channels: { name: string; measurements: Record<string, { value: number; uncertainty: number }> }[] };
  const f = doc.channels.find((c) => c.name === 'CH1')!.measurements.frequency;
  value = f.value;
  u = f.uncertainty;
});
afterAll(() => rmSync(data, { recursive: true, force: true }));

describe('one capture reads the same in every report', () => {
  it('measure, check, the Markdown and HTML records show the same value, unit and U (k = 2), labelled', async () => {
    const want = expectedText(value, u);
    const measure = await runCli(['measure', 'samples/captures/FK-0101_mid.csv'], env());
    const check = await runCli(['check', '--no-store', ...files, '--spec', 'samples/fh210-spec.yaml', '--detail'], env());
    const md = await runCli(['record', 'FK-0101'], env());
    const html = await runCli(['record', 'FK-0101', '--format', 'html'], env());
    const measureLine = measure.stdout.split('\n').find((l) => /^\s+frequency\s/.test(l))!;
    expect(squeeze(measureLine).trim()).toBe(`frequency ${want}`);
    expect(measure.stdout).toContain('± is U (k = 2)');
    const midTriangle = check.stdout.split('\n\n').find((b) => b.includes('mid · triangle'))!;
    expect(squeeze(midTriangle)).toContain(`frequency ${want}`);
    expect(midTriangle).toContain('measured ± U (k = 2)');
    expect(md.stdout).toContain(`| triangle | frequency | ${want} |`);
    expect(md.stdout).toContain('measured (± U, k = 2)');
    expect(html.stdout).toContain(`>${want}<`);
  });

  it('the JSON documents carry the same value and an expanded U of exactly 2u', async () => {
    const check = await runCli(['check', '--no-store', ...files, '--spec', 'samples/fh210-spec.yaml', '--json'], env());
    const doc = JSON.parse(check.stdout) as { units: { verdict: { conditions: { condition: string; checks: { output: string; measurement: string; value: number; expandedUncertainty: number }[] }[] } }[] };
    const k = doc.units[0].verdict.conditions.find((c) => c.condition === 'mid')!.checks.find((c) => c.output === 'triangle' && c.measurement === 'frequency')!;
    expectWithin(k.value, value, { rel: 1e-12 }, 'the same capture measured twice');
    expectWithin(k.expandedUncertainty, 2 * u, { rel: 1e-12 }, 'GUM §6.2.1: U = k·u, k = 2');
  });

  it('the batch report shows that one unit’s value as the mean, in the same unit, six significant digits', async () => {
    const md = await runCli(['batch'], env());
    const html = await runCli(['batch', '--format', 'html'], env());
    const want = `${value.toPrecision(6)} Hz`;
    expect(md.stdout).toContain(`| mid | triangle | frequency | 1 | ${want} | — | ${want} | ${want} |`);
    expect(html.stdout).toContain(`>${want}<`);
  });
});
