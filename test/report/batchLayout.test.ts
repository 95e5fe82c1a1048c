import { describe, expect, it } from 'vitest';
import { renderHistogramSvg } from '../../src/report/svgHistogram.js';
import { renderBatchHtml } from '../../src/report/index.js';

// Common practice (no source): two labels drawn at the same height and nearly the same x overlap.
const textsOf = (svg: string): { x: number; y: number; label: string }[] =>
  [...svg.matchAll(/<text x="([\d.]+)" y="([\d.]+)"[^>]*>([^<]+)<\/text>/g)].map((m) => ({ x: Number(m[1]), y: Number(m[2]), label: m[3] }));

describe('batch histogram labels', () => {
  it('the mean’s name never shares the row of the limit names, so a mean at a limit cannot print over it', () => {
    const svg = renderHistogramSvg({ title: 'low · triangle · frequency', unit: 'Hz', values: [64.43, 64.5, 64.6, 64.45], lower: 64.4288, upper: 66.3911, mean: 64.495 });
    const t = textsOf(svg);
    const lsl = t.find((x) => x.label === 'LSL')!;
    const mean = t.find((x) => x.label === 'mean')!;
    expect(Math.abs(mean.x - lsl.x)).toBeLessThan(30);
    expect(mean.y).not.toBe(lsl.y);
    expect(t.find((x) => x.label === 'USL')!.y).toBe(lsl.y);
  });

  it('names of limits closer than a label’s width turn apart, LSL to the left of its line and USL to the right', () => {
    // Limits 0.1 Hz apart on an axis of about 10 Hz: a few pixels apart.
    const svg = renderHistogramSvg({ title: 'mid · triangle · frequency', unit: 'Hz', values: [255, 258, 261, 264], lower: 260.0, upper: 260.1, mean: 259.5 });
    const lsl = /<text x="[\d.]+" y="[\d.]+" text-anchor="(\w+)"[^>]*>LSL</.exec(svg)![1];
    const usl = /<text x="[\d.]+" y="[\d.]+" text-anchor="(\w+)"[^>]*>USL</.exec(svg)![1];
    expect([lsl, usl]).toEqual(['end', 'start']);
  });

  it('labels the value axis with the measurement’s name and prefixed unit, ticks with the minus sign U+2212, bars that count every unit', () => {
    const values = [-0.0198, -0.0102, 0.0021, 0.0024, 0.0035, 0.0102];
    const svg = renderHistogramSvg({ title: 'low · triangle · DC offset', unit: 'V', values, lower: -0.15, upper: 0.15, mean: -0.0003, axisName: 'DC offset' });
    expect(svg).toContain('>DC offset (mV)<');
    expect(svg).toContain('>−150<');
    expect(svg).not.toMatch(/>-\d/);
    // Sturges: ⌈log2 6⌉ + 1 = 4 bins asked (Sturges 1926); however d3-array places them, each unit is in one bar.
    const counts = [...svg.matchAll(/<rect [^>]*><title>(\d+)<\/title><\/rect>/g)].map((m) => Number(m[1]));
    expect(counts.reduce((a, b) => a + b, 0)).toBe(values.length);
  });
});

describe('batch report page layout', () => {
  it('sets the measurements table compact and prints it on landscape pages of the chosen paper', () => {
    const batch = {
      schemaVersion: 1,
      filter: {},
      specs: [],
    } as unknown as Parameters<typeof renderBatchHtml>[0];
    const html = renderBatchHtml(batch);
    expect(html).toContain('@page wide { size: landscape; }');
    expect(html).toContain('.wide-print { page: wide; }');
  });
});
