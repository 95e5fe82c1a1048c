import { describe, expect, it } from 'vitest';
import { parseArgs, parseSize, runsFor, sizeLabel } from '../../bench/lib/args.js';
import { parseCpuSeconds, parseMaxRss } from '../../bench/lib/proc.js';
import { expectWithin } from '../helpers/expectWithin.js';

// Row counts are our own notation for the harness flags (k = 10^3, M = 10^6, SI prefixes).
describe('bench flags', () => {
  it('parseSize reads k and M as SI prefixes when a size is written as 100k, 1M or 2.5M', () => {
    expectWithin(parseSize('100k'), 1e5, { abs: 0 }, 'SI prefix k = 10^3');
    expectWithin(parseSize('1M'), 1e6, { abs: 0 }, 'SI prefix M = 10^6');
    expectWithin(parseSize('2.5M'), 2.5e6, { abs: 0 }, 'SI prefix M = 10^6');
    expectWithin(parseSize('250000'), 250000, { abs: 0 }, 'plain row count');
  });

  it('parseSize rejects text that is not a row count, and counts too small to time', () => {
    expect(() => parseSize('lots')).toThrow(RangeError);
    expect(() => parseSize('1G')).toThrow(RangeError);
    expect(() => parseSize('10')).toThrow(/below 1000/);
  });

  it('sizeLabel writes a row count back the way the flags take it', () => {
    expect(sizeLabel(1e6)).toBe('1M');
    expect(sizeLabel(1e5)).toBe('100k');
    expect(sizeLabel(2.5e6)).toBe('2.5M');
  });

  it('parseArgs sorts and de-duplicates the sizes and keeps the run count when --sizes and --runs are given', () => {
    const o = parseArgs(['--sizes', '1M,100k,1M', '--runs=2', '--no-synth']);
    expect(o.sizes).toEqual([1e5, 1e6]);
    expectWithin(o.runs, 2, { abs: 0 }, 'given on the command line');
    expect(o.synth).toBe(false);
    expect(o.peer).toBe(true);
  });

  it('parseArgs refuses an unknown flag or a run count below one', () => {
    expect(() => parseArgs(['--fast'])).toThrow(/unknown option --fast/);
    expect(() => parseArgs(['--runs', '0'])).toThrow(RangeError);
  });

  it('runsFor gives fewer runs to files above 1M rows unless a count is requested', () => {
    expect(runsFor(1e6, null)).toBeGreaterThan(runsFor(1e7, null));
    expectWithin(runsFor(1e7, 7), 7, { abs: 0 }, 'requested count');
  });
});

describe('peak memory from GNU time', () => {
  it('parseMaxRss converts the kbytes line of a `time -v` report to bytes', () => {
    const report = '\tUser time (seconds): 0.10\n\tMaximum resident set size (kbytes): 140212\n\tExit status: 0\n';
    // GNU time reports kilobytes of 1024 bytes (getrusage ru_maxrss on Linux, from memory).
    expectWithin(parseMaxRss(report), 140212 * 1024, { abs: 0 }, 'GNU time -v format, from memory');
    expect(parseMaxRss('no such line')).toBeNull();
  });

  it('parseCpuSeconds adds the user and system lines of a `time -v` report', () => {
    const report = '\tUser time (seconds): 0.71\n\tSystem time (seconds): 0.19\n\tMaximum resident set size (kbytes): 140212\n';
    // user + system = the process's CPU time, all threads (getrusage ru_utime + ru_stime, from memory).
    expectWithin(parseCpuSeconds(report), 0.9, { abs: 1e-12 }, 'GNU time -v format, from memory');
    expect(parseCpuSeconds('\tUser time (seconds): 0.71\n')).toBeNull();
  });
});
