import { describe, expect, it } from 'vitest';
import { evaluateTargets, LIMITS } from '../../bench/lib/targets.js';

/** One gen file's figures as bench/run.js records them. */
const file = (rows: number, wall: number, peerWall: number, maxRss: number, bytes: number, read: number) => ({
  kind: 'gen',
  rows,
  bytes,
  ratio: wall / peerWall,
  benchproof: { ok: true, medianWall: wall, medianCpu: wall, maxRss },
  peer: { ok: true, medianWall: peerWall, medianCpu: peerWall, maxRss: 2 * maxRss },
  stages: { read },
});

const status = (targets: ReturnType<typeof evaluateTargets>, id: string) => targets.find((t) => t.id === id)?.status;

describe('bench targets of issue 21', () => {
  it('judges the fixed cost, the ratio to the peer at 1, 4 and 10 M rows, ingestion and memory against their limits', () => {
    const MiB = 2 ** 20;
    const targets = evaluateTargets({
      fixed: { ok: true, runs: 15, medianWall: 0.09, nodeWall: 0.06 },
      files: [file(1e6, 0.29, 0.6, 90 * MiB, 43e6, 0.1), file(4e6, 0.85, 1.6, 150 * MiB, 173e6, 0.5), file(1e7, 1.9, 4, 200 * MiB, 432e6, 1.2)],
      fft: null,
      growth: {},
    });
    expect(status(targets, 'fixed-cost')).toBe('PASS');
    expect([status(targets, 'speed-1M'), status(targets, 'speed-4M'), status(targets, 'speed-10M')]).toEqual(['PASS', 'FAIL', 'PASS']);
    // 173 MB in 0.5 s is 346 MB/s, 432 MB in 1.2 s is 360 MB/s, 43 MB in 0.1 s 430 MB/s: the slowest counts.
    expect(status(targets, 'ingest')).toBe('PASS');
    expect([status(targets, 'memory-before-1M'), status(targets, 'memory-before-4M'), status(targets, 'memory-before-10M')]).toEqual(['PASS', 'FAIL', 'PASS']);
    expect(LIMITS.ingestMBps).toBe(300);
  });

  it('marks a target SKIP, never PASS, when its figures were not measured', () => {
    const targets = evaluateTargets({ fixed: { ok: false, error: 'numpy missing' }, files: [], fft: null, growth: {} });
    for (const id of ['fixed-cost', 'speed-1M', 'speed-4M', 'speed-10M', 'ingest', 'memory-before-4M']) expect(status(targets, id)).toBe('SKIP');
  });

  it('fails the fixed cost above 0.10 s', () => {
    const targets = evaluateTargets({ fixed: { ok: true, runs: 15, medianWall: 0.12, nodeWall: 0.06 }, files: [], fft: null, growth: {} });
    expect(status(targets, 'fixed-cost')).toBe('FAIL');
  });
});
