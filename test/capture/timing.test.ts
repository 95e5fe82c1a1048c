import { describe, expect, it } from 'vitest';
import { readCapture } from '../../src/capture/index.js';
import { createRandom, synthesize, writeCsv } from '../../src/syntheticCaptures/index.js';
import { isBenchError } from '../../src/types/index.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { tempFolder } from './tempFiles.js';

const write = tempFolder();
// A 1 kHz triangle of ±3 V sampled at 100 kHz (ours); linear between corners, so interpolation is exact there.
const sig = synthesize({ shape: 'triangle', frequency: 1000, amplitude: 3, sampleRate: 100_000, samples: 1000 });

function csvWithTimes(times: readonly number[], values: (t: number) => number): string {
  return `Time (s),CH1 (V)\n${times.map((t) => `${t.toExponential(12)},${values(t).toExponential(12)}`).join('\n')}\n`;
}
const triangleAt = (t: number): number => {
  const p = (((t * 1000) % 1) + 1) % 1;
  return p < 0.5 ? -3 + 12 * p : 3 - 12 * (p - 0.5);
};

describe('readCapture time base', () => {
  it('treats a time column printed with 4 significant digits as uniform (rounding is within the print resolution)', async () => {
    const c = await readCapture(write('coarse.csv', writeCsv([{ name: 'CH1', unit: 'V', signal: sig }], { precision: 4 })));
    expect(c.layout.resampled).toBe(false);
    expectWithin(c.sampleInterval, 1e-5, { rel: 1e-3 }, 'synthesizer rate, 4 printed digits');
  });

  it('resamples a logger’s jittered time stamps onto the median step and says so', async () => {
    const rnd = createRandom(11);
    const times = Array.from({ length: 600 }, (_, i) => i * 1e-5 + (rnd.uniform() - 0.5) * 2e-6);
    const c = await readCapture(write('jitter.csv', csvWithTimes(times, triangleAt)));
    expect(c.layout.resampled).toBe(true);
    expect(c.warnings[0]).toMatchObject({ code: 'resampled', line: 4 });
    expectWithin(c.sampleInterval, 1e-5, { rel: 0.02 }, 'median of steps jittered by ±1 µs around 10 µs');
    // Away from the corners the triangle is linear, so the resampled values lie on it (closed form).
    const t = c.startTime + 130 * c.sampleInterval; // mid-ramp, 0.2 ms from a corner
    expectWithin(c.channels[0].samples[130], triangleAt(t), { abs: 1e-9 }, 'closed-form triangle');
  });

  it('resamples over one missing row of a uniform time column, naming the line where it starts', async () => {
    const times = Array.from({ length: 300 }, (_, i) => i * 1e-5).filter((_, i) => i !== 120);
    const c = await readCapture(write('gap.csv', csvWithTimes(times, triangleAt)));
    expect(c.layout.resampled).toBe(true);
    expect(c.warnings[0]).toMatchObject({ code: 'resampled', line: 122 });
    expect(c.length).toBe(300);
    expectWithin(c.sampleInterval, 1e-5, { rel: 1e-9 }, 'the uniform step as written');
    expectWithin(c.channels[0].samples[120], triangleAt(120e-5), { abs: 1e-9 }, 'closed-form triangle at the missing row');
  });

  it('counts the invalid samples of the resampled record, not of the rows, when a gap sits among uneven steps', async () => {
    // Rows 200–204 are blank; the stamps are uneven, so the record is resampled and an interpolated
    // point touching a blank is itself a gap (a gap can widen): the count must be that of the samples.
    const rnd = createRandom(5);
    const times = Array.from({ length: 600 }, (_, i) => i * 1e-5 + (rnd.uniform() - 0.5) * 4e-6);
    const text = `Time (s),CH1 (V)\n${times.map((t, i) => `${t.toExponential(12)},${i >= 200 && i < 205 ? '' : triangleAt(t).toExponential(12)}`).join('\n')}\n`;
    const c = await readCapture(write('gap-uneven.csv', text));
    expect(c.layout.resampled).toBe(true);
    const nan = c.channels[0].samples.filter((v) => !Number.isFinite(v)).length;
    expect(nan).toBeGreaterThan(0);
    expect(c.channels[0].invalidCount).toBe(nan);
  });

  it('uses --interval as the grid step for uneven times and ignores a disagreeing flag for a uniform time column', async () => {
    const times = [0, 1e-5, 3e-5, 4e-5, 6e-5, 7e-5, 9e-5, 1e-4];
    const c = await readCapture(write('uneven.csv', csvWithTimes(times, triangleAt)), { interval: 5e-6 });
    expect(c.length).toBe(21);
    expectWithin(c.sampleInterval, 5e-6, { rel: 1e-12 }, 'the flag');
    const u = await readCapture(write('uniform.csv', csvWithTimes([0, 1e-5, 2e-5, 3e-5], triangleAt)), { sampleRate: 50_000 });
    expectWithin(u.sampleInterval, 1e-5, { rel: 1e-9 }, 'the time column');
    expect(u.warnings.map((w) => w.code)).toEqual(['option-ignored']);
  });

  it('prefers --interval to the preamble’s interval when there is no time column, and warns when a preamble disagrees with the time column', async () => {
    const text = writeCsv([{ name: 'CH1', unit: 'V', signal: sig }], { xColumn: 'none', preamble: 'auto' });
    const c = await readCapture(write('meta.csv', text), { interval: 2e-5 });
    expect(c.layout.timing).toBe('option');
    expectWithin(c.sampleInterval, 2e-5, { rel: 0 }, 'the flag');
    const clash = writeCsv([{ name: 'CH1', unit: 'V', signal: sig }], { preamble: [['sample rate', '50 kHz']] });
    const d = await readCapture(write('clash.csv', clash));
    expect(d.warnings.map((w) => w.code)).toEqual(['interval-mismatch']);
  });

  it('resamples an index column with a gap using the rate from the flag', async () => {
    const rows = Array.from({ length: 50 }, (_, i) => i).filter((i) => i !== 20).map((i) => `${i},${triangleAt(i * 1e-5)}`);
    const c = await readCapture(write('index-gap.csv', `Index,CH1 (V)\n${rows.join('\n')}\n`), { sampleRate: 100_000 });
    expect(c.layout.resampled).toBe(true);
    expect(c.length).toBe(50);
    expectWithin(c.channels[0].samples[20], triangleAt(20e-5), { abs: 1e-12 }, 'closed-form triangle');
  });

  it('refuses --interval and --sample-rate that disagree', async () => {
    const path = write('any.csv', 'Time (s),CH1 (V)\n0,1\n1e-5,2\n');
    const e = await readCapture(path, { interval: 1e-5, sampleRate: 1e6 }).catch((x: unknown) => x);
    expect(isBenchError(e) && e.code).toBe('capture.conflicting-options');
  });
});
