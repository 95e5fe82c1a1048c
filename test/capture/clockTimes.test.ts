import { describe, expect, it } from 'vitest';
import { ClockRewriter } from '../../src/capture/clockTimes.js';

describe('ClockRewriter', () => {
  it('is not used for files without clock stamps, nor when only a preamble line holds one', () => {
    expect(ClockRewriter.forSample('Time (s),CH1 (V)\n0,1\n1e-3,2\n2e-3,3\n')).toBeNull();
    expect(ClockRewriter.forSample(`Saved,2026-03-01 10:00:00\n${Array.from({ length: 20 }, (_, i) => `${i * 1e-3},${i}`).join('\n')}\n`)).toBeNull();
  });

  it('rewrites clock times into seconds since the first stamp with the digits written, and drops lone dates', () => {
    const text = 'Date,Time,V\n2026-03-01,10:00:00.000,1\n2026-03-01,10:00:00.250,2\n2026-03-01,10:00:01.500,3\n';
    const r = ClockRewriter.forSample(text)!;
    // 10:00:01.500 is 1.500 s after 10:00:00.000 (closed form).
    expect(r.rewrite(text, true)).toBe('Date,Time,V\n,0.000,1\n,0.250,2\n,1.500,3\n');
  });

  it('counts whole days across midnight, reads day.month.year, and day/month/year when a day passes 12', () => {
    const iso = 'stamp;v\n2026-03-01T23:59:59,5;1\n2026-03-02T00:00:00,5;2\n2026-03-02T00:00:01,5;3\n';
    expect(ClockRewriter.forSample(iso)!.rewrite(iso, true)).toBe('stamp;v\n0,5;1\n1,5;2\n2,5;3\n');
    const dotted = 't\tv\n28.02.2026 23:59:59\t1\n01.03.2026 00:00:00\t2\n01.03.2026 00:00:01\t3\n';
    expect(ClockRewriter.forSample(dotted)!.rewrite(dotted, true)).toBe('t\tv\n0\t1\n1\t2\n2\t3\n');
    const slashed = 't,v\n31/12/2026 23:59:59,1\n01/01/2027 00:00:00,2\n01/01/2027 00:00:01,3\n';
    expect(ClockRewriter.forSample(slashed)!.rewrite(slashed, true)).toBe('t,v\n0,1\n1,2\n2,3\n');
  });

  it('carries a line cut by a chunk border to the next chunk', () => {
    const text = 't,v\n10:00:00,1\n10:00:01,2\n10:00:02,3\n';
    const r = ClockRewriter.forSample(text)!;
    expect(r.rewrite(text.slice(0, 20)) + r.rewrite(text.slice(20)) + r.rewrite('', true)).toBe('t,v\n0,1\n1,2\n2,3\n');
  });
});
