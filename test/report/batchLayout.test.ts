import { describe, expect, it } from 'vitest';
import { renderHistogramSvg } from '../../src/report/svgHistogram.js';

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
});
