import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Papa from 'papaparse';
import { runCli } from '../helpers/cliHarness.js';
import { expectWithin } from '../helpers/expectWithin.js';

// One capture of the demo scenario (samples/: FK-0104, condition mid, triangle output on CH1, a
// frequency that fails its limits, so the default check view shows it too), rendered by every
// report kind: measure, check (default, --detail, --json), record (Markdown, HTML, JSON, CSV) and
// batch (Markdown, HTML, JSON, CSV). The expected text is built here from JCGM 100:2008 (GUM):
// U = k·u with k = 2 (§6.2.1), rounded UP to two significant digits, the value to the same
// decimal place (§7.2.6), independently of src/types/quantityText.ts.
const files = ['low', 'mid', 'high'].map((c) => `samples/captures/FK-0104_${c}.csv`);
const SPEC = 'samples/fh210-spec.yaml';
let data: string;
const env = (): { env: Record<string, string> } => ({ env: { BENCHPROOF_DATA: data, COLUMNS: '80' } });

let value = 0;
let u = 0;
/** The expected shown U and text, e.g. '0.012' and '246.724 Hz ± 0.012 Hz' (values below 1000 Hz). */
function expected(): { U: string; text: string } {
  const U = 2 * u;
  const decimals = 1 - Math.floor(Math.log10(U));
  const shownU = (Math.ceil(U * 10 ** decimals - 1e-9) / 10 ** decimals).toFixed(decimals);
  return { U: shownU, text: `${value.toFixed(decimals)} Hz ± ${shownU} Hz` };
}
const squeeze = (s: string): string => s.replace(/[ \t]+/g, ' ');

interface Check { condition: string; output: string; measurement: string; value: number; expandedUncertainty: number }
const midFrequency = (checks: readonly Check[]): Check => checks.find((k) => k.condition === 'mid' && k.output === 'triangle' && k.measurement === 'frequency')!;

beforeAll(async () => {
  data = mkdtempSync(join(tmpdir(), 'benchproof-consistency-'));
  const stored = await runCli(['check', ...files, '--spec', SPEC], env());
  expect(stored.code).toBe(1);
  const measured = await runCli(['measure', '--json', 'samples/captures/FK-0104_mid.csv'], env());
  const doc = JSON.parse(measured.stdout) as { channels: { name: string; measurements: Record<string, { value: number; uncertainty: number }> }[]; labels: Record<string, string> };
  const f = doc.channels.find((c) => c.name === 'CH1')!.measurements.frequency;
  value = f.value;
  u = f.uncertainty;
  expect(doc.labels.frequency).toBe('frequency');
});
afterAll(() => rmSync(data, { recursive: true, force: true }));

describe('one capture shows the same value, unit and labelled U in every report kind', () => {
  it('the shown U is never below the expanded uncertainty (GUM §7.2.6: rounded up)', () => {
    expect(Number(expected().U)).toBeGreaterThanOrEqual(2 * u);
    expect(Number(expected().U)).toBeLessThan(2 * u * 1.1 + 1e-12);
  });

  it('measure and the three check views write it alike, each saying the ± is U (k = 2)', async () => {
    const want = expected().text;
    const measure = await runCli(['measure', 'samples/captures/FK-0104_mid.csv'], env());
    expect(squeeze(measure.stdout)).toContain(`frequency ${want}`);
    expect(measure.stdout).toContain('± is U (k = 2)');
    const brief = await runCli(['check', '--no-store', ...files, '--spec', SPEC], env());
    expect(brief.stdout).toContain(`mid · triangle · frequency ${want},`);
    expect(brief.stdout).toContain('± is U (k = 2)');
    const detail = await runCli(['check', '--no-store', ...files, '--spec', SPEC, '--detail'], env());
    const block = detail.stdout.split('\n\n').find((b) => b.startsWith('mid · triangle'))!;
    expect(block).toContain(`frequency  ${want}`);
    expect(block).toContain('measured ± U (k = 2)');
    const json = JSON.parse((await runCli(['check', '--no-store', ...files, '--spec', SPEC, '--json'], env())).stdout) as { units: { verdict: { conditions: { checks: Check[] }[] } }[]; labels: Record<string, string> };
    const k = midFrequency(json.units[0].verdict.conditions.flatMap((c) => c.checks));
    expectWithin(k.value, value, { rel: 1e-12 }, 'the same capture measured twice');
    expectWithin(k.expandedUncertainty, 2 * u, { rel: 1e-12 }, 'GUM §6.2.1: U = k·u, k = 2');
    expect(json.labels.frequency).toBe('frequency');
  });

  it('the record writes it alike in Markdown, HTML, JSON and CSV, with the label table’s name', async () => {
    const want = expected().text;
    const md = await runCli(['record', 'FK-0104'], env());
    expect(md.stdout).toContain(`| triangle | frequency | ${want} |`);
    expect(md.stdout).toContain('measured (± U, k = 2)');
    const html = await runCli(['record', 'FK-0104', '--format', 'html'], env());
    expect(html.stdout).toContain(`>${want}<`);
    const json = JSON.parse((await runCli(['record', 'FK-0104', '--format', 'json'], env())).stdout) as { runs: { verdict: { conditions: { checks: Check[] }[] } }[]; labels: Record<string, string> };
    const k = midFrequency(json.runs[0].verdict.conditions.flatMap((c) => c.checks));
    expectWithin(k.value, value, { rel: 1e-12 }, 'the stored value is the measured one');
    expectWithin(k.expandedUncertainty, 2 * u, { rel: 1e-12 }, 'GUM §6.2.1: U = k·u, k = 2');
    expect(json.labels.frequency).toBe('frequency');
    const csv = Papa.parse<Record<string, string>>((await runCli(['record', 'FK-0104', '--format', 'csv'], env())).stdout.trim(), { header: true }).data;
    const row = csv.find((r) => r.condition === 'mid' && r.output === 'triangle' && r.measurement === 'frequency')!;
    expect(row.label).toBe('frequency');
    expect(row.unit_si).toBe('Hz');
    expect(Number(row.value)).toBe(value);
    expect(Number(row.expanded_uncertainty)).toBe(2 * u);
    expect(row.shown).toBe(want);
  });

  it('the batch report shows that one unit’s value as the mean, in the same unit and under the same name, in every format', async () => {
    // One unit in the store: the mean is its value; shown to six significant digits (no U: a statistic of units).
    const six = `${value.toPrecision(6)} Hz`;
    const md = await runCli(['batch'], env());
    expect(md.stdout).toContain(`| mid | triangle | frequency | 1 | ${six} | — | ${six} | ${six} |`);
    const html = await runCli(['batch', '--format', 'html'], env());
    expect(html.stdout).toContain(`>${six}<`);
    const json = JSON.parse((await runCli(['batch', '--format', 'json'], env())).stdout) as { specs: { measurements: { condition: string; output: string; measurement: string; mean: number; unit: string }[] }[]; labels: Record<string, string> };
    const m = json.specs[0].measurements.find((x) => x.condition === 'mid' && x.output === 'triangle' && x.measurement === 'frequency')!;
    expect(m.mean).toBe(value);
    expect(m.unit).toBe('Hz');
    expect(json.labels.frequency).toBe('frequency');
    const csv = Papa.parse<Record<string, string>>((await runCli(['batch', '--format', 'csv'], env())).stdout.trim(), { header: true }).data;
    const row = csv.find((r) => r.condition === 'mid' && r.output === 'triangle' && r.measurement === 'frequency')!;
    expect(row.label).toBe('frequency');
    expect(row.unit).toBe('Hz');
    expect(Number(row.mean)).toBe(value);
  });
});
