/**
 * The scope's full scale read from the vertical setting a capture's preamble states, and the
 * verdicts it enables: a trace clipped at the screen's edge is the scope's (NOT MEASURED, with the fix
 * to the vertical setting), a flat top well inside the range is the circuit's (FAIL, saturation the
 * top cause). Every file is written here (by hand, or from src/syntheticCaptures' samples); the
 * vocabularies are the general words bench instruments use (common practice, no source). Full scale =
 * centre ± volts per division × divisions / 2 (the screen's geometry, closed form). Demo figures are
 * ours: the FH-210 triangle ±3 V at 261.63 Hz and its 0/10 V pulse output.
 */
import { describe, expect, it } from 'vitest';
import { readCapture } from '../../src/capture/index.js';
import { readMetadata } from '../../src/capture/metadata.js';
import { synthesize, writeCsv } from '../../src/syntheticCaptures/index.js';
import type { SynthSpec } from '../../src/syntheticCaptures/index.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { runCli } from '../helpers/cliHarness.js';
import { tempFolder } from './tempFiles.js';

const write = tempFolder();
const TRIANGLE: SynthSpec = { shape: 'triangle', frequency: 261.63, amplitude: 3, sampleRate: 261.63 * 400 * 1.0137, samples: 20_000, phase: 0.13 };

function csv(spec: SynthSpec, preamble: readonly (readonly [string, string])[], name = 'CH1'): string {
  return writeCsv([{ name, unit: 'V', signal: synthesize(spec) }], { preamble, format: 'fixed', precision: 6 });
}

describe('readMetadata on the vertical setting', () => {
  it('reads volts per division, divisions, offset, position, range and probe factor per channel, under general wordings', () => {
    const m = readMetadata(
      [
        ['CH1 Volts/Div', '500mV'],
        ['Ch 2 Scale', '2 V/div'],
        ['Vertical divisions', '10'],
        ['Channel B offset (mV)', '-250'],
        ['Vertical Position', 'CH1:1.5 div'],
        ['Input range', '±10 V'],
        ['Full scale', '-5 V to 5 V'],
        ['Probe attenuation', '10:1'],
        ['Probe', 'x10'],
      ],
      '.',
    );
    const seen = (m.vertical ?? []).map((e) => [e.quantity, e.channel, e.values[0]?.value ?? null, e.values[0]?.channel ?? null]);
    expect(seen).toEqual([
      ['volts-per-division', '1', 0.5, null],
      ['volts-per-division', '2', 2, null],
      ['divisions', null, 10, null],
      ['offset', '2', -0.25, null],
      ['position', null, 1.5, '1'],
      ['range', null, 10, null],
      ['range', null, 5, null],
      ['probe', null, 10, null],
      ['probe', null, 10, null],
    ]);
    expect(m.vertical?.[5].values[0]).toMatchObject({ symmetric: true });
    expect(m.vertical?.[6].values[0]?.ends).toEqual({ low: -5, high: 5 });
    expect(m.voltsPerDivision).toBe(0.5);
    expect(m.recognised.map((r) => r.key)).toContain('Probe attenuation');
  });

  it('leaves time offsets, horizontal divisions and words it cannot read as volts alone', () => {
    const m = readMetadata([['Time offset', '-1 ms'], ['Horizontal divisions', '10'], ['Offset', 'auto'], ['Range', '20 A'], ['Probe', 'none']], '.');
    expect(m.vertical).toBeUndefined();
    expectWithin(m.startTime, -1e-3, { rel: 1e-12 }, 'as written');
  });
});

describe('readCapture fills the full scale the preamble states', () => {
  it('gives centre ± volts per division × divisions / 2, marked as from the preamble', async () => {
    const c = await readCapture(write('plain.csv', csv(TRIANGLE, [['Sample interval', String(1 / TRIANGLE.sampleRate)], ['Vertical scale', '1 V/div'], ['Vertical divisions', '8'], ['Vertical position', '-0.5 div']])));
    // Position −0.5 div moves the trace down: the centre shows +0.5 V (closed form −P × V/div).
    expect(c.channels[0]).toMatchObject({ fullScale: { low: -3.5, high: 4.5 }, fullScaleFrom: 'preamble', fullScaleKeys: ['Vertical scale', 'Vertical divisions', 'Vertical position'] });
  });

  it('takes the offset sign that fits the trace, and both edges nearest the trace when either sign fits', async () => {
    // 0 … 6 V on ±4 V with a 2 V offset: only a centre of +2 V holds the trace ([−2, 6] V, not [−6, 2] V).
    const up = await readCapture(write('up.csv', csv({ ...TRIANGLE, offset: 3 }, [['Volts/div', '1'], ['Divisions', '8'], ['Offset', '2 V']])));
    expect(up.channels[0].fullScale).toEqual({ low: -2, high: 6 });
    // ±1.5 V fits both [−3.6, 4.4] V and [−4.4, 3.6] V: the nearer edge on each side is kept.
    const either = await readCapture(write('either.csv', csv({ ...TRIANGLE, amplitude: 1.5 }, [['Volts/div', '1'], ['Divisions', '8'], ['Offset', '0.4']])));
    expectWithin(either.channels[0].fullScale?.low, -3.6, { abs: 1e-12 }, 'closed form −4 V + 0.4 V');
    expectWithin(either.channels[0].fullScale?.high, 3.6, { abs: 1e-12 }, 'closed form 4 V − 0.4 V');
  });

  it('reads per-channel settings from blocks, from one line per channel and from a stated range', async () => {
    const a = synthesize(TRIANGLE);
    const b = synthesize({ ...TRIANGLE, shape: 'pulse', amplitude: 5, duty: 0.3 });
    const two = (preamble: readonly (readonly [string, string])[]): string => writeCsv([{ name: 'CH1', unit: 'V', signal: a }, { name: 'CH2', unit: 'V', signal: b }], { preamble, format: 'fixed', precision: 6 });
    const blocks = await readCapture(write('blocks.csv', two([['Divisions', '10'], ['Source', 'CH1'], ['Scale', '0.5'], ['Source', 'CH2'], ['Scale', '2'], ['Offset', '-5']])));
    expect(blocks.channels.map((ch) => ch.fullScale)).toEqual([{ low: -2.5, high: 2.5 }, { low: -5, high: 15 }]);
    const lines = await readCapture(write('lines.csv', two([['Volts/div', '1.0,2.0'], ['Vertical range', '±4 V,-2 V to 12 V']])));
    expect(lines.channels.map((ch) => ch.fullScale)).toEqual([{ low: -4, high: 4 }, { low: -2, high: 12 }]);
  });

  it('reads the setting in a semicolon file with decimal commas', async () => {
    const text = writeCsv([{ name: 'CH1', unit: 'V', signal: synthesize(TRIANGLE) }], { delimiter: ';', decimalMark: ',', preamble: [['Volts/div', '0,5 V'], ['Divisions', '10'], ['Offset', '0,25']], format: 'fixed', precision: 6 });
    const c = await readCapture(write('comma.csv', text));
    // ±2.5 V about +0.25 V or −0.25 V; the ±3 V trace fits both (within 15 % of the span), so the nearer edges: −2.25 … 2.25 V.
    expectWithin(c.channels[0].fullScale?.low, -2.25, { abs: 1e-12 }, 'closed form −2.5 V + 0.25 V');
    expectWithin(c.channels[0].fullScale?.high, 2.25, { abs: 1e-12 }, 'closed form 2.5 V − 0.25 V');
  });

  it('keeps a probe factor’s window and the window as stated, and uses the one the trace fits', async () => {
    // 0.5 V/div × 8 at the scope's input, ×10 at the tip: ±2 V or ±20 V; a ±3 V trace fits only ±20 V.
    const c = await readCapture(write('probe.csv', csv(TRIANGLE, [['Volts/div', '0.5'], ['Divisions', '8'], ['Probe', '10X']])));
    expect(c.channels[0].fullScale).toEqual({ low: -20, high: 20 });
  });

  it('states nothing when the preamble states no range, and warns when the stated range cannot hold the trace', async () => {
    const none = await readCapture(write('none.csv', csv(TRIANGLE, [['Volts/div', '1']])));
    expect(none.channels[0].fullScale).toBeUndefined();
    expect(none.warnings.map((w) => w.code)).not.toContain('full-scale-mismatch');
    const huge = await readCapture(write('huge.csv', csv(TRIANGLE, [['Volts/div', '1e308'], ['Divisions', '10']])));
    expect(huge.channels[0].fullScale).toBeUndefined();
    const small = await readCapture(write('small.csv', csv(TRIANGLE, [['Volts/div', '0.1'], ['Divisions', '8']])));
    expect(small.channels[0].fullScale).toBeUndefined();
    expect(small.warnings.find((w) => w.code === 'full-scale-mismatch')?.message).toMatch(/-0\.4 V to 0\.4 V.*spans -3 V to 3 V/);
  });
});

const SPEC = `name: preamble full scale
revision: A
outputs:
  triangle:
    channel: 1
    shape: triangle
    checks:
      - { measure: frequency, nominal: 261.63 Hz, tolerance: 1.5 % }
      - { measure: peakToPeak, nominal: 6 V, tolerance: 4 % }
      - { measure: maximum, nominal: 3 V, tolerance: 4 % }
`;

async function check(name: string, text: string): Promise<{ code: number; checks: Record<string, { statement: string; note?: string }>; causes: string[] }> {
  const r = await runCli(['check', '--no-store', write(name, text), '--spec', write('fs-spec.yaml', SPEC), '--unit', 'FK-0150', '--force-unit', '--json']);
  const unit = JSON.parse(r.stdout).units[0];
  const checks = Object.fromEntries(unit.verdict.conditions[0].checks.map((k: { measurement: string }) => [k.measurement, k]));
  return { code: r.code, checks, causes: unit.diagnosis.causes.map((c: { id: string }) => c.id) };
}

describe('check with the full scale the preamble states', () => {
  for (const [label, edge] of [['at the screen edge', 2.5], ['2.4 % past it, where the converter ends (±5.12 of ±5 div)', 2.56]] as const) {
    it(`a triangle clipped by the scope ${label}, exported in volts at 1 µV steps, is NOT MEASURED with the fix to the vertical setting`, async () => {
      const r = await check(`clip-${edge}.csv`, csv({ ...TRIANGLE, clip: { low: -edge, high: edge } }, [['Vertical scale', '500 mV/div'], ['Vertical divisions', '10']]));
      expect(r.code).toBe(1);
      expect(r.checks.peakToPeak.statement).toBe('not-measured');
      expect(r.checks.peakToPeak.note).toMatch(/volts per division/);
      expect(r.checks.frequency.statement).toBe('pass');
      expect(r.causes[0]).toBe('scope-range');
      expect(r.causes).not.toContain('saturation');
    });
  }

  it('the same clipped trace without a stated range is taken for the circuit’s (the preamble is what tells them apart)', async () => {
    const r = await check('clip-bare.csv', csv({ ...TRIANGLE, clip: { low: -2.5, high: 2.5 } }, [['Vertical scale', '500 mV/div']]));
    expect(r.checks.peakToPeak.statement).toBe('fail');
    expect(r.causes[0]).toBe('saturation');
  });

  it('the same triangle saturating at +2.4 V inside a stated ±5 V range is a FAIL with saturation its top cause', async () => {
    const r = await check('sat.csv', csv({ ...TRIANGLE, clip: { low: -99, high: 2.4 } }, [['Vertical scale', '1 V/div'], ['Vertical divisions', '10']]));
    expect(r.code).toBe(1);
    expect(r.checks.peakToPeak.statement).toBe('fail');
    expect(r.checks.frequency.statement).toBe('pass');
    expect(r.causes[0]).toBe('saturation');
  });

  it('a pulse’s own flat states inside the stated range are not taken for clipping or saturation', async () => {
    const pulse = csv({ ...TRIANGLE, shape: 'pulse', amplitude: 5, duty: 0.3, noise: 0.002, seed: 4 }, [['Volts/div', '2'], ['Divisions', '8'], ['Offset', '5 V']]);
    const c = await readCapture(write('pulse.csv', pulse));
    expect(c.channels[0].fullScale).toEqual({ low: -3, high: 13 });
    const r = await runCli(['measure', write('pulse2.csv', pulse), '--json']);
    expect(r.code).toBe(0);
    const ch = JSON.parse(r.stdout).channels[0];
    expect(ch.shape).toBe('pulse');
    expect(ch.flatTops).toBeUndefined();
    expect(ch.warnings.map((w: { code: string }) => w.code)).not.toContain('clipped');
  });
});
